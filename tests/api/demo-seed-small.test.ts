import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { formatCount, formatPercent } from '@shared/format';
import type { Report } from '@shared/report';
import { statedBadRate } from '@shared/stated-bad-rate';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyAuditChain } from '@server/audit/audit';
import { now } from '@server/clock';
import { listScenarios } from '@server/comparisons/scenarios';
import { currentReportJson, getComparisonDetail } from '@server/comparisons/service';
import type { AppContext } from '@server/context';
import { AuditEvent, MailMessage } from '@server/db/entities/index';
import { demoFiles, demoMappings, momentOf, sampleDataDir } from '@server/demo/scenario';
import { brokeredCards } from '@server/demo/wording';
import { getGovernance } from '@server/governance/service';
import { listNotes } from '@server/notes/service';
import { seedDemo, type SeedResult } from '@server/seed';
import { buildTestApp, type TestApp } from './helpers/app';

/**
 * The first start's demo at a small size: the same seed (server/seed.ts with demo/scenario.ts),
 * through the same services, the analysis queue and the mail, played on every twentieth row of
 * each demo file (about 2,900 through-the-door rows, 3,000 PD rows, a 2,000-row development
 * sample) at 20 bootstrap replicates. It checks what the scenario does — the three comparisons and
 * their states, the review, scenarios, notes, votes, the decision with its computed strategy, the
 * e-mails and the replayed calendar — not the full files' figures, which the reliability suite's
 * full seed checks (tests/reliability/demo-seed.test.ts).
 */

const every = 20;
const replicates = 20;

/** Header and every `every`-th row of a demo file (the files are in random order of application). */
function thinned(name: string, directory: string): number {
  const lines = readFileSync(join(sampleDataDir, name), 'utf8').split('\n').filter((line) => line.length > 0);
  const rows = lines.slice(1).filter((_, index) => index % every === 0);
  writeFileSync(join(directory, name), [lines[0], ...rows].join('\n') + '\n');
  return rows.length;
}

let t: TestApp;
let seeded: SeedResult;
let context: AppContext;
let rows: Record<keyof typeof demoFiles, number>;
const today = new Date();

beforeAll(async () => {
  t = await buildTestApp({ seed: false });
  const dataDir = join(t.directory, 'demo-files');
  mkdirSync(dataDir);
  rows = {
    full: thinned(demoFiles.full, dataDir),
    pd: thinned(demoFiles.pd, dataDir),
    development: thinned(demoFiles.development, dataDir),
    sample: thinned(demoFiles.sample, dataDir),
  };
  context = t.context;
  seeded = await seedDemo(t.dataSource, { bcryptCost: t.config.bcryptCost, scenario: context, today, replicates, dataDir });
});
afterAll(async () => t?.close());

async function report(id: number): Promise<Report> {
  return JSON.parse((await currentReportJson(t.dataSource, id)).json) as Report;
}

const ms = (date: Date | string) => new Date(date).getTime();

describe('the demo scenario, played small', () => {
  it('adds the six people and three comparisons from the given files: decided, in review, a draft waiting for its mapping', async () => {
    expect(seeded.seeded).toBe(true);
    expect(seeded.people).toHaveLength(6);
    expect(seeded.comparisons.map((comparison) => comparison.state)).toEqual(['decided', 'in-review', 'draft']);
    const [decided, inReview, draft] = await Promise.all(seeded.comparisons.map((comparison) => getComparisonDetail(t.dataSource, comparison.id)));
    expect(decided.holdout).toMatchObject({ fileName: demoFiles.full, rowCount: rows.full });
    expect(decided.mapping).toMatchObject({ ...demoMappings.full, segments: demoMappings.full.segments });
    expect(decided.settings).toMatchObject({ bootstrap: replicates, seed: 1, rejectInference: { method: 'column' } });
    expect(inReview.holdout).toMatchObject({ fileName: demoFiles.pd, rowCount: rows.pd });
    expect(inReview.mapping).toMatchObject({ challenger: 'challenger_pd', probabilityOfDefault: { champion: false, challenger: true }, period: 'application_month' });
    expect(draft).toMatchObject({ mapping: null, runs: [], currentRunId: null });
    expect(draft.holdout).toMatchObject({ fileName: demoFiles.sample, rowCount: rows.sample });
    for (const detail of [decided, inReview]) expect(detail.runs.map((run) => run.status)).toEqual(['done']);
  });

  it('analyses both holdouts as the scenario maps them: unknown outcomes inferred by the bureau column, the PD calibrated, stability by month, a PSI against the development sample', async () => {
    const full = await report(seeded.comparisons[0].id);
    expect(full.rows + full.population!.unknown!.rows).toBe(rows.full);
    expect(full.population!.unknown!.rows).toBeGreaterThan(0);
    expect(full.bootstrap.replicates).toBe(replicates);
    expect(full.swap.swapIn.inferred).toMatchObject({ method: 'column' });
    expect(full.segments.find((row) => row.column === brokeredCards.column && row.value === brokeredCards.value)!.n).toBeGreaterThan(0);

    const pd = await report(seeded.comparisons[1].id);
    expect(pd.rows).toBe(rows.pd);
    expect(pd.challenger.higherIs).toBe('riskier');
    expect(pd.calibration!.challenger!.rows.length).toBeGreaterThan(0);
    expect(pd.calibration!.champion).toBeNull();
    expect(pd.stability!.periods.map((period) => period.period)).toContain('2025-07');
    expect(pd.stability!.psi!.reference).toMatchObject({ kind: 'file', fileName: demoFiles.development, rows: rows.development });
  });

  it('plays the decided comparison\'s history: validated, two scenarios, six notes, two votes, adoption keeping the champion for brokered cards', async () => {
    const id = seeded.comparisons[0].id;
    const full = await report(id);
    const governance = await getGovernance(t, id);
    expect(governance.state).toBe('decided');
    expect(governance.reviews.map((review) => [review.outcome, review.reviewer.name])).toEqual([['validated', 'Tomasz Wielgus']]);
    expect(governance.reviews[0].findings).toContain(brokeredCards.value);
    expect(governance.votes.map((vote) => [vote.voter.name, vote.vote])).toEqual([
      ['Henrik Aalto', 'adopt'],
      ['Grace Okafor', 'adopt'],
    ]);
    expect(governance.decision).toMatchObject({ outcome: 'adopt', decidedBy: { name: 'Henrik Aalto' } });
    const strategy = governance.decision!.strategy!;
    expect(strategy.keepChampion).toEqual([{ column: brokeredCards.column, value: brokeredCards.value }]);
    // The rationale quotes the strategy the product computed on this holdout, with the inferred bad rates.
    expect(strategy.inference).toBe('column');
    expect(governance.decision!.rationale).toContain(`swaps in ${formatCount(strategy.mixed.swapIn.count)} accounts`);
    expect(governance.decision!.rationale).toContain(`with a bad rate of ${formatPercent(statedBadRate(strategy.mixed), 2)}`);
    expect(governance.decision!.effectiveDate).toBe(new Date(momentOf('decision', today).getTime() + 14 * 86_400_000).toISOString().slice(0, 10));
    expect(governance.verdicts.map((verdict) => verdict.outcome)).toEqual([full.verdict.outcome]);

    const { scenarios } = await listScenarios(context, id);
    expect(scenarios.map((scenario) => scenario.approvalRate)).toEqual([0.75, 0.7]);
    expect(scenarios[1].swapIn).toMatchObject({ count: full.swap.swapIn.count });
    const notes = await listNotes(t.dataSource, id);
    expect(notes.map((note) => note.anchor)).toEqual(['swap-in', 'swap-out', 'discussion', 'discussion', 'discussion', 'discussion']);
    expect(notes[0]).toMatchObject({ scenarioId: scenarios[1].id });

    expect(await getGovernance(t, seeded.comparisons[1].id)).toMatchObject({ state: 'in-review', reviews: [], votes: [], decision: null });
  });

  it('sends every step\'s e-mails and stamps each step at its moment of the past weeks; the audit chain verifies', async () => {
    const mail = await t.dataSource.getRepository(MailMessage).find({ order: { id: 'ASC' } });
    expect(mail).toHaveLength(11);
    for (const message of mail) expect(message.status).toBe('sent');
    expect(await verifyAuditChain(t.dataSource)).toMatchObject({ ok: true });
    const events = await t.dataSource.getRepository(AuditEvent).find({ order: { id: 'ASC' } });
    const times = events.map((event) => ms(event.createdAt));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    expect(times[0] - ms(momentOf('people', today))).toBeLessThan(60_000);
    const decidedAt = events.find((event) => event.action === 'comparison.decided')!;
    expect(ms(decidedAt.createdAt) - ms(momentOf('decision', today))).toBeLessThan(60_000);
    expect(Math.abs(now().getTime() - Date.now())).toBeLessThan(5);
  });
});

import { formatCount, formatPercent } from '@shared/format';
import { statedBadRate } from '@shared/stated-bad-rate';
import type { Report } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyAuditChain } from '@server/audit/audit';
import { now } from '@server/clock';
import { listScenarios } from '@server/comparisons/scenarios';
import { currentReportJson, getComparisonDetail } from '@server/comparisons/service';
import type { AppContext } from '@server/context';
import { AuditEvent, MailMessage, User } from '@server/db/entities/index';
import { momentOf } from '@server/demo/scenario';
import { brokeredCards } from '@server/demo/wording';
import { getGovernance } from '@server/governance/service';
import { listNotes } from '@server/notes/service';
import { seedDemo, type SeedResult } from '@server/seed';
import { buildTestApp, type TestApp } from '../api/helpers/app';
import { signedInAs } from '../api/helpers/client';

/**
 * The first start's demo (server/seed.ts with demo/scenario.ts), as index.ts runs it: the real
 * seed on the real 60,000-account files, through the services, on a temporary database, with its
 * two full analyses at 2,000 replicates. This is the one test of the scenario: the unit and API
 * suite starts servers without it (its two 60,000-account analyses outlast that suite's bounds on
 * a loaded machine, even with a small bootstrap).
 */

let t: TestApp;
let seeded: SeedResult;
let context: AppContext;
const today = new Date();

beforeAll(async () => {
  t = await buildTestApp({ seed: false });
  context = t.context;
  seeded = await seedDemo(t.dataSource, { bcryptCost: t.config.bcryptCost, scenario: context, today });
}, 240_000);
afterAll(async () => t?.close());

async function report(id: number): Promise<Report> {
  return JSON.parse((await currentReportJson(t.dataSource, id)).json) as Report;
}

const ms = (date: Date | string) => new Date(date).getTime();

describe('the demo on first start', () => {
  it('adds the six demo people and three comparisons: decided, in review, a draft waiting for its mapping', async () => {
    expect(seeded.seeded).toBe(true);
    expect(seeded.people.map((person) => person.email)).toEqual([
      'admin@tallowmere.test',
      'modeler@tallowmere.test',
      'analyst@tallowmere.test',
      'policy@tallowmere.test',
      'committee@tallowmere.test',
      'committee2@tallowmere.test',
    ]);
    expect(seeded.comparisons.map((comparison) => comparison.state)).toEqual(['decided', 'in-review', 'draft']);

    const [decided, inReview, draft] = await Promise.all(seeded.comparisons.map((comparison) => getComparisonDetail(t.dataSource, comparison.id)));
    expect(decided.holdout).toMatchObject({ fileName: 'tallowmere-holdout-2025.csv', rowCount: 58_699 });
    expect(decided.mapping).toMatchObject({ challenger: 'challenger_points', exposure: 'loan_amount', id: 'account_id', weight: 'sample_weight', keepUnknown: true, inferredBad: 'bureau_pd_12m' });
    expect(decided.settings).toMatchObject({ rejectInference: { method: 'column' } });
    expect(decided.mapping!.segments).toEqual(['product', 'channel', 'product_channel', 'application_month']);
    expect(decided.settings).toMatchObject({ bootstrap: 2000, seed: 1 });
    expect(inReview.holdout.fileName).toBe('tallowmere-holdout-2025-pd.csv');
    expect(inReview.mapping).toMatchObject({ challenger: 'challenger_pd', higherIs: { champion: 'safer', challenger: 'riskier' } });
    expect(draft).toMatchObject({ mapping: null, runs: [], currentRunId: null });
    expect(draft.holdout).toMatchObject({ fileName: 'tallowmere-holdout-2025-sample-2k.csv', rowCount: 2000 });
    for (const detail of [decided, inReview]) expect(detail.runs.map((run) => run.status)).toEqual(['done']);

    // Everyone signed in sees them in the list.
    const analyst = await signedInAs(t.app, 'analyst');
    const list = await analyst.get('/api/comparisons').expect(200);
    expect((list.body as { total: number }).total).toBe(3);
  });

  it('tells the scenario the sample data describe, with the same numbers as the command line', async () => {
    const full = await report(seeded.comparisons[0].id);
    // `npm run -s compare -- sample-data/tallowmere-holdout-2025.csv --outcome bad_12m --champion
    // champion_points --challenger challenger_points --segment product_channel … --weight
    // sample_weight --keep-unknown --inferred-bad bureau_pd_12m --reject-inference column` printed
    // "ΔGini +8.38, 95% CI [+6.58, +10.18] (DeLong)", "product_channel = credit-card/broker 1,726
    // accounts, 251 bads −14.1" and the swap-in "10,767 … inferred (column) 8.26%" against the
    // swap-out's 9.19%; tolerance: the printed rounding.
    expect(full.population).toMatchObject({ rows: 58_699, accounts: 120_001, unknown: { rows: 35_196 } });
    expect(full.rows).toBe(23_503);
    expect(full.bads).toBe(3069);
    expect(Math.abs(full.difference.gini * 100 - 8.38)).toBeLessThan(0.005);
    expect(full.difference.pOneSided).toBeLessThan(0.05);
    const cards = full.segments.find((row) => row.column === brokeredCards.column && row.value === brokeredCards.value)!;
    expect(cards).toMatchObject({ n: 1726, bads: 251 });
    expect(Math.abs(cards.deltaGini! * 100 + 14.1)).toBeLessThan(0.05);
    // The brokered cards are significantly worse (two-sided, Holm-adjusted): the segment rule fails
    // and names them, so the verdict is not proven.
    expect(cards.flags).toContain('significantly-worse');
    expect(full.verdict.outcome).toBe('not-proven');
    expect(full.swap.swapIn).toMatchObject({ accounts: 10_767, known: 0, badRate: null, inferred: { method: 'column' } });
    expect(Math.abs(full.swap.swapIn.inferred!.badRate! * 100 - 8.26)).toBeLessThan(0.005);
    expect(Math.abs(full.swap.swapOut.badRate! * 100 - 9.19)).toBeLessThan(0.005);
    // Several challengers: the refit of the champion (sample-data/refit.ts) is better than the
    // champion and worse than CF-3. `npm run -s compare -- … --challenger challenger_points
    // --challenger refit_points …` printed "AS-19 refit Gini 40.1 ΔGini +6.47 [+4.71, +8.24] …
    // supported"; tolerance: the printed rounding. It is the only supported one, so it is recommended.
    const [cf3, refit] = full.challengers!;
    expect(cf3.name).toBe('CF-3 cash-flow');
    expect(refit).toMatchObject({ column: 'refit_points', name: 'AS-19 refit 2024' });
    expect(Math.abs(refit.difference.gini * 100 - 6.47)).toBeLessThan(0.005);
    expect(refit.metrics.gini).toBeGreaterThan(full.champion.gini);
    expect(refit.metrics.gini).toBeLessThan(cf3.metrics.gini);
    expect(refit.verdict.outcome).toBe('supported');
    expect(full.choice!.recommended).toBe(1);

    // The PD file holds the first 60,000 applications with every outcome observed (the calibration
    // story of sample-data/pd-and-development.ts), the same models: the challenger better there too.
    const pd = await report(seeded.comparisons[1].id);
    expect(pd.challenger.higherIs).toBe('riskier');
    expect(pd.rows).toBe(60_000);
    expect(pd.difference.gini).toBeGreaterThan(0);
  });

  it("shows the PD challenger's calibration failing in a band, the uplift turning over the months, and a PSI against the development sample", async () => {
    const pd = await report(seeded.comparisons[1].id);
    // The story of sample-data/pd-and-development.ts: from July brokered cards arrive with
    // optimistic, unverified cash-flow figures. Figures: `npm run -s compare --
    // sample-data/tallowmere-holdout-2025-pd.csv --outcome bad_12m --champion champion_points
    // --challenger challenger_pd --champion-higher-is safer --challenger-higher-is riskier --pd challenger
    // --period application_month --reference sample-data/tallowmere-development-2023.csv`.
    const calibration = pd.calibration!.challenger!;
    expect(calibration.portfolio.jeffreysP).toBeGreaterThan(0.05);
    expect(calibration.rows.filter((row) => row.fails).map((row) => row.label)).toEqual(['Band 10']);
    expect(pd.stability!.signChanges).toEqual(['2025-08', '2025-09', '2025-12']);
    expect(pd.stability!.psi!.reference).toMatchObject({ kind: 'file', fileName: 'tallowmere-development-2023.csv', rows: 40_000 });
    expect(pd.stability!.psi!.challenger.rating).toBe('stable');
    expect(pd.stability!.psi!.challenger.significant).toBe(true);
  });

  it('keeps the decided comparison\'s whole history: submission, validating review, scenarios, annotations, discussion, two votes, the decision', async () => {
    const id = seeded.comparisons[0].id;
    const full = await report(id);
    const governance = await getGovernance(t, id);
    expect(governance.state).toBe('decided');
    expect(governance.reviews).toHaveLength(1);
    const [review] = governance.reviews;
    expect(review).toMatchObject({ outcome: 'validated', reviewer: { name: 'Tomasz Wielgus' } });
    // The findings quote the brokered-cards row of the report, as the segments page shows it.
    const cards = full.segments.find((row) => row.column === brokeredCards.column && row.value === brokeredCards.value)!;
    expect(review.findings).toContain('credit-card/broker');
    expect(review.findings).toContain(`ΔGini −${Math.abs(cards.deltaGini! * 100).toFixed(1)}`);
    expect(review.findings).toContain(`ΔGini +${(full.difference.gini * 100).toFixed(1)} points`);

    expect(governance.votes.map((vote) => [vote.voter.name, vote.vote, vote.challenger])).toEqual([
      ['Henrik Aalto', 'adopt', 0],
      ['Grace Okafor', 'adopt', 0],
    ]);
    // CF-3, not the recommended refit: the decision names it and is acknowledged as against the record.
    expect(governance.decision).toMatchObject({
      outcome: 'adopt',
      decidedBy: { name: 'Henrik Aalto' },
      chosen: { model: 'challenger', challenger: 0, column: 'challenger_points', name: 'CF-3 cash-flow' },
      acknowledgedAgainstRecord: true,
    });
    expect(governance.decision!.rationale).toContain('The verdict recommends AS-19 refit 2024 instead');
    expect(governance.verdicts[0]).toMatchObject({ recommended: 1, challengers: [{ outcome: 'not-proven' }, { outcome: 'supported' }] });
    expect(governance.decision!.conditions).toMatch(/Brokered credit-card applications .* keep the champion’s decision/);
    expect(governance.decision!.conditions).toMatch(/swap-in bad rate monthly/);
    // issue 13: the adoption keeps the champion for brokered cards, as a strategy the product computed.
    expect(governance.decision!.strategy!.keepChampion).toEqual([{ column: brokeredCards.column, value: brokeredCards.value }]);
    const strategy = governance.decision!.strategy!;
    expect(governance.decision!.rationale).toContain(`swaps in ${formatCount(strategy.mixed.swapIn.count)} accounts`);
    // The swap-in was never booked: the strategy's bad rates carry the bureau column's inferred bads, named so.
    expect(strategy.inference).toBe('column');
    expect(strategy.mixed.swapIn.badRate).toBeNull();
    expect(governance.decision!.rationale).toContain(`with a bad rate of ${formatPercent(statedBadRate(strategy.mixed), 2)}`);
    expect(governance.decision!.rationale).toContain(`at a ${formatPercent(statedBadRate(strategy.mixed.swapIn), 2)} bad rate`);
    expect(governance.decision!.rationale).toContain('probability of bad standing in');
    expect(governance.decision!.effectiveDate).toBe(new Date(momentOf('decision', today).getTime() + 14 * 86_400_000).toISOString().slice(0, 10));
    expect(governance.verdicts.map((verdict) => verdict.outcome)).toEqual(['not-proven']);

    const { scenarios } = await listScenarios(context, id);
    expect(scenarios.map((scenario) => [scenario.name, scenario.approvalRate])).toEqual([
      ['Growth case (75%)', 0.75],
      ['Current approval rate (70%)', 0.7],
    ]);
    // The policy role's reading (the annotation) holds: the swap-in's inferred bad rate (the
    // bureau's column: none of them was booked) below the swap-out's at both.
    for (const scenario of scenarios) {
      expect(scenario.swapIn.badRate).toBeNull();
      expect(scenario.swapIn.inferredBadRate!).toBeLessThan(scenario.swapOut.inferredBadRate!);
    }
    const current = scenarios[1];
    expect(current).toMatchObject({ swapIn: { count: full.swap.swapIn.count, accounts: full.swap.swapIn.accounts }, swapOut: { count: full.swap.swapOut.count }, createdBy: { name: 'Rosa Delgado' } });

    const notes = await listNotes(t.dataSource, id);
    expect(notes.map((note) => [note.anchor, note.author.name])).toEqual([
      ['swap-in', 'Rosa Delgado'],
      ['swap-out', 'Rosa Delgado'],
      ['discussion', 'Priya Natarajan'],
      ['discussion', 'Grace Okafor'],
      ['discussion', 'Tomasz Wielgus'],
      ['discussion', 'Rosa Delgado'],
    ]);
    expect(notes[0]).toMatchObject({ scenarioId: current.id });
    expect(notes[0].body).toContain(`swaps in ${Math.round(current.swapIn.accounts!).toLocaleString('en-US')} applicants`);
    expect(notes[0].body).toContain('inferred from the bureau');

    const inReview = await getGovernance(t, seeded.comparisons[1].id);
    expect(inReview).toMatchObject({ state: 'in-review', reviews: [], votes: [], decision: null });
  });

  it('sends the e-mails of every step, delivered to the outbox', async () => {
    const mail = await t.dataSource.getRepository(MailMessage).find({ order: { id: 'ASC' } });
    const decided = seeded.comparisons[0].name;
    const pd = seeded.comparisons[1].name;
    // Subjects from server/comparisons/mail.ts and server/governance/mail.ts.
    expect(mail.map((message) => [message.to.join(', '), message.subject])).toEqual([
      ['modeler@tallowmere.test', `Analysis done: ${decided}`],
      ['analyst@tallowmere.test', `Ready for review: ${decided}`],
      ['policy@tallowmere.test', `Ready for review: ${decided}`],
      ['committee@tallowmere.test', `Validated, waiting for the committee: ${decided}`],
      ['committee2@tallowmere.test', `Validated, waiting for the committee: ${decided}`],
      // Everyone on the record hears of the decision (the decider does not mail themselves).
      ['modeler@tallowmere.test', `Decision recorded: ${decided}`],
      ['analyst@tallowmere.test', `Decision recorded: ${decided}`],
      ['committee2@tallowmere.test', `Decision recorded: ${decided}`],
      ['modeler@tallowmere.test', `Analysis done: ${pd}`],
      ['analyst@tallowmere.test', `Ready for review: ${pd}`],
      ['policy@tallowmere.test', `Ready for review: ${pd}`],
    ]);
    for (const message of mail) {
      expect(message.status).toBe('sent');
      expect(message.receivedAt).not.toBeNull();
    }
  });

  it('spreads the history over the past six weeks, in order, and its audit chain verifies', async () => {
    expect(await verifyAuditChain(t.dataSource)).toMatchObject({ ok: true });
    const events = await t.dataSource.getRepository(AuditEvent).find({ order: { id: 'ASC' } });
    const times = events.map((event) => ms(event.createdAt));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    // The calendar of demo/scenario.ts: people 42 days before today at 08:30 UTC, the last step
    // (the draft) the day before at 16:44; every step takes seconds, not minutes.
    expect(times[0] - ms(momentOf('people', today))).toBeLessThan(60_000);
    // (The first test's sign-in comes after the seed, at the real time.)
    const lastSeeded = events.filter((event) => !event.action.startsWith('auth.')).at(-1)!;
    expect(lastSeeded.action).toBe('comparison.created');
    expect(ms(lastSeeded.createdAt) - ms(momentOf('createSample', today))).toBeLessThan(60_000);
    expect(ms(lastSeeded.createdAt)).toBeLessThan(Date.now());
    const decidedAt = events.find((event) => event.action === 'comparison.decided')!;
    expect(ms(decidedAt.createdAt) - ms(momentOf('decision', today))).toBeLessThan(60_000);
    const people = await t.dataSource.getRepository(User).find();
    for (const person of people) expect(ms(person.createdAt) - ms(momentOf('people', today))).toBeLessThan(60_000);
    const mail = await t.dataSource.getRepository(MailMessage).find();
    for (const message of mail) expect(ms(message.sentAt!)).toBeGreaterThanOrEqual(ms(message.createdAt));
    // After the seed the clock is the real time again.
    expect(Math.abs(now().getTime() - Date.now())).toBeLessThan(5);
  });

  it('adds nothing on a second start', async () => {
    const again = await seedDemo(t.dataSource, { bcryptCost: t.config.bcryptCost, scenario: context });
    expect(again).toEqual({ seeded: false, people: [], comparisons: [] });
    expect(await t.dataSource.getRepository(User).count()).toBe(6);
  });
});

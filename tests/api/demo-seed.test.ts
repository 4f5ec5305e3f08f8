import { join } from 'node:path';
import type { Report } from '@shared/report';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyAuditChain } from '@server/audit/audit';
import { now } from '@server/clock';
import { currentReportJson, getComparisonDetail } from '@server/comparisons/service';
import type { AppContext } from '@server/context';
import { AuditEvent, MailMessage } from '@server/db/entities/index';
import { momentOf } from '@server/demo/scenario';
import { brokeredCards } from '@server/demo/wording';
import { getGovernance } from '@server/governance/service';
import { createLogger } from '@server/log';
import { seedDemo, type SeedResult } from '@server/seed';
import { buildTestApp, type TestApp } from './helpers/app';

/**
 * The demo scenario of the first start (server/seed.ts with demo/scenario.ts) with a small
 * bootstrap (50 replicates instead of 2,000), so the unit and API suite plays every step of it in
 * seconds: the people, the three comparisons through the services, the e-mails, the replayed
 * calendar. The full seed, and its figures that depend on the bootstrap, are checked in
 * tests/reliability/demo-seed.test.ts.
 */

const replicates = 50;
let t: TestApp;
let seeded: SeedResult;
const today = new Date();

beforeAll(async () => {
  t = await buildTestApp({ seed: false });
  const context: AppContext = { config: t.config, dataSource: t.dataSource, mailer: t.mailer, log: createLogger('silent'), jobs: t.jobs, uploadDir: join(t.directory, 'uploads') };
  seeded = await seedDemo(t.dataSource, { bcryptCost: t.config.bcryptCost, scenario: context, today, replicates });
}, 240_000);
afterAll(async () => t?.close());

async function report(id: number): Promise<Report> {
  return JSON.parse((await currentReportJson(t.dataSource, id)).json) as Report;
}

describe('the demo scenario with a small bootstrap', () => {
  it('plays every step: a decided comparison, one in review, a draft', async () => {
    expect(seeded.people).toHaveLength(6);
    expect(seeded.comparisons.map((comparison) => comparison.state)).toEqual(['decided', 'in-review', 'draft']);
    const decided = await getComparisonDetail(t.dataSource, seeded.comparisons[0].id);
    expect(decided.settings).toMatchObject({ bootstrap: replicates, seed: 1 });
    const full = await report(seeded.comparisons[0].id);
    expect(full.bootstrap.replicates).toBe(replicates);
    // Figures that do not depend on the bootstrap, as in the full seed's test: the file's counts
    // (sample-data/README.md) and DeLong's ΔGini printed by the CLI (+4.37; tolerance its rounding).
    expect(full.rows).toBe(60_000);
    expect(full.bads).toBe(4143);
    expect(Math.abs(full.difference.gini * 100 - 4.37)).toBeLessThan(0.005);
    expect(full.difference.pOneSided).toBeLessThan(0.05);
    const cards = full.segments.find((row) => row.column === brokeredCards.column && row.value === brokeredCards.value)!;
    expect(cards).toMatchObject({ n: 5392, bads: 549 });
    expect(Math.abs(cards.deltaGini! * 100 + 5.5)).toBeLessThan(0.05);
    // issue 13: the brokered cards are significantly worse (two-sided, Holm-adjusted), so the
    // segment rule fails and names them: the verdict is not proven.
    expect(cards.flags).toContain('significantly-worse');
    expect(full.verdict.outcome).toBe('not-proven');
    expect(full.verdict.criteria.find((criterion) => criterion.id === 'segments')).toMatchObject({ met: false, detail: expect.stringContaining('product_channel = credit-card/broker') });
    expect(full.verdict.summary).toContain('it is significantly worse in product_channel = credit-card/broker');

    // The PD file holds the same accounts and champion; the challenger's PD is the same safety
    // value as its points except for brokered cards from July, whose PD is pulled down and blurred
    // (sample-data/pd-and-development.ts), so its Gini is lower than the points challenger's (the
    // same bounds as the full seed's test in tests/reliability/demo-seed.test.ts).
    const pd = await report(seeded.comparisons[1].id);
    expect(pd.challenger.higherIs).toBe('riskier');
    expect(pd.champion.gini).toBe(full.champion.gini);
    expect(full.challenger.gini - pd.challenger.gini).toBeGreaterThan(0.005);
    expect(full.challenger.gini - pd.challenger.gini).toBeLessThan(0.03);
  });

  it('writes the demo texts from the stored report', async () => {
    const id = seeded.comparisons[0].id;
    const full = await report(id);
    const governance = await getGovernance(t, id);
    const cards = full.segments.find((row) => row.column === brokeredCards.column && row.value === brokeredCards.value)!;
    expect(governance.reviews[0].findings).toContain(`ΔGini −${Math.abs(cards.deltaGini! * 100).toFixed(1)}`);
    expect(governance.reviews[0].findings).toContain(`ΔGini +${(full.difference.gini * 100).toFixed(1)} points`);
    expect(governance.decision).toMatchObject({ outcome: 'adopt' });
  });

  it('delivers the e-mail of every step and keeps the calendar in order with a valid audit chain', async () => {
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
    const times = events.map((event) => event.createdAt.getTime());
    expect(times).toEqual([...times].sort((a, b) => a - b));
    expect(times[0] - momentOf('people', today).getTime()).toBeLessThan(60_000);
    expect(Math.abs(now().getTime() - Date.now())).toBeLessThan(5);
  });
});

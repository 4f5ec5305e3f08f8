import { governanceSchema } from '@shared/governance';
import { mixedStrategyResultSchema, type MixedStrategyResult } from '@shared/mixed-strategy';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Decision } from '@server/db/entities/index';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { analysedComparison, lastOutboxId } from './helpers/governance';

/**
 * Conditional adoption through the API (issue 13, item 9): the policy role and the committee
 * preview the challenger-except-in-these-values strategy on the stored holdout; the committee
 * adopts with it; the stored decision carries the strategy and its figures; a value the holdout
 * does not have is refused, named, and nothing is stored.
 */

let t: TestApp;
let modeler: TestClient;
let analyst: TestClient;
let policy: TestClient;
let committee: TestClient;
let committee2: TestClient;
let id: number;
const brokers = [{ column: 'channel', value: 'broker' }];

beforeAll(async () => {
  t = await buildTestApp();
  [modeler, analyst, policy, committee] = await Promise.all((['modeler', 'analyst', 'policy', 'committee'] as const).map((role) => signedInAs(t.app, role)));
  committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  id = await analysedComparison(t, modeler, { name: 'Cards and loans, 2025 sample' });
});
afterAll(async () => {
  await t.close();
});

describe('conditional adoption', () => {
  let preview: MixedStrategyResult;

  it('previews the mixed strategy beside the champion and pure adoption, for the policy role and the committee only', async () => {
    const response = await policy.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: brokers, approvalRate: 0.6 });
    expect(response.status, JSON.stringify(response.body)).toBe(200);
    preview = mixedStrategyResultSchema.parse(response.body);
    // Pure adoption is the swap sets at the same approval rate (server/stats/swap-sets.ts, its own tests).
    const swap = (await policy.post(`/api/comparisons/${id}/swap`, { approvalRate: 0.6 })).body as { swap: { swapIn: { count: number; bads: number }; swapOut: { count: number; bads: number }; champion: { cutoff: number }; challenger: { cutoff: number } } };
    expect(preview.cutoffs).toEqual({ champion: swap.swap.champion.cutoff, challenger: swap.swap.challenger.cutoff });
    expect(preview.pure.swapIn).toMatchObject({ count: swap.swap.swapIn.count, bads: swap.swap.swapIn.bads });
    expect(preview.pure.swapOut).toMatchObject({ count: swap.swap.swapOut.count, bads: swap.swap.swapOut.bads });
    // The brokers keep the champion: there the mixed book is the champion's and nobody changes sides;
    // elsewhere it is the challenger's. The whole is the sum of the channel's values.
    const byChannel = preview.bySegment.filter((row) => row.column === 'channel');
    const broker = byChannel.find((row) => row.value === 'broker')!;
    expect(broker.kept).toBe(true);
    expect(broker.mixed).toMatchObject({ accepted: broker.champion.accepted, bads: broker.champion.bads, swapIn: { count: 0 }, swapOut: { count: 0 } });
    expect(preview.keptAccounts).toBe(broker.accounts);
    expect(byChannel.reduce((sum, row) => sum + row.mixed.accepted, 0)).toBe(preview.mixed.accepted);
    expect(byChannel.reduce((sum, row) => sum + row.mixed.swapIn.count, 0)).toBe(preview.mixed.swapIn.count);
    expect(preview.mixed.swapIn.count).toBeLessThan(preview.pure.swapIn.count);

    expect((await committee.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: brokers })).status).toBe(200);
    expect((await modeler.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: brokers })).status).toBe(403);
    expect((await analyst.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: brokers })).status).toBe(403);
  });

  it('refuses a segment value the holdout does not have, naming it', async () => {
    const response = await policy.post(`/api/comparisons/${id}/mixed-strategy`, { keepChampion: [...brokers, { column: 'channel', value: 'fax' }, { column: 'region', value: 'north' }] });
    expect(response.status).toBe(400);
    expect((response.body as { error: { message: string } }).error.message).toBe(
      'These segment values are not in the holdout: channel = fax; region = north. Its segment columns are product, channel.',
    );
  });

  it('decides an adoption with the strategy; the stored decision carries it, its figures and the e-mail says so', async () => {
    expect((await modeler.post(`/api/comparisons/${id}/submit`, { message: '' })).status).toBe(200);
    expect((await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Sound; brokers weaker.' })).status).toBe(200);
    expect((await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: 'Except brokers.' })).status).toBe(200);
    expect((await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: '' })).status).toBe(200);
    const rationale = 'Adopt the challenger except for brokered business, where the champion stays until the broker data are fixed.';

    // A value that does not exist: refused, named, nothing stored.
    const wrong = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale, strategy: { keepChampion: [{ column: 'channel', value: 'fax' }] } });
    expect(wrong.status).toBe(400);
    expect((wrong.body as { error: { message: string } }).error.message).toMatch(/^This segment value is not in the holdout: channel = fax\./);
    // Only an adoption has exceptions.
    const keep = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'keep', rationale: rationale.repeat(2), acknowledgeAgainstRecord: true, strategy: { keepChampion: brokers } });
    expect(keep.status).toBe(400);
    expect((keep.body as { error: { message: string } }).error.message).toMatch(/Only an adoption can keep the champion/);
    expect(await t.dataSource.getRepository(Decision).count()).toBe(0);

    const before = await lastOutboxId(t);
    const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale, strategy: { keepChampion: brokers, approvalRate: 0.6 } });
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    const g = governanceSchema.parse(decided.body);
    expect(g.state).toBe('decided');
    // The stored figures are the preview's on the validated run (the same run: nothing ran since).
    expect(g.decision!.strategy).toEqual(preview);
    const stored = await t.dataSource.getRepository(Decision).findOneByOrFail({ comparisonId: id });
    expect(stored.strategy).toEqual(preview);
    expect(stored.strategy!.runId).toBe(stored.runId);

    const mail = await t.deliveredMail({ to: 'modeler@tallowmere.test', afterId: before });
    expect(mail.receivedText).toContain('adopt the challenger, except in channel = broker, where the champion is kept.');
    expect(mail.receivedText).toContain('The strategy adopted, on the holdout:');

    const evidence = (await analyst.get(`/api/comparisons/${id}/evidence.json`)).body as { decision: { strategy: MixedStrategyResult } };
    expect(evidence.decision.strategy.keepChampion).toEqual(brokers);
    const audit = (await analyst.get(`/api/comparisons/${id}/audit`)).body as { events: { action: string; details: { keepChampion?: unknown } }[] };
    expect(audit.events.find((event) => event.action === 'comparison.decided')!.details.keepChampion).toEqual(brokers);
  });
});

import { createHash } from 'node:crypto';
import { auditTrailSchema } from '@shared/governance';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, Comparison, Decision, DecisionPack } from '@server/db/entities/index';
import { withWriteLock } from '@server/db/transaction';
import { packThreads, renderPackOffThread, stopPackThreads } from '@server/pack/render-thread';
import type { PackInput } from '@server/pack/sections';
import { packInput } from '@server/pack/service';
import { onPostgres } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';
import { waitForRuns } from './helpers/governance';
import { sampleHead, sampleMapping, uploadFile } from './helpers/holdouts';
import { pdfPages } from './helpers/pack';

/**
 * The decision and the committee pack archived with it (pack/service.ts, decideWithPack): stored in
 * one transaction, both or neither, with the PDF laid out while no write lock is held; and the
 * pack threads (pack/render-thread.ts): kept between packs, at most two, a dead one replaced.
 *
 * The layout is watched through the app's `layOutPack` (the pack threads, with what each test says
 * happens while a pack is laid out: a write, a note, a failure) and the layouts are counted.
 */
const layout = { calls: 0, during: null as null | ((call: number) => Promise<void>) };

function watchedLayout(input: PackInput): Promise<Buffer> {
  layout.calls++;
  return layout.during ? layout.during(layout.calls).then(() => renderPackOffThread(input)) : renderPackOffThread(input);
}

let t: TestApp;
let modeler: TestClient;
let analyst: TestClient;
let committee: TestClient;
let committee2: TestClient;
let policy: TestClient;
let holdoutId: number;
/** The comparison decided in the first test; the pack-thread tests lay out its pack. */
let decidedId: number;

/** A comparison on the file's holdout: analysed (no bootstrap) with a mapping, a draft without. */
async function comparison(name: string, analysed = true): Promise<number> {
  const created = await modeler.post('/api/comparisons', { name, holdoutId, ...(analysed ? { mapping: sampleMapping, settings: { bootstrap: 0 } } : {}) });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  if (analysed) await waitForRuns(t);
  return (created.body as { id: number }).id;
}

beforeAll(async () => {
  t = await buildTestApp({ layOutPack: watchedLayout });
  [modeler, analyst, committee, policy] = await Promise.all((['modeler', 'analyst', 'committee', 'policy'] as const).map((role) => signedInAs(t.app, role)));
  committee2 = new TestClient(t.app);
  expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
  // One holdout for every comparison of this file: the tests are about the decision, not the data.
  const upload = await uploadFile(modeler, sampleHead(600), 'sample-head.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  holdoutId = (upload.body as { id: number }).id;
});

afterAll(async () => {
  await t.close();
});

/** A comparison validated and voted on by both committee members (the default quorum is two). */
async function readyToDecide(name: string): Promise<number> {
  const id = await comparison(name);
  expect((await modeler.post(`/api/comparisons/${id}/submit`, {})).status).toBe(200);
  expect((await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Checked.' })).status).toBe(200);
  for (const member of [committee, committee2]) expect((await member.post(`/api/comparisons/${id}/votes`, { vote: 'adopt' })).status).toBe(200);
  return id;
}

async function stored(id: number) {
  return {
    decisions: await t.dataSource.getRepository(Decision).countBy({ comparisonId: id }),
    packs: await t.dataSource.getRepository(DecisionPack).findBy({ comparisonId: id }),
    state: (await t.dataSource.getRepository(Comparison).findOneByOrFail({ id })).state,
    decidedEvents: await t.dataSource.getRepository(AuditEvent).countBy({ action: 'comparison.decided', targetId: String(id) }),
  };
}

/** The archived pack's text, checked against its audit event. */
async function archivedText(id: number): Promise<string> {
  const trail = auditTrailSchema.parse((await policy.get(`/api/comparisons/${id}/audit`)).body);
  const archived = trail.events.find((event) => event.action === 'comparison.pack_archived')!;
  const decided = trail.events.find((event) => event.action === 'comparison.decided')!;
  expect(archived.id).toBe(decided.id + 1);
  const [pack] = (await stored(id)).packs;
  expect(createHash('sha256').update(pack.pdf).digest('hex')).toBe(pack.sha256);
  expect(archived.details).toMatchObject({ decisionId: pack.decisionId, sha256: pack.sha256, bytes: pack.bytes });
  return (await pdfPages(pack.pdf)).join(' ');
}

describe('a decision and its pack', () => {
  it('lays the pack out with no write lock held (another write goes through meanwhile), once, and stores it with the decision', async () => {
    const id = await readyToDecide('Decided while others write');
    decidedId = id;
    layout.calls = 0;
    let otherWrite: 'done' | 'blocked' | null = null;
    layout.during = async () => {
      // Were the decision's transaction open, this would wait for it, and it for this layout.
      const blocked = new Promise<'blocked'>((resolve) => setTimeout(() => resolve('blocked'), 20_000).unref());
      otherWrite = await Promise.race([withWriteLock(t.dataSource, async () => 'done' as const), blocked]);
    };
    const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Laid out outside the lock.' });
    layout.during = null;
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    expect(otherWrite).toBe('done');
    expect(layout.calls).toBe(1);
    const after = await stored(id);
    expect({ ...after, packs: after.packs.length }).toEqual({ decisions: 1, packs: 1, state: 'decided', decidedEvents: 1 });
    const text = await archivedText(id);
    expect(text).toContain('Laid out outside the lock.');
    expect(text).toContain('archived with the committee’s decision');
  });

  // On PostgreSQL the pack is laid out inside the decision's transaction at once (pack/service.ts,
  // decideWithPack): a write the layout itself waited for would wait for the decision in turn.
  it.skipIf(onPostgres)('lays the pack out again inside the transaction when the record changes meanwhile, so the stored pack shows what was stored (SQLite only: on PostgreSQL the pack is always laid out inside the transaction)', async () => {
    const id = await readyToDecide('Noted while laid out');
    layout.calls = 0;
    layout.during = async (call) => {
      if (call === 1) expect((await policy.post(`/api/comparisons/${id}/notes`, { body: 'Written while the pack was laid out.' })).status).toBe(201);
    };
    const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'The record moved.' });
    layout.during = null;
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    expect(layout.calls).toBe(2);
    const after = await stored(id);
    expect({ ...after, packs: after.packs.length }).toEqual({ decisions: 1, packs: 1, state: 'decided', decidedEvents: 1 });
    const text = await archivedText(id);
    expect(text).toContain('Written while the pack was laid out.');
    expect(text).toContain('The record moved.');
  });

  it('stores neither the decision nor anything of it when the pack cannot be made, and the decision can be recorded again', async () => {
    const id = await readyToDecide('Pack fails');
    const events = await t.dataSource.getRepository(AuditEvent).count();
    layout.calls = 0;
    layout.during = async () => {
      throw new Error('the layout failed (test)');
    };
    const failed = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Never stored.' });
    layout.during = null;
    expect(failed.status).toBe(500);
    expect(layout.calls).toBe(1);
    expect({ ...(await stored(id)), packs: (await stored(id)).packs.length }).toEqual({ decisions: 0, packs: 0, state: 'validated', decidedEvents: 0 });
    expect(await t.dataSource.getRepository(AuditEvent).count()).toBe(events);

    // The same when the layout fails in the second path (inside the transaction, after the record
    // moved); SQLite only, the first path being that one on PostgreSQL.
    if (!onPostgres) {
      layout.calls = 0;
      layout.during = async (call) => {
        if (call === 1) expect((await policy.post(`/api/comparisons/${id}/notes`, { body: 'Moves the record.' })).status).toBe(201);
        if (call === 2) throw new Error('the layout failed again (test)');
      };
      expect((await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Never stored either.' })).status).toBe(500);
      layout.during = null;
      expect(layout.calls).toBe(2);
      expect((await stored(id)).decisions).toBe(0);
    }

    const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Stored at last.' });
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    expect(await archivedText(id)).toContain('Stored at last.');
  });

  it('refuses a decision that fails its checks before laying anything out', async () => {
    const id = await comparison('Not validated', false);
    layout.calls = 0;
    const early = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Too early.' });
    expect(early.status, JSON.stringify(early.body)).toBe(409);
    expect(layout.calls).toBe(0);
    expect((await stored(id)).decisions).toBe(0);
  });
});

describe('the pack threads', () => {
  let input: PackInput;
  const ids = () => packThreads().map((worker) => worker.threadId);

  beforeAll(async () => {
    input = await packInput(t.dataSource, decidedId, { generatedFor: 'test', archived: false });
  });

  it('lays out a second pack on the thread that made the first', async () => {
    const first = await renderPackOffThread(input);
    const threads = ids();
    expect(threads).toHaveLength(1);
    const second = await renderPackOffThread(input);
    expect(ids()).toEqual(threads);
    // The same input, the same bytes.
    expect(second.equals(first)).toBe(true);
  });

  it('runs at most two threads however many packs are asked for at once', async () => {
    const pdfs = await Promise.all(Array.from({ length: 4 }, () => renderPackOffThread(input)));
    expect(pdfs.every((pdf) => pdf.subarray(0, 5).toString('latin1') === '%PDF-')).toBe(true);
    expect(packThreads().length).toBeLessThanOrEqual(2);
  });

  it('fails the pack of a thread that dies, with the reason, and lays out the next on a new thread', async () => {
    await stopPackThreads();
    const dying = renderPackOffThread(input);
    const [worker] = packThreads();
    expect(packThreads()).toHaveLength(1);
    await worker.terminate();
    await expect(dying).rejects.toThrow(/thread ended/);
    const next = await renderPackOffThread(input);
    expect(next.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(ids()).toHaveLength(1);
    expect(ids()).not.toContain(worker.threadId);
  });
});

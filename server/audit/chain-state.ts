import type { DataSource } from 'typeorm';
import { now } from '../clock';
import { withWriteLock } from '../db/transaction';
import { chainStart, type ChainCheck, type ChainHead, verifyChainFrom } from './audit';

/**
 * The audit chain verified incrementally. The server remembers the last verified event (the
 * head: its id and hash) and, on each audit request, verifies only the events appended since,
 * linking the first of them to the remembered hash; so a call costs the new events, not the whole
 * chain (44,000 events took half a second per call). Each batch is read in turn with the writes
 * (db/transaction.ts), so an event of a transaction still open is never taken as verified.
 *
 * The full verification — every event from the first — runs at start-up (server/index.ts) and as
 * an admin action (POST /api/audit/verify). It is what finds an edit made to an old event behind
 * the server's back (the database's triggers refuse edits, so only someone with the file can).
 * A break, once found, is reported on every call until a full verification finds the chain whole.
 */

interface State {
  head: ChainHead;
  broken: Extract<ChainCheck, { ok: false }> | null;
  /** The verification running now; callers at the same time share it. */
  running: Promise<ChainCheck> | null;
  /** The last full verification: when, and what it found. */
  lastFull: { at: string; check: ChainCheck } | null;
}

const states = new WeakMap<DataSource, State>();

function stateOf(dataSource: DataSource): State {
  let state = states.get(dataSource);
  if (!state) {
    state = { head: chainStart, broken: null, running: null, lastFull: null };
    states.set(dataSource, state);
  }
  return state;
}

async function run(dataSource: DataSource, from: ChainHead): Promise<ChainCheck> {
  const state = stateOf(dataSource);
  const result = await verifyChainFrom(dataSource, 1000, from, (read) => withWriteLock(dataSource, read));
  const { head, ...check } = result;
  if (check.ok) {
    state.head = head;
    state.broken = null;
  } else {
    state.head = head;
    state.broken = check;
  }
  return check;
}

function shared(dataSource: DataSource, work: () => Promise<ChainCheck>): Promise<ChainCheck> {
  const state = stateOf(dataSource);
  if (state.running) return state.running.then(() => shared(dataSource, work));
  const running = work().finally(() => {
    state.running = null;
  });
  state.running = running;
  return running;
}

/** The chain's state: the events appended since the last verified head are verified now. */
export function auditChainStatus(dataSource: DataSource): Promise<ChainCheck> {
  const state = stateOf(dataSource);
  if (state.broken) return Promise.resolve(state.broken);
  return shared(dataSource, async () => (state.broken ? state.broken : run(dataSource, state.head)));
}

/** Every event from the first (start-up, and the admin's "verify the whole chain"). */
export function verifyWholeAuditChain(dataSource: DataSource): Promise<ChainCheck> {
  return shared(dataSource, async () => {
    const check = await run(dataSource, chainStart);
    stateOf(dataSource).lastFull = { at: now().toISOString(), check };
    return check;
  });
}

/** When the whole chain was last verified, and what was found (null: not since the server started). */
export function lastFullVerification(dataSource: DataSource): { at: string; check: ChainCheck } | null {
  return stateOf(dataSource).lastFull;
}

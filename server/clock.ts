/**
 * The time stamped on what the server stores: audit events, uploads, comparisons, analysis runs,
 * reviews, votes, decisions, notes, scenarios, verdict records and e-mail. It is the real time,
 * except while the demo seed (seed.ts) replays its scenario's past weeks on the first start:
 * inside `replay(from, body)` the clock starts at `from`, runs on at the real pace, and moves
 * forward when `body` calls `advanceTo(moment)` (a moment already passed changes nothing);
 * afterwards it is the real time again. The seed
 * replays before the server listens and before anything else is queued, so no request and no
 * other work ever sees a replayed time.
 *
 * Within a replay time only moves forward and never past the real time, so the audit trail's
 * timestamps keep their order.
 *
 * `atMoment(moment, body)` holds the time still at `moment` for `body` and what it awaits (only
 * that unit of work: other requests keep the running time). A decision is written twice at one
 * moment: once to lay out its pack, rolled back, then for good (pack/service.ts, decideWithPack).
 */
import { AsyncLocalStorage } from 'node:async_hooks';

let offsetMs = 0;
let replaying = false;
const held = new AsyncLocalStorage<number>();

/** The current time (real, or the demo seed's replayed time, or the moment a unit of work holds). */
export function now(): Date {
  const moment = held.getStore();
  return new Date(moment ?? Date.now() + offsetMs);
}

/** Runs `body` with `now()` held at `moment`. */
export function atMoment<T>(moment: Date, body: () => Promise<T>): Promise<T> {
  return held.run(moment.getTime(), body);
}

export async function replay<T>(from: Date, body: (advanceTo: (moment: Date) => void) => Promise<T>): Promise<T> {
  if (replaying) throw new Error('the clock is already replaying');
  if (from.getTime() > Date.now()) throw new Error(`the clock cannot replay the future (${from.toISOString()})`);
  const advanceTo = (moment: Date) => {
    const target = moment.getTime();
    if (target > Date.now()) throw new Error(`the clock cannot replay the future (${moment.toISOString()})`);
    // A moment already passed (the work before it took longer) leaves the clock running on.
    if (target > now().getTime()) offsetMs = target - Date.now();
  };
  replaying = true;
  offsetMs = from.getTime() - Date.now();
  try {
    return await body(advanceTo);
  } finally {
    offsetMs = 0;
    replaying = false;
  }
}

import { challengersOf, type ColumnMapping } from '@shared/report';
import type { RunInput } from '../db/entities/analysis-run';
import type { Holdout as EngineHoldout } from '../stats/holdout';

/**
 * A run's input in the engine's column form, as BLOBs: each typed array's bytes as they are in
 * memory (little-endian on every platform Node runs on), so storing is one copy and loading is a
 * view over the bytes SQLite returns (a copy only when they are not aligned for the type).
 * At 1,000,000 rows that is about 30 MB, loaded in tens of milliseconds, against seconds to parse
 * the CSV again. Used on the main thread (set-up, swap sets on demand) and in the analysis worker.
 *
 *   bad                 Uint8    1 = bad, 0 = good
 *   champion/challenger Float64  scores as given
 *   challenger.<k>      Float64  scores of challenger k (1 …, after the primary), as given, when
 *                                the mapping has more challengers (mapping.moreChallengers)
 *   exposure            Float64  when mapped
 *   segment.<i>         Uint32   codes into RunInput.segments[i].levels
 *   ids                 UTF-8    account ids joined by NUL (the reader never lets NUL through)
 *   grade.<model>       Uint32   codes into RunInput.grades[model].levels, when mapped
 *   period              Uint32   codes into RunInput.period.levels, when mapped
 *   reference.<model>   Float64  the PSI's reference sample's scores, when one was chosen
 *   weight              Float64  sampling weight per row, when mapped
 *   known               Uint8    1 = outcome known, 0 = no outcome (bad is 0 there), when the
 *                                holdout keeps applicants without an outcome and has some
 *   inferredBad         Float64  probability of bad from the inferred-bad column (NaN where not
 *                                given), when mapped and some row has no outcome
 *   order.<model>       Uint32   accounts riskiest first (safety ascending), written when the
 *                                run is done, so that preparing swap sets skips the sort
 */

export interface EncodedColumn {
  name: string;
  data: Buffer;
}

export const orderColumn = (model: 'champion' | 'challenger') => `order.${model}`;

function bytesOf(array: ArrayBufferView): Buffer {
  return Buffer.from(array.buffer, array.byteOffset, array.byteLength);
}

type TypedArrayKind<T> = { new (buffer: ArrayBufferLike, byteOffset: number, length: number): T; new (length: number): T; BYTES_PER_ELEMENT: number };

/** A typed-array view over stored bytes (copied when misaligned). */
export function viewAs<T extends Uint8Array | Uint32Array | Float64Array>(Kind: TypedArrayKind<T>, bytes: Uint8Array, expectedLength: number, name: string): T {
  if (bytes.byteLength !== expectedLength * Kind.BYTES_PER_ELEMENT) {
    throw new Error(`stored column ${name} has ${bytes.byteLength} bytes, expected ${expectedLength * Kind.BYTES_PER_ELEMENT}`);
  }
  if (bytes.byteOffset % Kind.BYTES_PER_ELEMENT === 0) return new Kind(bytes.buffer, bytes.byteOffset, expectedLength);
  const copy = new Uint8Array(bytes.byteLength);
  copy.set(bytes);
  return new Kind(copy.buffer, 0, expectedLength);
}

export function encodeHoldout(holdout: EngineHoldout): EncodedColumn[] {
  const columns: EncodedColumn[] = [
    { name: 'bad', data: bytesOf(holdout.bad) },
    { name: 'champion', data: bytesOf(holdout.champion) },
    { name: 'challenger', data: bytesOf(holdout.challenger) },
  ];
  holdout.moreChallengers?.forEach((extra, index) => columns.push({ name: `challenger.${index + 1}`, data: bytesOf(extra.scores) }));
  if (holdout.exposure) columns.push({ name: 'exposure', data: bytesOf(holdout.exposure) });
  holdout.segments.forEach((segment, index) => columns.push({ name: `segment.${index}`, data: bytesOf(segment.codes) }));
  if (holdout.ids) columns.push({ name: 'ids', data: Buffer.from(holdout.ids.join('\0'), 'utf8') });
  if (holdout.grades?.champion) columns.push({ name: 'grade.champion', data: bytesOf(holdout.grades.champion.codes) });
  if (holdout.grades?.challenger) columns.push({ name: 'grade.challenger', data: bytesOf(holdout.grades.challenger.codes) });
  if (holdout.period) columns.push({ name: 'period', data: bytesOf(holdout.period.codes) });
  if (holdout.weight) columns.push({ name: 'weight', data: bytesOf(holdout.weight) });
  if (holdout.known) columns.push({ name: 'known', data: bytesOf(holdout.known) });
  if (holdout.inferredBad) columns.push({ name: 'inferredBad', data: bytesOf(holdout.inferredBad) });
  return columns;
}

export function encodeOrder(order: Uint32Array): Buffer {
  return bytesOf(order);
}

/** What `encodeHoldout` stored, back in the engine's form. */
export function decodeHoldout(input: RunInput, mapping: ColumnMapping, stored: ReadonlyMap<string, Uint8Array>): EngineHoldout {
  const n = input.n;
  const get = (name: string): Uint8Array => {
    const bytes = stored.get(name);
    if (!bytes) throw new Error(`stored column ${name} is missing`);
    return bytes;
  };
  const categorical = (stored: { column: string; levels: string[] } | null | undefined, name: string) =>
    stored ? { column: stored.column, levels: stored.levels, codes: viewAs(Uint32Array, get(name), n, name) } : null;
  const extras: Pick<EngineHoldout, 'grades' | 'period'> = {};
  if (input.grades) extras.grades = { champion: categorical(input.grades.champion, 'grade.champion'), challenger: categorical(input.grades.challenger, 'grade.challenger') };
  if (input.period) extras.period = categorical(input.period, 'period');
  const weight = stored.get('weight');
  const known = stored.get('known');
  const inferredBad = stored.get('inferredBad');
  const more = challengersOf(mapping).slice(1);
  return {
    ...(more.length > 0 ? { moreChallengers: more.map((extra, k) => ({ ...extra, scores: viewAs(Float64Array, get(`challenger.${k + 1}`), n, `challenger.${k + 1}`) })) } : {}),
    ...extras,
    ...(weight ? { weight: viewAs(Float64Array, weight, n, 'weight') } : {}),
    ...(known ? { known: viewAs(Uint8Array, known, n, 'known') } : {}),
    ...(inferredBad ? { inferredBad: viewAs(Float64Array, inferredBad, n, 'inferredBad') } : {}),
    n,
    bad: viewAs(Uint8Array, get('bad'), n, 'bad'),
    champion: viewAs(Float64Array, get('champion'), n, 'champion'),
    challenger: viewAs(Float64Array, get('challenger'), n, 'challenger'),
    higherIs: { champion: mapping.higherIs.champion, challenger: mapping.higherIs.challenger },
    exposure: input.hasExposure ? viewAs(Float64Array, get('exposure'), n, 'exposure') : null,
    ids: input.hasIds ? decodeIds(get('ids'), n) : null,
    segments: input.segments.map((segment, index) => ({
      column: segment.column,
      levels: segment.levels,
      codes: viewAs(Uint32Array, get(`segment.${index}`), n, `segment.${index}`),
    })),
  };
}

export function decodeIds(bytes: Uint8Array, n: number): string[] {
  const ids = n === 0 ? [] : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('utf8').split('\0');
  if (ids.length !== n) throw new Error(`stored column ids has ${ids.length} entries, expected ${n}`);
  return ids;
}

/** The stored sort orders, when the run has them. */
export function decodeOrders(n: number, stored: ReadonlyMap<string, Uint8Array>): { champion: Uint32Array; challenger: Uint32Array } | null {
  const champion = stored.get(orderColumn('champion'));
  const challenger = stored.get(orderColumn('challenger'));
  if (!champion || !challenger) return null;
  return {
    champion: viewAs(Uint32Array, champion, n, orderColumn('champion')),
    challenger: viewAs(Uint32Array, challenger, n, orderColumn('challenger')),
  };
}

/** The PSI's reference sample's scores, when the run has them. */
export function decodeReference(input: RunInput, stored: ReadonlyMap<string, Uint8Array>): { champion: Float64Array; challenger: Float64Array } | null {
  if (!input.reference) return null;
  const get = (name: string): Float64Array => {
    const bytes = stored.get(name);
    if (!bytes) throw new Error(`stored column ${name} is missing`);
    return viewAs(Float64Array, bytes, input.reference!.rows, name);
  };
  return { champion: get('reference.champion'), challenger: get('reference.challenger') };
}

export function encodeReference(scores: { champion: Float64Array; challenger: Float64Array }): EncodedColumn[] {
  return [
    { name: 'reference.champion', data: bytesOf(scores.champion) },
    { name: 'reference.challenger', data: bytesOf(scores.challenger) },
  ];
}

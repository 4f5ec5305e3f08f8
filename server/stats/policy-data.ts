import type { HigherIs, RejectInference } from '@shared/report';
import type { Holdout, ModelName, SegmentColumn } from './holdout';
import { argsortAscending, rowBlocks, safety, type ScoreBlocks } from './order';
import { inferBads } from './reject-inference';

/**
 * The one-off preparation behind the decision-facing statistics (cut-offs, swap sets, swap
 * matrix, strategy curve, band tables, curves, economics): per model, the accounts sorted from
 * riskiest to safest, the blocks of equal scores, cumulative bad counts and the quantile band of
 * every account. Everything computed per request afterwards is O(n) at most, most of it
 * O(log n) or O(bands²).
 * Common practice, no source.
 * Cost: O(n log n) for the two sorts, or O(n) when the caller passes orders it already has.
 *
 * Band rule (a band never splits a score value): the accounts are laid out riskiest first at
 * positions 0 … n − 1; each block of equal scores, occupying positions [start, end), goes wholly
 * to band ⌊(start + end) · B / (2n)⌋ + 1, the band of B equal-count bands in which the middle of
 * the block falls. Bands that no block falls in are dropped and the rest renumbered 1, 2, …, so a
 * model with fewer distinct scores than B, or with heavy ties, has fewer than B bands (a constant
 * score has one). Band 1 is the riskiest.
 *
 * Weights and rows without an outcome (holdout.weight, holdout.known): positions become
 * cumulative accounts (summed weights, `accountsBefore`) for approval rates, cut-offs and the band
 * rule (the middle of a block in accounts, over all rows); `badsBefore` sums the weights of the
 * known bads and `knownBefore` those of the known rows, so that bad rates are of known accounts.
 * Without either, those arrays are null and every position counts once, as before.
 */

export interface PreparedModel {
  name: ModelName;
  higherIs: HigherIs;
  /** Scores as given, per account. */
  raw: Float64Array;
  /** Scores turned to "higher = safer", per account. */
  safety: Float64Array;
  /** Accounts riskiest first: safety ascending, ties in account order. */
  order: Uint32Array;
  /** safety[order[k]]: the safety scores ascending. */
  sorted: Float64Array;
  /** badsBefore[k]: bads among the k riskiest accounts (positions 0 … k − 1); length n + 1. Weighted (Float64) with weights. */
  badsBefore: Uint32Array | Float64Array;
  /** Accounts (summed weights) among the k riskiest rows; null without weights (then k). */
  accountsBefore: Float64Array | null;
  /** Accounts with a known outcome among the k riskiest rows; null when every outcome is known (then accountsBefore). */
  knownBefore: Float64Array | null;
  /** Exclusive end position of each block of equal scores, ascending; the last is n. */
  blockEnds: Uint32Array;
  /** Band of each account, 0-based (0 = riskiest). */
  band: Uint8Array;
  /** Exclusive end position of each band, ascending; the last is n. Its length is the band count. */
  bandEnds: Uint32Array;
}

export interface PreparedHoldout {
  n: number;
  /** Known bads and goods (summed weights when weighted). */
  bads: number;
  goods: number;
  /** All accounts (summed weights; n without weights) and those with a known outcome. */
  accounts: number;
  knownAccounts: number;
  /** Sampling weights (null = 1 each) and outcome-known flags (null = all known). */
  weight: Float64Array | null;
  known: Uint8Array | null;
  /** Inferred probability of bad per row (0 on known rows) under the reject inference; null for known-only or when every outcome is known. */
  inferred: { method: 'parcel' | 'column'; probability: Float64Array } | null;
  /**
   * With an inference: per model, bads among the k riskiest positions counting each known bad's
   * weight and each unknown account's w·p (length n + 1); the strategy curve's books use it.
   */
  inferredBadsBefore: Record<ModelName, Float64Array> | null;
  /** 1 = bad, 0 = good, per account. */
  bad: Uint8Array;
  exposure: Float64Array | null;
  /** The mapped segment columns, as in the holdout (for the swap sets within each value). */
  segments: SegmentColumn[];
  /** Bands requested (settings.bands); a model can have fewer (see the band rule). */
  requestedBands: number;
  champion: PreparedModel;
  challenger: PreparedModel;
  /**
   * Several challengers: the challengers after the primary (holdout.moreChallengers), each
   * prepared as `challenger` is, with its inferred-bads array under the reject inference. Absent
   * for two models. pairData(data, k) puts challenger k in the challenger's place.
   */
  moreChallengers?: { model: PreparedModel; inferredBadsBefore: Float64Array | null }[];
}

export interface PrepareOptions {
  /** Quantile bands for band tables and the swap matrix; 2 … 50. */
  bands: number;
  /**
   * Orders the caller has already computed (accounts by safety ascending, e.g. from the AUC/KS
   * stage); they are checked, not trusted blindly. Without them the data are sorted here.
   */
  orders?: Partial<Record<ModelName, Uint32Array>>;
  /**
   * Both models' blocks of equal scores as scoreBlocks (order.ts) gave them for these very rows
   * and outcomes (weighed or not): their order, sorted values and outcomes are used instead of being
   * gathered again row by row (the dearest part of this preparation at millions of rows). Checked
   * at every 1,024th position and at the ends; a block of zeros still reads its values row by
   * row, so that the sign of a zero is the score's own. With weights or unknown rows the weights
   * are still read row by row (in sorted order, summed as the row-by-row pass sums them).
   */
  blocks?: Partial<Record<ModelName, ScoreBlocks>>;
  /**
   * Both models' scores already turned to "higher = safer" by safety() (order.ts) for these very
   * rows, e.g. the ones the blocks were sorted from: used instead of turning them again.
   */
  safety?: Partial<Record<ModelName, Float64Array>>;
  /** The further challengers' orders, in holdout.moreChallengers' order (checked as `orders`). */
  moreOrders?: readonly Uint32Array[];
  /** Reject inference for rows without an outcome (default known-only). */
  inference?: RejectInference;
}

export function preparePolicyData(holdout: Holdout, options: PrepareOptions): PreparedHoldout {
  const { n, bad } = holdout;
  if (n < 1) throw new Error('policy statistics require at least one account');
  if (bad.length !== n || holdout.champion.length !== n || holdout.challenger.length !== n) {
    throw new Error('policy statistics require every column to have one entry per account');
  }
  if (holdout.exposure && holdout.exposure.length !== n) throw new Error('exposure must have one entry per account');
  for (const segment of holdout.segments) {
    if (segment.codes.length !== n) throw new Error(`segment ${segment.column} must have one entry per account`);
  }
  if (!Number.isInteger(options.bands) || options.bands < 2 || options.bands > 50) {
    throw new Error(`bands must be an integer from 2 to 50, got ${options.bands}`);
  }
  const weight = holdout.weight ?? null;
  const known = holdout.known ?? null;
  if (weight && weight.length !== n) throw new Error('weight must have one entry per account');
  if (known && known.length !== n) throw new Error('known must have one entry per account');
  let bads = 0;
  let accounts = n;
  let knownAccounts = n;
  if (weight === null && known === null) {
    for (let i = 0; i < n; i++) bads += bad[i];
  } else {
    accounts = 0;
    knownAccounts = 0;
    for (let i = 0; i < n; i++) {
      const w = weight === null ? 1 : weight[i];
      accounts += w;
      if (known === null || known[i]) {
        knownAccounts += w;
        if (bad[i]) bads += w;
      }
    }
  }
  const model = (name: ModelName): PreparedModel =>
    prepareModel(name, holdout[name], holdout.higherIs[name], bad, options.bands, options.blocks?.[name] ?? options.orders?.[name], weight, known, options.safety?.[name]);
  const champion = model('champion');
  const inference = options.inference ?? { method: 'known-only', parcelFactor: 1 };
  const probability = inferBads(inference, { n, bad, known, weight, inferredBad: holdout.inferredBad ?? null }, champion);
  const inferred = probability === null || inference.method === 'known-only' ? null : { method: inference.method, probability };
  const challenger = model('challenger');
  const inferredBads = (prepared: PreparedModel, p: Float64Array) => inferredBadsBefore(prepared, p, bad, weight, known);
  const more = (holdout.moreChallengers ?? []).map((extra, m) => {
    if (extra.scores.length !== n) throw new Error('policy statistics require every column to have one entry per account');
    const prepared = prepareModel('challenger', extra.scores, extra.higherIs, bad, options.bands, options.moreOrders?.[m], weight, known);
    return { model: prepared, inferredBadsBefore: inferred === null ? null : inferredBads(prepared, inferred.probability) };
  });
  return {
    ...(more.length > 0 ? { moreChallengers: more } : {}),
    n,
    bads,
    goods: knownAccounts - bads,
    accounts,
    knownAccounts,
    weight,
    known,
    inferred,
    inferredBadsBefore: inferred === null ? null : { champion: inferredBads(champion, inferred.probability), challenger: inferredBads(challenger, inferred.probability) },
    bad,
    exposure: holdout.exposure,
    segments: holdout.segments,
    requestedBands: options.bands,
    champion,
    challenger,
  };
}

function inferredBadsBefore(prepared: PreparedModel, p: Float64Array, bad: Uint8Array, weight: Float64Array | null, known: Uint8Array | null): Float64Array {
  const n = bad.length;
  const before = new Float64Array(n + 1);
  for (let k = 0; k < n; k++) {
    const row = prepared.order[k];
    const w = weight === null ? 1 : weight[row];
    before[k + 1] = before[k] + (known === null || known[row] ? (bad[row] ? w : 0) : w * p[row]);
  }
  return before;
}

/**
 * Several challengers: the champion against challenger k (0 = the primary, `data` itself), as
 * preparePolicyData gives it for the holdout with that challenger in the challenger's place (the
 * reject inference depends on the champion only). No copy: O(1).
 */
export function pairData(data: PreparedHoldout, k: number): PreparedHoldout {
  if (k === 0) return data;
  const extra = data.moreChallengers?.[k - 1];
  if (!extra) throw new RangeError(`no challenger ${k} in the prepared data`);
  const pair: PreparedHoldout = {
    ...data,
    challenger: extra.model,
    inferredBadsBefore: data.inferredBadsBefore === null || extra.inferredBadsBefore === null ? null : { champion: data.inferredBadsBefore.champion, challenger: extra.inferredBadsBefore },
  };
  delete pair.moreChallengers;
  return pair;
}

function prepareModel(
  name: ModelName,
  raw: Float64Array,
  higherIs: HigherIs,
  bad: Uint8Array,
  bands: number,
  given: Uint32Array | ScoreBlocks | undefined,
  weight: Float64Array | null,
  known: Uint8Array | null,
  givenSafety?: Float64Array,
): PreparedModel {
  const n = raw.length;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(raw[i])) throw new Error(`${name} score is not a finite number for account ${i + 1}`);
  }
  if (givenSafety !== undefined && givenSafety.length !== n) throw new Error(`${name} safety scores must have one entry per account`);
  const safe = givenSafety ?? safety(raw, higherIs);
  const plain = weight === null && known === null;
  const givenBlocks = given !== undefined && !(given instanceof Uint32Array) ? given : null;
  const order = given === undefined ? argsortAscending(safe) : given instanceof Uint32Array ? given : given.order;
  if (order.length !== n) throw new Error(`${name} order must have one entry per account`);

  const sorted = new Float64Array(n);
  const badsBefore = plain ? new Uint32Array(n + 1) : new Float64Array(n + 1);
  const accountsBefore = weight === null ? null : new Float64Array(n + 1);
  const knownBefore = known === null ? null : new Float64Array(n + 1);
  const ends = new Uint32Array(givenBlocks !== null ? givenBlocks.count : n);
  let blocks = 0;
  if (givenBlocks !== null) blocks = fromBlocks(name, givenBlocks, safe, bad, sorted, ends, plain ? { badsBefore: badsBefore as Uint32Array } : { badsBefore, accountsBefore, knownBefore, weight, known });
  for (let k = 0; givenBlocks === null && k < n; k++) {
    const row = order[k];
    sorted[k] = safe[row];
    if (plain) badsBefore[k + 1] = badsBefore[k] + bad[row];
    else {
      const w = weight === null ? 1 : weight[row];
      badsBefore[k + 1] = badsBefore[k] + (bad[row] ? w : 0);
      if (accountsBefore !== null) accountsBefore[k + 1] = accountsBefore[k] + w;
      if (knownBefore !== null) knownBefore[k + 1] = knownBefore[k] + (known![row] ? w : 0);
    }
    if (k > 0) {
      if (sorted[k] < sorted[k - 1]) throw new Error(`${name} order is not ascending by safety at position ${k}`);
      if (sorted[k] !== sorted[k - 1]) ends[blocks++] = k;
    }
  }
  if (givenBlocks === null) ends[blocks++] = n;
  const blockEnds = blocks === ends.length ? ends : ends.slice(0, blocks);

  // Band rule (see the header): each block goes wholly to the band its middle falls in. With the
  // blocks given, each row looks its block's band up in row order (rowBlocks); else each block's
  // rows are written in sorted order.
  const band = new Uint8Array(n);
  const bandOfBlock = givenBlocks !== null ? new Uint8Array(blocks) : null;
  const bandEndList: number[] = [];
  let current = -1;
  let start = 0;
  const total = accountsBefore === null ? n : accountsBefore[n];
  for (let b = 0; b < blocks; b++) {
    const end = blockEnds[b];
    const ideal =
      accountsBefore === null
        ? Math.floor(((start + end) * bands) / (2 * n))
        : Math.min(bands - 1, Math.floor(((accountsBefore[start] + accountsBefore[end]) * bands) / (2 * total)));
    if (ideal !== current) {
      if (current >= 0) bandEndList.push(start);
      current = ideal;
    }
    const index = bandEndList.length;
    if (bandOfBlock !== null) bandOfBlock[b] = index;
    else for (let k = start; k < end; k++) band[order[k]] = index;
    start = end;
  }
  if (bandOfBlock !== null) {
    const rowBlock = rowBlocks(givenBlocks!);
    for (let i = 0; i < n; i++) band[i] = bandOfBlock[rowBlock[i]];
  }
  bandEndList.push(n);

  return {
    name,
    higherIs,
    raw,
    safety: safe,
    order,
    sorted,
    badsBefore,
    accountsBefore,
    knownBefore,
    blockEnds,
    band,
    bandEnds: Uint32Array.from(bandEndList),
  };
}

/**
 * prepareModel's sorted values, bad counts and block ends from a model's ScoreBlocks (see
 * PrepareOptions.blocks): the same arrays the row-by-row pass fills, in sequential passes; with
 * weights or unknown rows, the cumulative sums in the same order, the weights read in sequence
 * from the blocks when weighBlocks weighed them with these weights (else row by row, and the
 * known flags row by row). Returns the number of blocks.
 */
function fromBlocks(
  name: ModelName,
  blocks: ScoreBlocks,
  safe: Float64Array,
  bad: Uint8Array,
  sorted: Float64Array,
  ends: Uint32Array,
  sums:
    | { badsBefore: Uint32Array }
    | { badsBefore: Uint32Array | Float64Array; accountsBefore: Float64Array | null; knownBefore: Float64Array | null; weight: Float64Array | null; known: Uint8Array | null },
): number {
  const { order, start, value, sortedBad, count } = blocks;
  const n = order.length;
  if (start[count] !== n || sortedBad.length !== n) throw new Error(`${name} blocks do not cover every account`);
  for (let b = 0; b < count; b++) {
    const from = start[b];
    const to = start[b + 1];
    if (!(to > from) || (b > 0 && !(value[b] > value[b - 1]))) throw new Error(`${name} blocks are not ascending by safety at block ${b}`);
    if (value[b] === 0) for (let k = from; k < to; k++) sorted[k] = safe[order[k]];
    else sorted.fill(value[b], from, to);
    ends[b] = to;
  }
  const { badsBefore } = sums;
  if (!('weight' in sums)) {
    for (let k = 0; k < n; k++) badsBefore[k + 1] = badsBefore[k] + sortedBad[k];
  } else {
    const { accountsBefore, knownBefore, weight, known } = sums;
    // The blocks' weights in sorted order when they are these weights (weighBlocks), else row by row.
    const sortedWeight = weight !== null && blocks.weights?.row === weight ? blocks.weights.sorted : null;
    for (let k = 0; k < n; k++) {
      const row = order[k];
      const w = sortedWeight !== null ? sortedWeight[k] : weight === null ? 1 : weight[row];
      badsBefore[k + 1] = badsBefore[k] + (sortedBad[k] ? w : 0);
      if (accountsBefore !== null) accountsBefore[k + 1] = accountsBefore[k] + w;
      if (knownBefore !== null) knownBefore[k + 1] = knownBefore[k] + (known![row] ? w : 0);
    }
  }
  const check = (k: number) => {
    const row = order[k];
    if (sorted[k] !== safe[row] || sortedBad[k] !== bad[row]) throw new Error(`${name} blocks do not match the scores at position ${k}`);
  };
  for (let k = 0; k < n; k += 1024) check(k);
  if (n > 0) check(n - 1);
  return count;
}

/** Score range of the accounts at sorted positions [start, end), in the model's own units. */
export function rawRange(model: PreparedModel, start: number, end: number): { scoreMin: number; scoreMax: number } {
  const low = model.sorted[start];
  const high = model.sorted[end - 1];
  return model.higherIs === 'safer' ? { scoreMin: low, scoreMax: high } : { scoreMin: -high, scoreMax: -low };
}

/** Accounts (summed weights) among the first k positions of a model's order. */
export function accountsAt(model: PreparedModel, k: number): number {
  return model.accountsBefore === null ? k : model.accountsBefore[k];
}

/** Accounts with a known outcome among the first k positions of a model's order. */
export function knownAt(model: PreparedModel, k: number): number {
  return model.knownBefore !== null ? model.knownBefore[k] : accountsAt(model, k);
}

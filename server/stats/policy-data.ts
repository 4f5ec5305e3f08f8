import type { HigherIs } from '@shared/report';
import type { Holdout, ModelName, SegmentColumn } from './holdout';
import { argsortAscending, safety } from './order';

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
  /** badsBefore[k]: bads among the k riskiest accounts (positions 0 … k − 1); length n + 1. */
  badsBefore: Uint32Array;
  /** Exclusive end position of each block of equal scores, ascending; the last is n. */
  blockEnds: Uint32Array;
  /** Band of each account, 0-based (0 = riskiest). */
  band: Uint8Array;
  /** Exclusive end position of each band, ascending; the last is n. Its length is the band count. */
  bandEnds: Uint32Array;
}

export interface PreparedHoldout {
  n: number;
  bads: number;
  goods: number;
  /** 1 = bad, 0 = good, per account. */
  bad: Uint8Array;
  exposure: Float64Array | null;
  /** The mapped segment columns, as in the holdout (for the swap sets within each value). */
  segments: SegmentColumn[];
  /** Bands requested (settings.bands); a model can have fewer (see the band rule). */
  requestedBands: number;
  champion: PreparedModel;
  challenger: PreparedModel;
}

export interface PrepareOptions {
  /** Quantile bands for band tables and the swap matrix; 2 … 50. */
  bands: number;
  /**
   * Orders the caller has already computed (accounts by safety ascending, e.g. from the AUC/KS
   * stage); they are checked, not trusted blindly. Without them the data are sorted here.
   */
  orders?: Partial<Record<ModelName, Uint32Array>>;
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
  let bads = 0;
  for (let i = 0; i < n; i++) bads += bad[i];
  const model = (name: ModelName): PreparedModel =>
    prepareModel(name, holdout[name], holdout.higherIs[name], bad, options.bands, options.orders?.[name]);
  return {
    n,
    bads,
    goods: n - bads,
    bad,
    exposure: holdout.exposure,
    segments: holdout.segments,
    requestedBands: options.bands,
    champion: model('champion'),
    challenger: model('challenger'),
  };
}

function prepareModel(
  name: ModelName,
  raw: Float64Array,
  higherIs: HigherIs,
  bad: Uint8Array,
  bands: number,
  givenOrder: Uint32Array | undefined,
): PreparedModel {
  const n = raw.length;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(raw[i])) throw new Error(`${name} score is not a finite number for account ${i + 1}`);
  }
  const safe = safety(raw, higherIs);
  const order = givenOrder ?? argsortAscending(safe);
  if (order.length !== n) throw new Error(`${name} order must have one entry per account`);

  const sorted = new Float64Array(n);
  const badsBefore = new Uint32Array(n + 1);
  const ends = new Uint32Array(n);
  let blocks = 0;
  for (let k = 0; k < n; k++) {
    const row = order[k];
    sorted[k] = safe[row];
    badsBefore[k + 1] = badsBefore[k] + bad[row];
    if (k > 0) {
      if (sorted[k] < sorted[k - 1]) throw new Error(`${name} order is not ascending by safety at position ${k}`);
      if (sorted[k] !== sorted[k - 1]) ends[blocks++] = k;
    }
  }
  ends[blocks++] = n;
  const blockEnds = ends.slice(0, blocks);

  const bandEnds = bandEndsOf(blockEnds, n, bands);
  const band = new Uint8Array(n);
  let start = 0;
  for (let b = 0; b < bandEnds.length; b++) {
    for (let k = start; k < bandEnds[b]; k++) band[order[k]] = b;
    start = bandEnds[b];
  }

  return {
    name,
    higherIs,
    raw,
    safety: safe,
    order,
    sorted,
    badsBefore,
    blockEnds,
    band,
    bandEnds,
  };
}

/**
 * The band rule of the header on sorted positions: given the exclusive ends of the blocks of
 * equal scores (ascending, the last is n), the exclusive end of each band. Also used for the
 * PSI's reference bands (psi.ts).
 */
export function bandEndsOf(blockEnds: Uint32Array, n: number, bands: number): Uint32Array {
  const ends: number[] = [];
  let current = -1;
  let start = 0;
  for (let b = 0; b < blockEnds.length; b++) {
    const end = blockEnds[b];
    const ideal = Math.floor(((start + end) * bands) / (2 * n));
    if (ideal !== current) {
      if (current >= 0) ends.push(start);
      current = ideal;
    }
    start = end;
  }
  ends.push(n);
  return Uint32Array.from(ends);
}

/** Score range of the accounts at sorted positions [start, end), in the model's own units. */
export function rawRange(model: PreparedModel, start: number, end: number): { scoreMin: number; scoreMax: number } {
  const low = model.sorted[start];
  const high = model.sorted[end - 1];
  return model.higherIs === 'safer' ? { scoreMin: low, scoreMax: high } : { scoreMin: -high, scoreMax: -low };
}

import type { DataQuality } from '@shared/report';
import { duplicateIds as countDuplicateIds } from './duplicate-ids';
import type { Holdout } from './holdout';
import { rowBlocks, type ScoreBlocks } from './order';
import { knownAt, type PreparedHoldout, type PreparedModel } from './policy-data';
import { formatAuc, formatCount } from '@shared/format';

/**
 * Data-quality summary of a holdout: rows read / used / dropped, empty cells per mapped column
 * (from the reader), each score's min, max, mean and number of distinct values, the Pearson and
 * Spearman correlation of the two scores as given (Spearman = Pearson of midranks; C. Spearman
 * 1904, American Journal of Psychology 15:72–101, from memory), duplicate account ids, and
 * plain-language warnings. Warning thresholds are rules of thumb, no source:
 * fewer than 100 bads or goods; fewer than 20 distinct score values; a model whose AUC in its
 * declared orientation is below 0.5 (it ranks bads as safer than goods, so the orientation looks
 * reversed).
 * Cost: O(n) on prepared data (O(n) expected for the id set).
 */

/** What the reader knows about the file beyond the holdout itself. */
export interface ReadSummary {
  rowsRead: number;
  rowsDroppedMissingScore: number;
  missingByColumn: Record<string, number>;
}

const FEW_CLASS = 100;
const FEW_DISTINCT = 20;

/**
 * `blocks`: both models' ScoreBlocks (order.ts) that `data` was prepared from (PrepareOptions.blocks),
 * when there are: the midranks then come from each row's block number (rowBlocks) in row order.
 */
export function dataQuality(holdout: Holdout, data: PreparedHoldout, read: ReadSummary, blocks?: Record<'champion' | 'challenger', ScoreBlocks>): DataQuality {
  const { n, bads, goods } = data;
  const warnings: string[] = [];
  if (bads === 0 || goods === 0) warnings.push(`Only one outcome is present (${bads} bads, ${goods} goods): nothing can be compared.`);
  else {
    if (bads < FEW_CLASS) warnings.push(`Only ${bads} bads: intervals are wide and the large-sample approximations are rough.`);
    if (goods < FEW_CLASS) warnings.push(`Only ${goods} goods: intervals are wide and the large-sample approximations are rough.`);
  }
  if (read.rowsDroppedMissingScore > 0) {
    warnings.push(`${plural(read.rowsDroppedMissingScore, 'row was', 'rows were')} left out because a score was missing.`);
  }

  const summaries = [data.champion, data.challenger].map((model) => {
    const label = model.name === 'champion' ? 'champion' : 'challenger';
    const distinct = model.blockEnds.length;
    if (distinct === 1) warnings.push(`The ${label} score is constant: it does not rank the accounts.`);
    else if (distinct < FEW_DISTINCT) {
      warnings.push(`The ${label} score has only ${distinct} distinct values: bands and cut-offs move in coarse steps.`);
    }
    if (distinct > 1 && bads > 0 && goods > 0) {
      const auc = aucOf(model, bads, goods);
      if (auc < 0.5) {
        warnings.push(
          `The ${label}'s AUC is ${formatAuc(auc)} with higher = ${model.higherIs}: it ranks bads as safer than goods; check the orientation.`,
        );
      }
    }
    return summary(model);
  });

  if (holdout.higherIs.champion === holdout.higherIs.challenger && sameValues(holdout.champion, holdout.challenger)) {
    warnings.push('The champion and challenger scores are identical on every account.');
  }

  let duplicateIds: number | null = null;
  if (holdout.ids) {
    duplicateIds = countDuplicateIds(holdout.ids);
    if (duplicateIds > 0) warnings.push(`${plural(duplicateIds, 'account repeats', 'accounts repeat')} an earlier account id.`);
  }
  if (data.exposure) {
    let negative = 0;
    for (let i = 0; i < n; i++) if (data.exposure[i] < 0) negative++;
    if (negative > 0) warnings.push(`${plural(negative, 'account has', 'accounts have')} a negative exposure.`);
  }

  // A constant score has no correlation; tested on the distinct count, since a rounded mean can
  // leave a spurious non-zero variance.
  const constant = data.champion.blockEnds.length === 1 || data.challenger.blockEnds.length === 1;
  return {
    rowsRead: read.rowsRead,
    rowsUsed: n,
    rowsDroppedMissingScore: read.rowsDroppedMissingScore,
    missingByColumn: read.missingByColumn,
    champion: summaries[0],
    challenger: summaries[1],
    scoreCorrelation: constant
      ? { pearson: null, spearman: null }
      : {
          pearson: pearson(holdout.champion, holdout.challenger),
          spearman: spearman(data.champion, data.challenger, blocks),
        },
    duplicateIds,
    warnings,
  };
}

function summary(model: PreparedModel): DataQuality['champion'] {
  const { raw, sorted } = model;
  const n = raw.length;
  // Scaled as in pearson, so the mean of finite scores is finite.
  const scale = scaleOf(raw);
  let sum = 0;
  for (let i = 0; i < n; i++) sum += raw[i] / scale;
  const low = sorted[0];
  const high = sorted[n - 1];
  return {
    min: model.higherIs === 'safer' ? low : -high,
    max: model.higherIs === 'safer' ? high : -low,
    mean: (sum / n) * scale,
    distinct: model.blockEnds.length,
  };
}

/** Mann–Whitney AUC in the declared orientation: P(a good is safer than a bad), ties ½. */
function aucOf(model: PreparedModel, bads: number, goods: number): number {
  let numerator = 0;
  let start = 0;
  for (let b = 0; b < model.blockEnds.length; b++) {
    const end = model.blockEnds[b];
    const blockBads = model.badsBefore[end] - model.badsBefore[start];
    const blockGoods = knownAt(model, end) - knownAt(model, start) - blockBads;
    numerator += blockGoods * (model.badsBefore[start] + blockBads / 2);
    start = end;
  }
  return numerator / bads / goods;
}

/** Midranks (1-based) of the scores as given, per account: the plain way, each block's rows written in sorted order. */
export function rawMidranks(model: PreparedModel): Float64Array {
  const n = model.raw.length;
  const ranks = new Float64Array(n);
  const rankOf = midrankOfBlocks(model);
  let start = 0;
  for (let b = 0; b < model.blockEnds.length; b++) {
    const end = model.blockEnds[b];
    for (let k = start; k < end; k++) ranks[model.order[k]] = rankOf[b];
    start = end;
  }
  return ranks;
}

/** The midrank (1-based) of each block of equal scores, in the scores' own orientation. */
function midrankOfBlocks(model: PreparedModel): Float64Array {
  const n = model.raw.length;
  const flip = model.higherIs === 'riskier';
  const rankOf = new Float64Array(model.blockEnds.length);
  let start = 0;
  for (let b = 0; b < model.blockEnds.length; b++) {
    const end = model.blockEnds[b];
    const midrank = (start + 1 + end) / 2;
    rankOf[b] = flip ? n + 1 - midrank : midrank;
    start = end;
  }
  return rankOf;
}

/**
 * Spearman's correlation: Pearson's of the midranks. With the blocks each model was prepared from
 * (the same order), each row's midrank is its block's, read through its block number (rowBlocks,
 * order.ts) in row order, and pearsonOfBlocks sums exactly as pearson does on the midranks; else
 * pearson(rawMidranks(…)), the plain way. The same bits either way.
 */
export function spearman(champion: PreparedModel, challenger: PreparedModel, blocks?: Record<'champion' | 'challenger', ScoreBlocks>): number | null {
  const usable = (model: PreparedModel, given: ScoreBlocks | undefined): given is ScoreBlocks =>
    given !== undefined && given.order === model.order && given.count === model.blockEnds.length;
  if (blocks === undefined || !usable(champion, blocks.champion) || !usable(challenger, blocks.challenger)) {
    return pearson(rawMidranks(champion), rawMidranks(challenger));
  }
  return pearsonOfBlocks(midrankOfBlocks(champion), rowBlocks(blocks.champion), midrankOfBlocks(challenger), rowBlocks(blocks.challenger));
}

/**
 * pearson(x, y) for x[i] = xOf[xBlock[i]], y[i] = yOf[yBlock[i]], every block holding a row (so
 * the largest |value| of the table is the rows'): the same operations in the same order.
 */
function pearsonOfBlocks(xOf: Float64Array, xBlock: Uint32Array, yOf: Float64Array, yBlock: Uint32Array): number | null {
  const n = xBlock.length;
  const ax = scaleOf(xOf);
  const ay = scaleOf(yOf);
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    sx += xOf[xBlock[i]] / ax;
    sy += yOf[yBlock[i]] / ay;
  }
  const mx = sx / n;
  const my = sy / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = xOf[xBlock[i]] / ax - mx;
    const dy = yOf[yBlock[i]] / ay - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (!(sxx > 0 && syy > 0)) return null;
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
}

/** The largest |value| (1 when all are 0): dividing by it keeps sums of values and squares finite. */
function scaleOf(values: Float64Array): number {
  let most = 0;
  for (let i = 0; i < values.length; i++) most = Math.max(most, Math.abs(values[i]));
  return most > 0 && Number.isFinite(most) ? most : 1;
}

/**
 * Pearson's correlation. Each series is first divided by its largest |value| (the correlation does
 * not change under scaling), so sums and squares stay finite for any finite scores: a score of
 * 1.7976931348623151e+308 made the plain sums overflow to Infinity and the result NaN.
 */
export function pearson(x: Float64Array, y: Float64Array): number | null {
  const n = x.length;
  const ax = scaleOf(x);
  const ay = scaleOf(y);
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    sx += x[i] / ax;
    sy += y[i] / ay;
  }
  const mx = sx / n;
  const my = sy / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = x[i] / ax - mx;
    const dy = y[i] / ay - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (!(sxx > 0 && syy > 0)) return null;
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
}

function sameValues(x: Float64Array, y: Float64Array): boolean {
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
  return true;
}

function plural(n: number, one: string, many: string): string {
  return `${formatCount(n)} ${n === 1 ? one : many}`;
}

import { errorCodes } from '@shared/errors';
import { noSuchChallengerMessage } from '@shared/challengers-words';
import { challengersOf, type Report } from '@shared/report';
import { AppError } from '../errors';
import { pairData } from '../stats/policy-data';
import type { Response } from 'express';
import type { AppContext } from '../context';
import { findComparison, currentReportJson } from './service';
import { attachment, type Cell, downloadName, sendCsv } from './csv';
import { preparedCurrentRun, swapRequestOf } from './swap';
import { bandTable } from '../stats/bands';
import { locateCutoff } from '../stats/cutoffs';
import type { SwapRequest } from '../stats/swap-sets';

/**
 * Downloads of the current run: the band tables (bands.csv), the swap-in and swap-out accounts at
 * chosen cut-offs or an approval rate (swap.csv), and the report (report.json).
 */

/**
 * The band tables as CSV: the champion's and the primary challenger's, or with `challenger` = k ≥ 1
 * the champion's and challenger k's (the report's `challengers[k].bands`; a report from before
 * band tables per challenger has them computed from the run's prepared data, the same function
 * on the same data). File `…bands.csv`, or `…bands-challenger-k.csv` for k ≥ 1.
 */
export async function exportBands(ctx: AppContext, comparisonId: number, query: { challenger?: number }, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const { json } = await currentReportJson(ctx.dataSource, comparisonId);
  const report = JSON.parse(json) as Report;
  const k = query.challenger ?? 0;
  const count = challengersOf(report.mapping).length;
  if (k >= count) throw noSuchChallenger(k, count);
  let challengerBands = k === 0 ? report.bands.challenger : report.challengers?.[k]?.bands;
  if (!challengerBands) {
    const { entry } = await preparedCurrentRun(ctx, comparisonId);
    challengerBands = bandTable(pairData(entry.data, k), 'challenger');
  }
  const header = ['model', 'band', 'score_min', 'score_max', 'accounts', 'goods', 'bads', 'bad_rate', 'cum_bad_share', 'cum_good_share', 'ks', 'odds'];
  const rows: Cell[][] = [];
  for (const [model, table] of [['champion', report.bands.champion], ['challenger', challengerBands]] as const) {
    for (const row of table.rows) {
      rows.push([model, row.band, row.scoreMin, row.scoreMax, row.count, row.goods, row.bads, row.badRate, row.cumBadShare, row.cumGoodShare, row.ks, row.odds]);
    }
  }
  await sendCsv(res, downloadName(comparison, k === 0 ? 'bands.csv' : `bands-challenger-${k}.csv`), header, rows);
}

/** 400 for a challenger index the comparison does not have. */
function noSuchChallenger(k: number, count: number): AppError {
  return new AppError(errorCodes.badInput, noSuchChallengerMessage(k, count), 400);
}

export interface SwapExportQuery {
  championCutoff?: number;
  challengerCutoff?: number;
  approvalRate?: number;
  /** Several challengers: the challenger's index (0 = the primary, the default). */
  challenger?: number;
}

/**
 * One line per swap-in or swap-out account: which set, its position in the holdout as used
 * (1 = first row read), its id when mapped, both scores as given, the outcome (bad or good), its
 * amount when exposure is mapped, and its value of each mapped segment column (headed by the
 * column's name; `segment_` before it when that name is one of the fixed ones). Without cut-offs
 * or a rate: the report's own basis.
 */
export async function exportSwap(ctx: AppContext, comparisonId: number, query: SwapExportQuery, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const { run, entry } = await preparedCurrentRun(ctx, comparisonId);
  const k = query.challenger ?? 0;
  const challengers = challengersOf(run.mapping);
  if (k >= challengers.length) throw noSuchChallenger(k, challengers.length);
  let request: SwapRequest;
  if (query.championCutoff !== undefined && query.challengerCutoff !== undefined) {
    request = { basis: 'cutoffs', cutoffs: { champion: query.championCutoff, challenger: query.challengerCutoff } };
  } else if (query.approvalRate !== undefined) {
    request = { basis: 'approval-rate', approvalRate: query.approvalRate };
  } else {
    // The report's basis; its cut-offs are the primary's, so a further challenger is matched at the report's approval rate.
    request = swapRequestOf({ cutoffs: k === 0 ? entry.settings.cutoffs : null, approvalRate: entry.settings.approvalRate });
  }
  const data = pairData(entry.data, k);
  const ids = await ctx.preparedCache.ids(ctx.dataSource, entry);
  const locate = (model: 'champion' | 'challenger') =>
    locateCutoff(data[model], request.basis === 'cutoffs' ? { cutoff: request.cutoffs[model] } : { approvalRate: request.approvalRate });
  const cutChampion = locate('champion').safetyCut;
  const cutChallenger = locate('challenger').safetyCut;
  const a = data.champion.safety;
  const b = data.challenger.safety;
  const { exposure } = data;
  const championRaw = data.champion.raw;
  const challengerRaw = data.challenger.raw;
  const segments = data.segments;

  function* rows(): Generator<Cell[]> {
    for (let i = 0; i < data.n; i++) {
      const championAccepts = a[i] >= cutChampion;
      const challengerAccepts = b[i] >= cutChallenger;
      if (championAccepts === challengerAccepts) continue;
      yield [
        challengerAccepts ? 'swap-in' : 'swap-out',
        i + 1,
        ids ? ids[i] : null,
        championRaw[i],
        challengerRaw[i],
        data.bad[i] === 1 ? 'bad' : 'good',
        exposure ? exposure[i] : null,
        ...segments.map((segment) => segment.levels[segment.codes[i]]),
      ];
    }
  }
  const fixed = ['set', 'account', 'id', 'champion_score', 'challenger_score', 'outcome', 'amount'];
  const header = [...fixed, ...segments.map((segment) => (fixed.includes(segment.column) ? `segment_${segment.column}` : segment.column))];
  await sendCsv(res, downloadName(comparison, k === 0 ? 'swap.csv' : `swap-challenger-${k}.csv`), header, rows());
}

export async function exportReport(ctx: AppContext, comparisonId: number, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const { json } = await currentReportJson(ctx.dataSource, comparisonId);
  attachment(res, downloadName(comparison, 'report.json'));
  res.status(200).type('application/json').send(json);
}

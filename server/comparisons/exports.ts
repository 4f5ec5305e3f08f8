import type { Report } from '@shared/report';
import type { Response } from 'express';
import type { AppContext } from '../context';
import { findComparison, currentReportJson } from './service';
import { attachment, type Cell, downloadName, sendCsv } from './csv';
import { preparedCacheFor } from './prepared-cache';
import { preparedCurrentRun, swapRequestOf } from './swap';
import { locateCutoff } from '../stats/cutoffs';
import type { SwapRequest } from '../stats/swap-sets';

/**
 * Downloads of the current run: the band tables (bands.csv), the swap-in and swap-out accounts at
 * chosen cut-offs or an approval rate (swap.csv), and the report (report.json).
 */

export async function exportBands(ctx: AppContext, comparisonId: number, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const { json } = await currentReportJson(ctx.dataSource, comparisonId);
  const report = JSON.parse(json) as Report;
  const header = ['model', 'band', 'score_min', 'score_max', 'accounts', 'goods', 'bads', 'bad_rate', 'cum_bad_share', 'cum_good_share', 'ks', 'odds'];
  const rows: Cell[][] = [];
  for (const model of ['champion', 'challenger'] as const) {
    for (const row of report.bands[model].rows) {
      rows.push([model, row.band, row.scoreMin, row.scoreMax, row.count, row.goods, row.bads, row.badRate, row.cumBadShare, row.cumGoodShare, row.ks, row.odds]);
    }
  }
  await sendCsv(res, downloadName(comparison, 'bands.csv'), header, rows);
}

export interface SwapExportQuery {
  championCutoff?: number;
  challengerCutoff?: number;
  approvalRate?: number;
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
  const { entry } = await preparedCurrentRun(ctx, comparisonId);
  let request: SwapRequest;
  if (query.championCutoff !== undefined && query.challengerCutoff !== undefined) {
    request = { basis: 'cutoffs', cutoffs: { champion: query.championCutoff, challenger: query.challengerCutoff } };
  } else if (query.approvalRate !== undefined) {
    request = { basis: 'approval-rate', approvalRate: query.approvalRate };
  } else {
    request = swapRequestOf({ cutoffs: entry.settings.cutoffs, approvalRate: entry.settings.approvalRate });
  }
  const { data } = entry;
  const ids = await preparedCacheFor(ctx.dataSource).ids(ctx.dataSource, entry);
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
  await sendCsv(res, downloadName(comparison, 'swap.csv'), header, rows());
}

export async function exportReport(ctx: AppContext, comparisonId: number, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const { json } = await currentReportJson(ctx.dataSource, comparisonId);
  attachment(res, downloadName(comparison, 'report.json'));
  res.status(200).type('application/json').send(json);
}

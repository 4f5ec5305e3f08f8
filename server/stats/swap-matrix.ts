import type { SwapMatrix } from '@shared/report';
import { rawRange, type PreparedHoldout, type PreparedModel } from './policy-data';

/**
 * Swap matrix: champion band × challenger band (quantile bands, deciles by default), with the
 * count, bads and bad rate of every cell; band 1 is the riskiest. Bands follow the rule in
 * policy-data.ts (a band never splits a score value), so a model with heavy ties can have fewer
 * bands than requested: `bands` is the number requested, the band lists give the bands that
 * exist, and `cells` is championBands.length × challengerBands.length.
 * With weights and applicants without an outcome: counts are accounts (summed weights, every
 * row), bads and the bad rate those of the accounts with a known outcome, `unknown` the rest.
 * Common practice, no source.
 * Cost: one O(n) pass on prepared data, plus O(bands²).
 */
export function swapMatrix(data: PreparedHoldout): SwapMatrix {
  const { n, bad, weight, known } = data;
  const rowBand = data.champion.band;
  const columnBand = data.challenger.band;
  const rows = data.champion.bandEnds.length;
  const columns = data.challenger.bandEnds.length;
  const counts = new Float64Array(rows * columns);
  const bads = new Float64Array(rows * columns);
  const knowns = weight === null && known === null ? counts : new Float64Array(rows * columns);
  if (knowns === counts) {
    for (let i = 0; i < n; i++) {
      const index = rowBand[i] * columns + columnBand[i];
      counts[index]++;
      bads[index] += bad[i];
    }
  } else {
    for (let i = 0; i < n; i++) {
      const index = rowBand[i] * columns + columnBand[i];
      const w = weight === null ? 1 : weight[i];
      counts[index] += w;
      if (known === null || known[i]) {
        knowns[index] += w;
        if (bad[i]) bads[index] += w;
      }
    }
  }
  const cells: SwapMatrix['cells'] = [];
  for (let r = 0; r < rows; r++) {
    const row: SwapMatrix['cells'][number] = [];
    for (let c = 0; c < columns; c++) {
      const count = counts[r * columns + c];
      const cellBads = bads[r * columns + c];
      const cellKnown = knowns[r * columns + c];
      row.push({
        count,
        bads: cellBads,
        badRate: cellKnown > 0 ? cellBads / cellKnown : null,
        ...(known !== null ? { unknown: Math.max(0, count - cellKnown) } : {}),
      });
    }
    cells.push(row);
  }
  return {
    bands: data.requestedBands,
    championBands: bandRanges(data.champion),
    challengerBands: bandRanges(data.challenger),
    cells,
  };
}

function bandRanges(model: PreparedModel): SwapMatrix['championBands'] {
  const out: SwapMatrix['championBands'] = [];
  let start = 0;
  for (let b = 0; b < model.bandEnds.length; b++) {
    const end = model.bandEnds[b];
    out.push({ band: b + 1, ...rawRange(model, start, end) });
    start = end;
  }
  return out;
}

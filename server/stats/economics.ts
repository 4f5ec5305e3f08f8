import type { AnalysisSettings, Economics } from '@shared/report';
import { locateCutoff } from './cutoffs';
import { accountsAt, knownAt, type PreparedHoldout, type PreparedModel } from './policy-data';

/**
 * Expected profit by cut-off for each model: profit = profitPerGood × approved goods − loss on
 * approved bads, where a bad's loss is lossPerBad, or lgd × its exposure when an LGD is given.
 * The curve is evaluated at approval rates 1%, …, 100% (tie rule in cutoffs.ts; each point shows
 * the approval rate achieved, repeated cut-offs are dropped); the best cut-off is searched over
 * every score value of the model (each block of equal scores), so it is exact, not the best of
 * the curve. On equal profit the higher approval rate wins. Accepting nobody is not a cut-off and
 * is not considered, so the best profit can be negative.
 * Weighted: goods, bads and losses are summed weights (the engine passes data of the rows with a
 * known outcome).
 * Common practice, no source.
 * Cost: O(n) per model for the exposure sums when an LGD is used, otherwise O(distinct scores +
 * 100 · log n), on prepared data.
 */
export function economics(data: PreparedHoldout, settings: NonNullable<AnalysisSettings['economics']>): Economics {
  const { profitPerGood, lossPerBad, lgd } = settings;
  if (!Number.isFinite(profitPerGood)) throw new Error('economics requires a finite profit per good');
  if (lgd === null && (lossPerBad === null || !Number.isFinite(lossPerBad))) {
    throw new Error('economics requires a loss per bad or an LGD');
  }
  if (lgd !== null && !(lgd >= 0 && lgd <= 1)) throw new Error(`LGD must be between 0 and 1, got ${lgd}`);
  if (lgd !== null && data.exposure === null) throw new Error('economics with an LGD requires an exposure column');
  return {
    profitPerGood,
    lossPerBad,
    lgd,
    champion: modelEconomics(data, data.champion, profitPerGood, lossPerBad ?? 0, lgd),
    challenger: modelEconomics(data, data.challenger, profitPerGood, lossPerBad ?? 0, lgd),
  };
}

function modelEconomics(
  data: PreparedHoldout,
  model: PreparedModel,
  profitPerGood: number,
  lossPerBad: number,
  lgd: number | null,
): Economics['champion'] {
  const { n, bad } = data;
  const { badsBefore, blockEnds, order } = model;
  // Loss of the book [start, n): lossPerBad × bads, or lgd × exposure of its bads.
  let lossBefore: Float64Array | null = null;
  let totalLoss: number;
  if (lgd !== null && data.exposure) {
    const exposure = data.exposure;
    lossBefore = new Float64Array(n + 1);
    for (let k = 0; k < n; k++) {
      const row = order[k];
      lossBefore[k + 1] = lossBefore[k] + (bad[row] ? lgd * exposure[row] * (data.weight === null ? 1 : data.weight[row]) : 0);
    }
    totalLoss = lossBefore[n];
  } else {
    totalLoss = lossPerBad * data.bads;
  }
  const profit = (start: number): number => {
    const accepted = knownAt(model, n) - knownAt(model, start);
    const bads = data.bads - badsBefore[start];
    const loss = lossBefore ? totalLoss - lossBefore[start] : lossPerBad * bads;
    return profitPerGood * (accepted - bads) - loss;
  };

  let bestStart = 0;
  let bestProfit = profit(0);
  for (let b = 0; b < blockEnds.length - 1; b++) {
    const value = profit(blockEnds[b]);
    if (value > bestProfit) {
      bestProfit = value;
      bestStart = blockEnds[b];
    }
  }
  const bestScore = model.sorted[bestStart];
  const curve: Economics['champion']['curve'] = [];
  let lastStart = -1;
  for (let j = 1; j <= 100; j++) {
    const located = locateCutoff(model, { approvalRate: j / 100 });
    if (located.start === lastStart) continue;
    lastStart = located.start;
    curve.push({ approvalRate: located.position.approvalRate, cutoff: located.position.cutoff, profit: profit(located.start) });
  }
  return {
    bestCutoff: model.higherIs === 'safer' ? bestScore : -bestScore,
    bestApprovalRate: (accountsAt(model, n) - accountsAt(model, bestStart)) / data.accounts,
    bestProfit,
    curve,
  };
}

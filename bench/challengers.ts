import seedrandom from 'seedrandom';
import type { Holdout } from '@server/stats/holdout';
import { ks } from '@server/stats/ks';
import { pairedDelong } from '@server/stats/delong';
import { safety, scoreBlocks } from '@server/stats/order';
import { severalChallengers } from '@server/stats/several-challengers';

/**
 * The bench's several-challenger stage (issue 15): AUC + DeLong + KS for a champion and three
 * challengers (each challenger against the champion with Holm, every pair, the joint test on the
 * DeLong covariance of all four AUCs, each model's KS, each model sorted once) against the same
 * work for the two models (the paired DeLong, both KS). Runs alternate, two-model then four-model,
 * so both see the same machine; the goal is the ratio of their medians: under 2.5.
 *
 * The two further challengers are made in memory from the bench holdout with a seeded stream: the
 * challenger's score blurred, and the champion's score blurred (in points, rounded to integers, so
 * they tie as points do).
 */
export function withTwoMoreChallengers(holdout: Holdout, points: boolean): Holdout {
  const random = seedrandom('bench-challengers');
  const normal = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const blur = (scores: Float64Array, scale: number) => {
    const out = new Float64Array(scores.length);
    for (let i = 0; i < scores.length; i++) {
      const value = scores[i] + scale * normal();
      out[i] = points ? Math.round(value) : Number(value.toPrecision(6));
    }
    return out;
  };
  const spreadOf = (scores: Float64Array) => {
    let sum = 0;
    let squares = 0;
    for (const value of scores) {
      sum += value;
      squares += value * value;
    }
    const mean = sum / scores.length;
    return Math.sqrt(Math.max(0, squares / scores.length - mean * mean));
  };
  return {
    ...holdout,
    moreChallengers: [
      { column: 'challenger_blurred', name: 'challenger blurred', higherIs: holdout.higherIs.challenger, scores: blur(holdout.challenger, 0.3 * spreadOf(holdout.challenger)) },
      { column: 'champion_blurred', name: 'champion blurred', higherIs: holdout.higherIs.champion, scores: blur(holdout.champion, 0.2 * spreadOf(holdout.champion)) },
    ],
  };
}

export function twoModels(holdout: Holdout): number {
  const a = scoreBlocks(safety(holdout.champion, holdout.higherIs.champion), holdout.bad);
  const b = scoreBlocks(safety(holdout.challenger, holdout.higherIs.challenger), holdout.bad);
  const delong = pairedDelong(a, b, holdout.bad, 0.95);
  return delong.difference.gini + ks(a, holdout.higherIs.champion).ks + ks(b, holdout.higherIs.challenger).ks;
}

export function fourModels(holdout: Holdout): number {
  const a = scoreBlocks(safety(holdout.champion, holdout.higherIs.champion), holdout.bad);
  const challengers = [
    { scores: holdout.challenger, higherIs: holdout.higherIs.challenger },
    ...holdout.moreChallengers!.map((extra) => ({ scores: extra.scores, higherIs: extra.higherIs })),
  ].map((model) => ({ blocks: scoreBlocks(safety(model.scores, model.higherIs), holdout.bad), higherIs: model.higherIs }));
  const several = severalChallengers(
    a,
    challengers.map((model) => model.blocks),
    holdout.bad,
    0.95,
  );
  let sum = several.joint?.chi2 ?? 0;
  sum += ks(a, holdout.higherIs.champion).ks;
  for (const model of challengers) sum += ks(model.blocks, model.higherIs).ks;
  return sum;
}

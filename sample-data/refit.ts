/**
 * The demo's third model: a refit of the champion scorecard on recent applications (AS-19 refit,
 * in points, higher = safer), the "refit with recent data" a team brings beside its new model.
 * It keeps the champion's characteristics but re-weighs them on 2024 data, so it reads the
 * applicant's declared cash flow a little better than the champion and no longer as well as the
 * cash-flow challenger; having no broker cash-flow feed, it has no weakness with brokered cards.
 * On the holdout it is better than the champion and worse than the challenger overall.
 *
 *   refit safety = −intercept − offset + 1.0·bureau + 0.45·cash flow + 0.5·noise
 * (champion: 0.3·cash flow + 0.55·noise; challenger: 0.65·cash flow + 0.45·noise, generate.ts),
 * with its own seeded stream, so the applicants and the other scores do not change.
 */
import { type Account, INTERCEPT, POINTS_FACTOR, randomSource } from './generate';

export function refitPoints(accounts: readonly Account[]): Map<string, number> {
  const random = randomSource('tallowmere-2025-refit');
  const points = new Map<string, number>();
  for (const a of accounts) {
    const safety = -INTERCEPT - a.offset + 1.0 * a.bureau + 0.45 * a.cashFlow + 0.5 * random.normal();
    points.set(a.id, Math.round(600 + POINTS_FACTOR * (safety - 3)));
  }
  return points;
}

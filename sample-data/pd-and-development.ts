/**
 * The demo's calibration and stability story, kept apart from the holdout's own simulation
 * (generate.ts) so that each can change without the other.
 *
 * - `pdWithBrokerDrift`: the challenger's probability of default as the PD file gives it. The
 *   modelers recalibrated the challenger's intercept on the development sample (a small shift of
 *   its log-odds, PD_SHIFT). From July 2025 a broker partnership sends brokered card applications
 *   with self-declared cash-flow figures that nobody verifies and that run optimistic, more so
 *   each month as the partnership grows: for those accounts the challenger's log-odds of bad are
 *   pulled down and blurred (an own seeded stream of noise). Calibration then fails in the bands
 *   where those accounts land, and the challenger's uplift shrinks month by month in the second
 *   half of the year.
 * - `developmentCsv`: the development sample of 2023 the challenger was built on (scores only, no
 *   outcome: what a PSI needs). Brokers were a smaller channel then and their cash-flow data were
 *   verified, so the holdout's population has moved towards brokered business since.
 *
 * Both deterministic (seedrandom), like every demo file.
 */
import { type Account, type Channel, INTERCEPT, POINTS_FACTOR, type Product, channelRisk, productMix, productRisk, randomSource, sigmoid } from './generate';

/**
 * The recalibration fitted on the development sample: log-odds' = PD_CENTRE + PD_SLOPE · (log-odds − PD_CENTRE) + PD_SHIFT
 * (the challenger's raw log-odds are a little too spread out, its own estimation noise).
 */
const PD_CENTRE = -3;
const PD_SLOPE = 0.8;
const PD_SHIFT = 0.25;
const recalibrate = (logit: number) => PD_CENTRE + PD_SLOPE * (logit - PD_CENTRE) + PD_SHIFT;
/** The applicants of 2023 had stronger bureau files on average (a shift of the standard normal trait). */
const BUREAU_2023 = 0.25;
/** From this month on brokered cards arrive with unverified, optimistic cash-flow figures. */
const DRIFT_FROM_MONTH = 7;

export function pdWithBrokerDrift(accounts: readonly Account[]): number[] {
  const random = randomSource('tallowmere-2025-broker-drift');
  return accounts.map((a) => {
    const logit = recalibrate(Math.log(a.challengerPd / (1 - a.challengerPd)));
    const month = Number(a.month.slice(5));
    const drift = a.product === 'credit-card' && a.channel === 'broker' && month >= DRIFT_FROM_MONTH;
    const noise = random.normal();
    if (!drift) return Number(sigmoid(logit).toFixed(6));
    const months = month - DRIFT_FROM_MONTH + 1; // 1 in July … 6 in December
    return Number(sigmoid(logit - 0.25 * months + 0.3 * months * noise).toFixed(6));
  });
}

const developmentChannelMix: Record<Product, readonly (readonly [Channel, number])[]> = {
  'personal-loan': [
    ['branch', 0.48],
    ['web', 0.4],
    ['broker', 0.12],
  ],
  'credit-card': [
    ['branch', 0.32],
    ['web', 0.6],
    ['broker', 0.08],
  ],
};

/** The 2023 development sample: scores as the models give them, no outcome. */
export function developmentCsv(count = 40_000): string {
  const random = randomSource('tallowmere-development-2023');
  const lines = ['account_id,application_month,product,channel,product_channel,champion_points,challenger_points,challenger_pd'];
  for (let i = 0; i < count; i++) {
    const monthIndex = Math.floor(random.uniform() * 12);
    const product = random.pick(productMix);
    const channel = random.pick(developmentChannelMix[product]);
    const bureau = random.normal() + BUREAU_2023;
    const cashFlow = random.normal();
    const season = 0.08 * Math.sin((2 * Math.PI * monthIndex) / 12);
    const offset = productRisk[product] + channelRisk[channel] + season;
    // As in the holdout's simulation, with every cash-flow figure verified.
    const championSafety = -INTERCEPT - offset + 1.0 * bureau + 0.3 * cashFlow + 0.55 * random.normal();
    const challengerSafety = -INTERCEPT - offset + 1.0 * bureau + 0.65 * cashFlow + 0.45 * random.normal();
    const id = `TCC-23-${String(i + 1).padStart(6, '0')}`;
    const month = `2023-${String(monthIndex + 1).padStart(2, '0')}`;
    const pd = sigmoid(recalibrate(-challengerSafety));
    lines.push(
      [
        id,
        month,
        product,
        channel,
        `${product}/${channel}`,
        Math.round(600 + POINTS_FACTOR * (championSafety - 3)),
        Math.round(600 + POINTS_FACTOR * (challengerSafety - 3)),
        pd.toFixed(6),
      ].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

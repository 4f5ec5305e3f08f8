/**
 * Writes the demo scenario's holdout files, byte for byte the same on every run.
 *
 * The scenario is invented: Tallowmere Credit Cooperative lends personal loans and credit cards
 * through branches, its website and brokers. Its champion is the application scorecard in points
 * (higher = safer). The challenger adds cash-flow features and separates better overall, but for
 * brokered cards the cash-flow data arrive unverified from the broker, so there the challenger is
 * worse than the champion: the segment page (through the product_channel column) and the swap
 * sets are meant to reveal it.
 *
 * How the data are made (a simulation, not a model of any real portfolio):
 * - two hidden borrower traits, bureau strength b and cash-flow strength c, standard normal;
 * - the true log-odds of going bad within 12 months is −(1.0·b + 0.75·c) plus product, channel
 *   and a mild seasonal offset, with an intercept tuned to a bad rate of about 7%;
 * - the champion sees b well and c only through a weak proxy; the challenger sees both, except in
 *   brokered cards, where the cash-flow figures come from the broker and tell nothing of c (noise);
 * - scores are points with 20 points to double the odds, centred at 600; the PD file gives the
 *   challenger as a probability of default (higher = riskier) instead.
 *
 * The holdout is a through-the-door sample of the 120,000 applications of 2025
 * (through-the-door.ts): the champion's declines have no outcome, goods are sampled one in four.
 * The PD file, the 2,000-row sample and the broken file hold the first 60,000 applications with
 * every outcome observed, which only a simulation can give (the PD file's calibration story).
 *
 * Run: `npm run sample-data`. Output: the files of `buildSampleFiles()`, in sample-data/.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import seedrandom from 'seedrandom';
import { developmentCsv, pdWithBrokerDrift } from './pd-and-development';
import { refitPoints } from './refit';
import { throughTheDoor, throughTheDoorCsv } from './through-the-door';

const here = dirname(fileURLToPath(import.meta.url));
const SEED = 'tallowmere-2025';
/** Applications in 2025 (the through-the-door sample's population). */
const APPLICATIONS = 120_000;
/** The first applications, with every outcome: the PD file and the small samples. */
const ACCOUNTS = 60_000;
const POINTS_TO_DOUBLE_ODDS = 20;
export const POINTS_FACTOR = POINTS_TO_DOUBLE_ODDS / Math.LN2;

export type Product = 'personal-loan' | 'credit-card';
export type Channel = 'branch' | 'web' | 'broker';

export interface Account {
  id: string;
  month: string;
  product: Product;
  channel: Channel;
  amount: number;
  bad: 0 | 1;
  championPoints: number;
  challengerPoints: number;
  challengerPd: number;
  /** The true log-odds of going bad (hidden; the bureau's view of declined applicants leans on it). */
  trueLogOdds: number;
  /** Hidden traits and the product/channel/season offset (refit.ts builds the refit from them). */
  bureau: number;
  cashFlow: number;
  offset: number;
}

/** A seeded source of uniform and normal draws (Box–Muller, one value per call). */
export function randomSource(seed: string) {
  const uniform = seedrandom(seed);
  return {
    uniform: () => uniform(),
    normal(): number {
      const u = 1 - uniform();
      const v = uniform();
      return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    },
    pick<T>(choices: readonly (readonly [T, number])[]): T {
      let draw = uniform();
      for (const [value, weight] of choices) {
        if (draw < weight) return value;
        draw -= weight;
      }
      return choices[choices.length - 1][0];
    },
  };
}

export const sigmoid = (x: number) => 1 / (1 + Math.exp(-x));

export const productMix = [
  ['personal-loan', 0.55],
  ['credit-card', 0.45],
] as const;
const channelMix: Record<Product, readonly (readonly [Channel, number])[]> = {
  'personal-loan': [
    ['branch', 0.4],
    ['web', 0.4],
    ['broker', 0.2],
  ],
  'credit-card': [
    ['branch', 0.25],
    ['web', 0.55],
    ['broker', 0.2],
  ],
};
/** Extra log-odds of going bad, by product and channel (brokered business is riskier). */
export const productRisk: Record<Product, number> = { 'personal-loan': 0, 'credit-card': 0.25 };
export const channelRisk: Record<Channel, number> = { branch: -0.2, web: 0, broker: 0.35 };
/** Intercept tuned so the holdout's bad rate is about 7%. */
export const INTERCEPT = -3.4;

export function simulate(count: number): Account[] {
  const random = randomSource(SEED);
  const accounts: Account[] = [];
  for (let i = 0; i < count; i++) {
    const monthIndex = Math.floor(random.uniform() * 12);
    const product = random.pick(productMix);
    const channel = random.pick(channelMix[product]);
    const bureau = random.normal();
    const cashFlow = random.normal();
    const season = 0.08 * Math.sin((2 * Math.PI * monthIndex) / 12);
    const offset = productRisk[product] + channelRisk[channel] + season;
    const trueLogOdds = INTERCEPT + offset - (1.0 * bureau + 0.75 * cashFlow) + 0.35 * random.normal();
    const bad = random.uniform() < sigmoid(trueLogOdds) ? 1 : 0;

    // Each model's estimate of safety (minus log-odds of bad), before scaling to points.
    const championSafety = -INTERCEPT - offset + 1.0 * bureau + 0.3 * cashFlow + 0.55 * random.normal();
    const unverifiedCashFlow = product === 'credit-card' && channel === 'broker';
    const cashFlowSeen = unverifiedCashFlow ? 1.5 * random.normal() : cashFlow;
    const challengerSafety = -INTERCEPT - offset + 1.0 * bureau + 0.65 * cashFlowSeen + 0.45 * random.normal();

    const amount =
      product === 'personal-loan'
        ? Math.round(Math.min(25_000, Math.max(1_000, Math.exp(8.9 + 0.55 * random.normal()))) / 50) * 50
        : Math.round(Math.min(10_000, Math.max(500, Math.exp(7.9 + 0.5 * random.normal()))) / 100) * 100;

    accounts.push({
      id: `TCC-25-${String(i + 1).padStart(6, '0')}`,
      month: `2025-${String(monthIndex + 1).padStart(2, '0')}`,
      product,
      channel,
      amount,
      bad,
      championPoints: Math.round(600 + POINTS_FACTOR * (championSafety - 3)),
      challengerPoints: Math.round(600 + POINTS_FACTOR * (challengerSafety - 3)),
      challengerPd: Number(sigmoid(-challengerSafety).toFixed(6)),
      trueLogOdds,
      bureau,
      cashFlow,
      offset,
    });
  }
  return accounts;
}

/**
 * product_channel combines the two columns (e.g. `credit-card/broker`): the segment table compares
 * the models within each value of one column, so brokered cards show as a row of their own only
 * through a column that names the combination.
 */
const header = ['account_id', 'application_month', 'product', 'channel', 'product_channel', 'loan_amount', 'bad_12m'];

function leadFields(a: Account): (string | number)[] {
  return [a.id, a.month, a.product, a.channel, `${a.product}/${a.channel}`, a.amount, a.bad];
}

function holdoutCsv(accounts: Account[]): string {
  const lines = [[...header, 'champion_points', 'challenger_points'].join(',')];
  for (const a of accounts) {
    lines.push([...leadFields(a), a.championPoints, a.challengerPoints].join(','));
  }
  return lines.join('\n') + '\n';
}

/** The PD file with the challenger's PD as pd-and-development.ts tells its story (broker drift from July). */
function pdDriftCsv(accounts: Account[]): string {
  const pd = pdWithBrokerDrift(accounts);
  const lines = [[...header, 'champion_points', 'challenger_pd'].join(',')];
  accounts.forEach((a, i) => lines.push([...leadFields(a), a.championPoints, pd[i].toFixed(6)].join(',')));
  return lines.join('\n') + '\n';
}

/**
 * A small file with the mistakes people make when exporting a holdout, one per marked row, for
 * trying the validation report: text in a score, an outcome that is neither 0 nor 1, a row with
 * a missing field, and an empty score.
 */
function brokenCsv(accounts: Account[]): string {
  const rows = holdoutCsv(accounts.slice(0, 200)).split('\n');
  rows[12] = rows[12].replace(/,(\d+)$/, ',#VALUE!'); // challenger_points is text (a spreadsheet error)
  rows[57] = rows[57].replace(/,[01],(\d+),(\d+)$/, ',2,$1,$2'); // bad_12m outside 0/1
  rows[101] = rows[101].split(',').slice(0, 7).join(','); // ragged: scores missing
  rows[150] = rows[150].replace(/,(\d+),(\d+)$/, ',,$2'); // champion_points empty
  return rows.join('\n');
}

function sampleOf(accounts: Account[], size: number): Account[] {
  const step = accounts.length / size;
  return Array.from({ length: size }, (_, i) => accounts[Math.floor(i * step)]);
}

/** Every demo file's name and text; the same on every call. */
export function buildSampleFiles(): Record<string, string> {
  const applications = simulate(APPLICATIONS);
  const accounts = applications.slice(0, ACCOUNTS);
  return {
    'tallowmere-holdout-2025.csv': throughTheDoorCsv(throughTheDoor(applications), refitPoints(applications)),
    'tallowmere-holdout-2025-sample-2k.csv': holdoutCsv(sampleOf(accounts, 2_000)),
    'tallowmere-holdout-2025-pd.csv': pdDriftCsv(accounts),
    'tallowmere-development-2023.csv': developmentCsv(),
    'tallowmere-holdout-broken.csv': brokenCsv(accounts),
  };
}

export const sampleDataDir = here;

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  for (const [name, text] of Object.entries(buildSampleFiles())) {
    writeFileSync(join(here, name), text);
    console.log(`wrote sample-data/${name} (${text.split('\n').filter(Boolean).length - 1} rows)`);
  }
}

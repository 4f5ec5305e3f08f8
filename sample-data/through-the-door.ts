/**
 * The demo's holdout as a lender really has it: a through-the-door sample of the 2025 applications
 * (generate.ts simulates the applicants; this file decides what the lender could observe of them).
 *
 * - The champion decided every application: those below its cut-off of CHAMPION_CUTOFF points
 *   (about 29% of the applicants) were declined, never booked, so they have no outcome (bad_12m
 *   blank). Every declined applicant is in the file, with weight 1.
 * - Of the booked accounts, every bad is in the file (weight 1) and one good in four, taken in
 *   account order (the 1st, 5th, 9th… good), with weight 4: the usual down-sampling of goods.
 * - For each declined applicant the credit bureau gives a probability of going bad within 12
 *   months (bureau_pd_12m, blank on booked accounts). For most of them (about 85%, those who took
 *   credit at another lender) it rests on their performance there (bureau_basis = performance):
 *   their true risk, a little worse on other lenders' terms, blurred. For the rest, with no credit
 *   elsewhere, it is the bureau's score-based estimate (bureau_basis = score), flatter and noisier.
 *   An own seeded stream draws the blur, so the applicants themselves do not change.
 *
 * The decided comparison keeps the applicants without an outcome, weights the rows and states the
 * swap-in's bad rate through bureau_pd_12m (reject inference by column).
 */
import { type Account, randomSource, sigmoid } from './generate';

/** The champion's cut-off in 2025: applicants with at least this many points were approved. */
export const CHAMPION_CUTOFF = 590;
/** One booked good in GOOD_SAMPLING is kept, with that weight. */
export const GOOD_SAMPLING = 4;
/** Share of declined applicants whose bureau probability rests on performance at other lenders. */
const PERFORMANCE_SHARE = 0.85;

export interface DoorRow {
  account: Account;
  /** null: declined, no outcome. */
  bad: 0 | 1 | null;
  weight: number;
  bureauPd: number | null;
  bureauBasis: 'performance' | 'score' | null;
}

export function throughTheDoor(accounts: readonly Account[]): DoorRow[] {
  const random = randomSource('tallowmere-2025-bureau');
  const rows: DoorRow[] = [];
  let goods = 0;
  for (const account of accounts) {
    if (account.championPoints < CHAMPION_CUTOFF) {
      const performance = random.uniform() < PERFORMANCE_SHARE;
      const noise = random.normal();
      const logOdds = performance ? account.trueLogOdds + 0.15 + 0.35 * noise : 0.6 * account.trueLogOdds - 1.0 + 0.6 * noise;
      rows.push({ account, bad: null, weight: 1, bureauPd: Number(sigmoid(logOdds).toFixed(4)), bureauBasis: performance ? 'performance' : 'score' });
    } else if (account.bad === 1) {
      rows.push({ account, bad: 1, weight: 1, bureauPd: null, bureauBasis: null });
    } else if (goods++ % GOOD_SAMPLING === 0) {
      rows.push({ account, bad: 0, weight: GOOD_SAMPLING, bureauPd: null, bureauBasis: null });
    }
  }
  return rows;
}

const header = [
  'account_id',
  'application_month',
  'product',
  'channel',
  'product_channel',
  'loan_amount',
  'bad_12m',
  'champion_points',
  'challenger_points',
  'sample_weight',
  'bureau_pd_12m',
  'bureau_basis',
  'refit_points',
];

/** `refit`: the refit's points per application (refit.ts), by the account's position in the applications. */
export function throughTheDoorCsv(rows: readonly DoorRow[], refit: ReadonlyMap<string, number>): string {
  const lines = [header.join(',')];
  for (const { account: a, bad, weight, bureauPd, bureauBasis } of rows) {
    lines.push(
      [
        a.id,
        a.month,
        a.product,
        a.channel,
        `${a.product}/${a.channel}`,
        a.amount,
        bad ?? '',
        a.championPoints,
        a.challengerPoints,
        weight,
        bureauPd === null ? '' : bureauPd.toFixed(4),
        bureauBasis ?? '',
        refit.get(a.id)!,
      ].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

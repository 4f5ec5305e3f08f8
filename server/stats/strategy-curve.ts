import type { StrategyCurve } from '@shared/report';
import { locateCutoff, type LocatedCutoff } from './cutoffs';
import { accountsAt, knownAt, type PreparedHoldout, type PreparedModel } from './policy-data';

/**
 * Strategy curve: for approval rates 1%, 2%, …, 100% (and the report's approval rate), each
 * model's cut-off for that rate (tie rule in cutoffs.ts), the approval rate it achieves, the bad
 * rate of the whole approved book (portfolio) and of the accounts added since the previous point
 * (marginal; null when ties added none).
 *
 * At the report's approval rate, both figures compare books of equal size (equalApproval below):
 * - bads avoided at equal approval: the champion's book at its cut-off holds N accounts (ties can
 *   push N past the target rate); the challenger's N safest accounts hold B bads, the block of
 *   equal challenger scores that straddles N taken in proportion (the bads expected if the block
 *   were split at random); bads avoided = the champion's approved bads − B. The challenger's own
 *   cut-off for the rate, its accounts and bads there, are stated beside it.
 * - approvals gained at equal bad rate: the largest challenger book whose portfolio bad rate is
 *   at most the champion's, the block at its edge again taken in proportion (the bad rate of a
 *   part of a block mixes linearly), minus the champion's book; null when no book reaches it.
 * With weights and applicants without an outcome: approvals in accounts (summed weights). Bads
 * and bad rates: when the run infers the bads of the applicants without an outcome (parcel or
 * column), every book counts the known bads and each unknown account's w·p over all its accounts
 * (`bads: 'inferred'`), so books with more unbooked applicants are not flattered; with known
 * outcomes only they are of the accounts with a known outcome (`bads: 'known-only'` when some
 * outcome is missing, which the words state as a caution).
 * Common practice, no source (the proportional split of a tie block is this project's rule).
 * Cost: O(points · log n) for the curve, O(log n) for the equal-approval book and
 * O(distinct challenger scores) for the equal-bad-rate search, on prepared data.
 */
/** How a book's bads are counted: known outcomes only, or with the run's inferred bads. */
interface Basis {
  /** Bads among the first k positions of a model's order. */
  badsBefore(model: PreparedModel, k: number): number;
  totalBads(model: PreparedModel): number;
  /** The bad rate's denominator among the first k positions: known accounts, or all accounts when inferring. */
  countedBefore(model: PreparedModel, k: number): number;
  label: 'inferred' | 'known-only' | null;
}

function basisOf(data: PreparedHoldout): Basis {
  const inferred = data.inferredBadsBefore;
  if (inferred !== null) {
    return {
      badsBefore: (model, k) => inferred[model.name][k],
      totalBads: (model) => inferred[model.name][data.n],
      countedBefore: accountsAt,
      label: 'inferred',
    };
  }
  return {
    badsBefore: (model, k) => model.badsBefore[k],
    totalBads: () => data.bads,
    countedBefore: knownAt,
    label: data.known !== null && data.knownAccounts < data.accounts ? 'known-only' : null,
  };
}

export function strategyCurve(data: PreparedHoldout, approvalRate: number): StrategyCurve {
  if (!(approvalRate > 0 && approvalRate <= 1)) throw new Error(`approval rate must be above 0 and at most 1, got ${approvalRate}`);
  const rates: number[] = [];
  for (let j = 1; j <= 100; j++) rates.push(j / 100);
  if (!rates.some((rate) => Math.abs(rate - approvalRate) < 1e-12)) {
    rates.push(approvalRate);
    rates.sort((x, y) => x - y);
  }

  const { n } = data;
  const basis = basisOf(data);
  const previous = { champion: { accepted: 0, bads: 0 }, challenger: { accepted: 0, bads: 0 } };
  const point = (model: PreparedModel, rate: number) => {
    const located = locateCutoff(model, { approvalRate: rate });
    const bads = basis.totalBads(model) - basis.badsBefore(model, located.start);
    // Accepted accounts the bad rate is over (known ones, or all when inferring).
    const accepted = basis.countedBefore(model, n) - basis.countedBefore(model, located.start);
    const last = previous[model.name];
    const added = accepted - last.accepted;
    const result = {
      cutoff: located.position.cutoff,
      achievedApprovalRate: located.position.approvalRate,
      portfolioBadRate: accepted > 0 ? bads / accepted : null,
      marginalBadRate: added > 0 ? (bads - last.bads) / added : null,
    };
    previous[model.name] = { accepted, bads };
    return result;
  };
  const points = rates.map((rate) => ({
    approvalRate: rate,
    champion: point(data.champion, rate),
    challenger: point(data.challenger, rate),
  }));

  const champion = locateCutoff(data.champion, { approvalRate });
  const challenger = locateCutoff(data.challenger, { approvalRate });
  return { points, atApprovalRate: { approvalRate, ...equalApproval(data, champion, challenger) } };
}

/**
 * The equal-approval figures for the champion's book at one cut-off and the challenger's at
 * another (see the header): the book size N, each model's bads in a book of N accounts, the
 * challenger's book at its own cut-off, and the approvals gained at the champion's bad rate.
 */
export function equalApproval(data: PreparedHoldout, champion: LocatedCutoff, challenger: LocatedCutoff): Omit<StrategyCurve['atApprovalRate'], 'approvalRate'> {
  const { n } = data;
  const basis = basisOf(data);
  const accounts = champion.acceptedAccounts;
  const championBads = basis.totalBads(data.champion) - basis.badsBefore(data.champion, champion.start);
  const challengerBads = accounts > 0 ? safestBook(data, basis, data.challenger, accounts).bads : 0;
  return {
    ...(basis.label === null ? {} : { bads: basis.label }),
    accounts,
    championBads,
    challengerBads,
    badsAvoided: championBads - challengerBads,
    challengerAtCutoff: { accounts: challenger.acceptedAccounts, bads: basis.totalBads(data.challenger) - basis.badsBefore(data.challenger, challenger.start) },
    approvalsGainedAtEqualBadRate: approvalsGained(data, basis, champion.start, championBads, n),
  };
}

/**
 * The book of a model's `accounts` safest accounts: whole blocks of equal scores, and the block
 * that straddles the edge in proportion. Bads and known accounts of that book.
 */
function safestBook(data: PreparedHoldout, basis: Basis, model: PreparedModel, accounts: number): { bads: number; known: number } {
  const { n } = data;
  const { blockEnds } = model;
  const total = accountsAt(model, n);
  // The block [s, e) with total − A(e) < accounts ≤ total − A(s): the first block end whose book
  // beyond it holds fewer than `accounts` (books shrink as the end moves right).
  let lo = 0;
  let hi = blockEnds.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (total - accountsAt(model, blockEnds[mid]) < accounts) hi = mid;
    else lo = mid + 1;
  }
  const end = blockEnds[lo];
  const start = lo === 0 ? 0 : blockEnds[lo - 1];
  const beyond = total - accountsAt(model, end);
  const inBlock = accountsAt(model, end) - accountsAt(model, start);
  const fraction = inBlock > 0 ? Math.min(1, (accounts - beyond) / inBlock) : 1;
  const badsBefore = (k: number) => basis.badsBefore(model, k);
  const countedAt = (k: number) => basis.countedBefore(model, k);
  const badsBeyond = basis.totalBads(model) - badsBefore(end);
  const knownBeyond = countedAt(n) - countedAt(end);
  return {
    bads: badsBeyond + fraction * (badsBefore(end) - badsBefore(start)),
    known: knownBeyond + fraction * (countedAt(end) - countedAt(start)),
  };
}

/**
 * Largest challenger book with bad rate ≤ the champion's (known accounts), the block at its edge
 * taken in proportion, minus the champion's book, in accounts.
 */
function approvalsGained(data: PreparedHoldout, basis: Basis, championStart: number, championBads: number, n: number): number | null {
  const championModel = data.champion;
  const championAccepted = accountsAt(championModel, n) - accountsAt(championModel, championStart);
  const championKnown = basis.countedBefore(championModel, n) - basis.countedBefore(championModel, championStart);
  if (championAccepted === 0) return null;
  const model = data.challenger;
  const { blockEnds } = model;
  const badsBefore = (k: number) => basis.badsBefore(model, k);
  const knownAt = (m: PreparedModel, k: number) => basis.countedBefore(m, k);
  const totalBads = basis.totalBads(model);
  // Books are [start, n) for every block start; compare rates exactly in integers (without weights):
  // bads / known ≤ championBads / championKnown ⇔ bads · championKnown ≤ championBads · known.
  for (let b = 0; b < blockEnds.length; b++) {
    const start = b === 0 ? 0 : blockEnds[b - 1];
    const known = knownAt(model, n) - knownAt(model, start);
    const bads = totalBads - badsBefore(start);
    if (bads * championKnown > championBads * known) continue;
    const book = accountsAt(model, n) - accountsAt(model, start);
    if (b === 0) return book - championAccepted;
    // The next riskier block [s, start) fails whole (the loop reached b), so a part f < 1 of it:
    // bads + f·blockBads ≤ R·(known + f·blockKnown), R = championBads / championKnown.
    const s = b === 1 ? 0 : blockEnds[b - 2];
    const blockBads = badsBefore(start) - badsBefore(s);
    const blockKnown = knownAt(model, start) - knownAt(model, s);
    const blockAccounts = accountsAt(model, start) - accountsAt(model, s);
    const fraction = (championBads * known - bads * championKnown) / (blockBads * championKnown - championBads * blockKnown);
    return book + Math.max(0, Math.min(1, fraction)) * blockAccounts - championAccepted;
  }
  return null;
}

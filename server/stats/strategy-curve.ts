import type { StrategyCurve } from '@shared/report';
import { locateCutoff } from './cutoffs';
import { accountsAt, knownAt, type PreparedHoldout, type PreparedModel } from './policy-data';

/**
 * Strategy curve: for approval rates 1%, 2%, …, 100% (and the report's approval rate), each
 * model's cut-off for that rate (tie rule in cutoffs.ts), the approval rate it achieves, the bad
 * rate of the whole approved book (portfolio) and of the accounts added since the previous point
 * (marginal; null when ties added none). At the report's approval rate: the bads each model
 * approves, the bads the challenger avoids at equal approval (champion's approved bads minus the
 * challenger's), and the approvals the challenger gains at equal bad rate: the largest book the
 * challenger can approve (always whole blocks of equal scores) whose portfolio bad rate is at most
 * the champion's at that rate, minus the champion's book; null when no such book exists.
 * With weights and applicants without an outcome: approval rates and approvals in accounts
 * (summed weights), bad rates and bads of the accounts with a known outcome (policy-data.ts).
 * Common practice, no source.
 * Cost: O(points · log n) for the curve and O(distinct challenger scores) for the equal-bad-rate
 * search, on prepared data.
 */
export function strategyCurve(data: PreparedHoldout, approvalRate: number): StrategyCurve {
  if (!(approvalRate > 0 && approvalRate <= 1)) throw new Error(`approval rate must be above 0 and at most 1, got ${approvalRate}`);
  const rates: number[] = [];
  for (let j = 1; j <= 100; j++) rates.push(j / 100);
  if (!rates.some((rate) => Math.abs(rate - approvalRate) < 1e-12)) {
    rates.push(approvalRate);
    rates.sort((x, y) => x - y);
  }

  const { n } = data;
  const previous = { champion: { accepted: 0, bads: 0 }, challenger: { accepted: 0, bads: 0 } };
  const point = (model: PreparedModel, rate: number) => {
    const located = locateCutoff(model, { approvalRate: rate });
    const bads = data.bads - model.badsBefore[located.start];
    // Accepted accounts with a known outcome (= accepted rows without weights or unknown rows).
    const accepted = knownAt(model, n) - knownAt(model, located.start);
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
  const championBads = data.bads - data.champion.badsBefore[champion.start];
  const challengerBads = data.bads - data.challenger.badsBefore[challenger.start];
  return {
    points,
    atApprovalRate: {
      approvalRate,
      championBads,
      challengerBads,
      badsAvoided: championBads - challengerBads,
      approvalsGainedAtEqualBadRate: approvalsGained(data, champion.start, championBads),
    },
  };
}

/**
 * Largest challenger book with bad rate ≤ the champion's (known accounts), minus the champion's
 * book, in accounts.
 */
function approvalsGained(data: PreparedHoldout, championStart: number, championBads: number): number | null {
  const { n } = data;
  const championModel = data.champion;
  const championAccepted = accountsAt(championModel, n) - accountsAt(championModel, championStart);
  const championKnown = knownAt(championModel, n) - knownAt(championModel, championStart);
  if (championAccepted === 0) return null;
  const model = data.challenger;
  const { blockEnds, badsBefore } = model;
  // Books are [start, n) for every block start; compare rates exactly in integers (without weights):
  // bads / known ≤ championBads / championKnown ⇔ bads · championKnown ≤ championBads · known.
  let best = -1;
  for (let b = 0; b < blockEnds.length && best < 0; b++) {
    const start = b === 0 ? 0 : blockEnds[b - 1];
    const known = knownAt(model, n) - knownAt(model, start);
    const bads = data.bads - badsBefore[start];
    if (bads * championKnown <= championBads * known) best = accountsAt(model, n) - accountsAt(model, start);
  }
  return best < 0 ? null : best - championAccepted;
}

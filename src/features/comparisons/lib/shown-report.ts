import type { CurrentVerdict } from '@shared/comparisons';
import type { Report } from '@shared/report';

/**
 * One verdict everywhere, for several challengers too: the report's per-challenger verdicts and
 * its recommended challenger are those judged when the run finished, under the policy of that
 * day; after a re-evaluation under a newer policy (or once decided) the comparison shows its
 * current verdict record. This puts the record's verdict of each challenger and its choice in
 * place of the report's, so every tab, the header and the committee's forms read the record.
 * Unchanged when the record holds no challengers (one challenger, or a record stored before
 * several challengers existed) or names a different set of them.
 */
export function shownReport(report: Report, verdict: CurrentVerdict | null): Report {
  const challengers = report.challengers;
  if (!verdict || !challengers || verdict.challengers.length !== challengers.length) return report;
  if (!verdict.challengers.every((judged, index) => judged.challenger === index && judged.column === challengers[index].column)) return report;
  return {
    ...report,
    challengers: challengers.map((challenger, index) => {
      const judged = verdict.challengers[index];
      return { ...challenger, verdict: { outcome: judged.outcome, policyVersion: verdict.policyVersion, criteria: judged.criteria, summary: judged.summary } };
    }),
    choice: { recommended: verdict.recommended, summary: verdict.choiceSummary || (report.choice?.summary ?? '') },
  };
}

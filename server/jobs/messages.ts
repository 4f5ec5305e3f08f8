import type { ComparisonHeadline } from '@shared/comparisons';
import type { ChallengerVerdict } from '@shared/governance';
import type { AdoptionPolicy } from '@shared/policy';
import type { Report, SwapMatrix, Verdict } from '@shared/report';
import type { PreparedHoldout } from '../stats/policy-data';

/** What the main thread gives an analysis worker (workerData). */
export interface AnalysisJob {
  /** The SQLite file or PostgreSQL URL the worker reads the run from (db/reader-connection.ts). */
  databasePath: string;
  runId: number;
  /** 1 for the first try. */
  attempt: number;
  policy: AdoptionPolicy;
}

/** What an analysis worker posts back. */
export type WorkerMessage =
  | { type: 'progress'; fraction: number; stage: string }
  | {
      type: 'done';
      /** The report as the JSON text the API serves. */
      report: string;
      engineVersion: string;
      headline: ComparisonHeadline;
      verdict: Verdict;
      /** Every challenger's verdict and the recommended one (null for reports without them). */
      choice: ChoiceRecord | null;
      /**
       * The data prepared for swap sets (its `order`s are stored; the whole is cached on the main
       * thread so the first swap request does not prepare it again). Transferred, not copied.
       */
      prepared: PreparedHoldout;
      swapMatrix: SwapMatrix;
    }
  /** `permanent`: the data or settings cannot give a report (trying again would fail the same way). */
  | { type: 'failed'; message: string; permanent: boolean };

/** What a verdict record keeps of several challengers: every challenger's verdict, the recommended one and the sentence. */
export interface ChoiceRecord {
  challengers: ChallengerVerdict[];
  recommended: number | null;
  summary: string;
}

export function choiceRecordOf(report: Pick<Report, 'challengers' | 'choice'>): ChoiceRecord | null {
  if (!report.challengers || !report.choice) return null;
  return {
    challengers: report.challengers.map((challenger, index) => ({
      challenger: index,
      column: challenger.column,
      name: challenger.name,
      outcome: challenger.verdict.outcome,
      criteria: challenger.verdict.criteria,
      summary: challenger.verdict.summary,
    })),
    recommended: report.choice.recommended,
    summary: report.choice.summary,
  };
}

/** The list's headline numbers, from a report. */
export function headlineOf(report: Report): ComparisonHeadline {
  return {
    rows: report.rows,
    bads: report.bads,
    championGini: report.champion.gini,
    challengerGini: report.challenger.gini,
    deltaGini: report.difference.gini,
    deltaGiniCi: report.difference.giniCi,
    pOneSided: report.difference.pOneSided,
    pTwoSided: report.difference.pTwoSided,
    verdict: report.verdict.outcome,
  };
}

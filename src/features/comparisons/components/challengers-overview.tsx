import {
  choiceCaution,
  choiceSentence,
  jointTestSentence,
  modelsSummaryTable,
  multiplicityNote,
  pairwiseNote,
  pairwiseTable,
  verdictOutcomeLabels,
} from '@shared/challengers-words';
import { type ChallengerResult, type Report } from '@shared/report';
import { verdictExplanation } from '@shared/verdict-words';
import { Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { StatusBadge } from '@/components/status-badge';
import { WordTableView } from '@/components/word-table';
import { CriteriaList } from '@/features/comparisons/components/criteria-list';
import { verdictTones } from '@/features/comparisons/lib/state-tone';

type SeveralReport = Report & { challengers: ChallengerResult[] };

/**
 * The recommended challenger (or none) in one sentence, with the caution that the choice rests
 * with the institution's policy and committee.
 */
export function ChoiceHeadline({ report }: { report: SeveralReport }) {
  const recommended = report.choice?.recommended ?? null;
  return (
    <Callout tone={recommended === null ? 'caution' : 'info'} title={recommended === null ? 'No challenger is recommended' : `Recommended: ${report.challengers[recommended]?.name}`}>
      <p data-testid="choice-summary">{choiceSentence(report)}</p>
      <p className="mt-1 text-ink-soft">{choiceCaution}</p>
    </Callout>
  );
}

/**
 * Every model side by side, the joint test and every pair of challengers: what a committee reads
 * first when one champion meets several challengers.
 */
export function ChallengersSummary({ report }: { report: SeveralReport }) {
  const summary = modelsSummaryTable(report, report.settings.confidence);
  const recommended = report.choice?.recommended ?? null;
  const pairs = pairwiseTable(report);
  return (
    <div className="space-y-4">
      <WordTableView
        table={summary}
        caption="Every model: Gini, AUC, KS, and each challenger against the champion"
        textColumns={[0, 1, 8]}
        highlightRow={recommended === null ? null : recommended + 1}
        testId="models-summary"
      />
      <p className="text-sm text-ink-soft">{multiplicityNote(report.challengers.length)}</p>
      <p className="text-sm text-ink" data-testid="joint-test">
        {jointTestSentence(report)}
      </p>
      {pairs.rows.length > 0 ? (
        <div className="space-y-2">
          <h3 className="text-sm font-semibold text-ink">Challengers against each other</h3>
          <WordTableView table={pairs} caption="Every pair of challengers (DeLong)" testId="pairwise" />
          <p className="text-sm text-ink-soft">{pairwiseNote}</p>
        </div>
      ) : null}
    </div>
  );
}

/** Each challenger's verdict under the adoption policy, with the criteria that decided it. */
export function ChallengerVerdicts({ report }: { report: SeveralReport }) {
  return (
    <ul className="space-y-3" data-testid="challenger-verdicts">
      {report.challengers.map((challenger, index) => (
        <li key={challenger.column} className="rounded-lg border border-line bg-paper-raised p-4">
          <details>
            <summary className="flex cursor-pointer flex-wrap items-center gap-x-3 gap-y-1">
              <span className="font-medium text-ink">
                {challenger.name} <span className="text-sm font-normal text-ink-soft">(challenger {index + 1})</span>
              </span>
              <StatusBadge tone={verdictTones[challenger.verdict.outcome]}>{verdictOutcomeLabels[challenger.verdict.outcome]}</StatusBadge>
              {report.choice?.recommended === index ? <StatusBadge tone="good">Recommended</StatusBadge> : null}
            </summary>
            <div className="mt-3 space-y-3">
              <p className="text-sm text-ink-soft">{verdictExplanation(challenger.verdict)}</p>
              <CriteriaList verdict={challenger.verdict} />
            </div>
          </details>
          <p className="mt-2 text-sm text-ink-soft">{challenger.verdict.summary}</p>
        </li>
      ))}
    </ul>
  );
}

/** The verdict page's part for several challengers: the choice, the summary of all models and each verdict. */
export function SeveralChallengersSections({ report }: { report: SeveralReport }) {
  return (
    <>
      <ChoiceHeadline report={report} />
      <Section
        title="Every model"
        description={`One champion and ${report.challengers.length} challengers on the same holdout. The sections further down detail the first challenger, ${report.challengers[0]?.name}.`}
      >
        <ChallengersSummary report={report} />
      </Section>
      <Section title="Each challenger's verdict" description="Each challenger judged against the champion under the same adoption policy.">
        <ChallengerVerdicts report={report} />
      </Section>
    </>
  );
}

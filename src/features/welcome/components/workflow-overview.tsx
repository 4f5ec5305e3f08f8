import { type Role, roleLabels } from '@shared/roles';
import { StatusBadge } from '@/components/status-badge';

// The life of a comparison (docs/design.md, "Workflow and roles"): each state, and who moves it on.
const steps: { state: string; what: string; actors: Role[] }[] = [
  { state: 'Draft', what: 'A holdout is uploaded and its columns are mapped to outcome, scores, segments and amounts.', actors: ['modeler'] },
  { state: 'Analysed', what: 'The analysis has run: Gini, AUC and KS of both models, the DeLong test, bootstrap intervals, swap sets and segments. The modeler submits it for review.', actors: ['modeler'] },
  { state: 'In review', what: 'Submitted for validation. Credit policy sets the cut-offs or approval rate and inspects the swap sets.', actors: ['analyst', 'policy'] },
  { state: 'Validated or returned', what: 'The analyst validates the evidence for the committee, or returns it to the modeler with findings.', actors: ['analyst'] },
  { state: 'Decided', what: 'The committee votes and records the decision: adopt the challenger, keep the champion, or defer.', actors: ['committee'] },
];

/** The workflow as a numbered list, marking the steps where this person acts. */
export function WorkflowOverview({ roles }: { roles: readonly Role[] }) {
  return (
    <ol className="space-y-3">
      {steps.map((step, index) => {
        const mine = step.actors.some((role) => roles.includes(role));
        return (
          <li key={step.state} className="flex gap-3">
            <span
              aria-hidden="true"
              className={`num flex size-7 shrink-0 items-center justify-center rounded-full border text-sm font-semibold ${
                mine ? 'border-court-700 bg-court-700 text-white' : 'border-line-strong bg-paper-raised text-ink-soft'
              }`}
            >
              {index + 1}
            </span>
            <div className="min-w-0 space-y-1 pt-0.5">
              <p className="flex flex-wrap items-center gap-2 text-sm">
                <span className="font-semibold text-ink">{step.state}</span>
                <span className="text-ink-soft">· {step.actors.map((role) => roleLabels[role]).join(', ')}</span>
                {mine ? <StatusBadge tone="info">You act here</StatusBadge> : null}
              </p>
              <p className="text-sm text-ink-soft">{step.what}</p>
            </div>
          </li>
        );
      })}
    </ol>
  );
}

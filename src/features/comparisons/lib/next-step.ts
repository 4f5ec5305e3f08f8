import { type ComparisonState, type RunStatus } from '@shared/comparisons';
import { type Role } from '@shared/roles';
import { workflowSteps } from '@shared/workflow';

/**
 * The next step for the person looking at a comparison, from its state, its newest run and the
 * person's roles (docs/design.md, "Workflow and roles"). Pure, so it is tested on its own. A person
 * with several roles gets the step of the role that can act now; the others' steps are listed too.
 */

/** Where a step's button leads: a page of the comparison (review and report come with governance). */
export type StepTarget = 'setup' | 'verdict' | 'swap-sets' | 'review' | 'report';

export interface NextStep {
  /** action: this person can act now; waiting: someone else acts next; problem: something failed; done. */
  kind: 'action' | 'waiting' | 'problem' | 'done';
  title: string;
  text: string;
  action?: { label: string; target: StepTarget };
}

export interface NextStepInput {
  state: ComparisonState;
  latestRun: { status: RunStatus; error?: string | null } | null;
  /** A finished run's report exists (an older run may be done while a newer one failed or runs). */
  hasReport: boolean;
  createdById: number;
  /** Everyone the four-eyes rule bars from reviewing, voting and deciding (ComparisonDetail.authorIds). */
  authorIds: readonly number[];
  user: { id: number; roles: readonly Role[] };
}

/** Why the four-eyes rule bars this person, in their words; null when it does not. */
function authorship(input: NextStepInput): string | null {
  if (input.user.id === input.createdById) return 'You created this comparison';
  if (input.authorIds.includes(input.user.id)) return 'You uploaded one of its holdouts, set up one of its analyses or submitted it';
  return null;
}

const roleOrder: Role[] = ['modeler', 'analyst', 'policy', 'committee', 'admin'];

function forRole(role: Role, input: NextStepInput): NextStep | null {
  const { state, latestRun, hasReport } = input;
  const own = authorship(input);
  const failed = latestRun?.status === 'failed';

  if (failed && role === 'modeler') {
    return {
      kind: 'problem',
      title: hasReport ? 'The latest analysis failed' : 'The analysis failed',
      text: hasReport
        ? 'The pages show the previous run. Check the column mapping and settings, then run it again.'
        : 'Check the column mapping and settings, then run it again.',
      action: { label: 'Back to the column mapping', target: 'setup' },
    };
  }

  switch (state) {
    case 'draft':
      if (role === 'modeler' && !failed) {
        return {
          kind: 'action',
          title: 'Map the columns and run the analysis',
          text: 'The holdout is uploaded. Say which columns hold the outcome and the two scores, check the data and start the analysis.',
          action: { label: 'Continue setting up', target: 'setup' },
        };
      }
      return null;
    case 'analysed':
      if (role === workflowSteps.submit.role) {
        return {
          kind: 'action',
          title: 'Read the evidence, then submit it for review',
          text: 'When the verdict, curves, swap sets and segments make sense, submit the comparison so an analyst can validate it.',
          action: { label: 'Submit for review', target: 'review' },
        };
      }
      if (role === 'policy') {
        return {
          kind: 'action',
          title: 'Choose cut-offs and inspect the swap sets',
          text: 'Try the approval rate or cut-offs you would run and see who the challenger newly approves and declines.',
          action: { label: 'Open the swap sets', target: 'swap-sets' },
        };
      }
      return null;
    case 'in-review':
      if (role === workflowSteps.validate.role) {
        if (own) {
          return {
            kind: 'waiting',
            title: 'Another analyst reviews this one',
            text: `${own}, so you cannot review it: another analyst validates or returns it (four-eyes rule).`,
          };
        }
        return {
          kind: 'action',
          title: 'Review the evidence and validate or return it',
          text: 'Read the uplift, its interval and test, KS and the segments; record your findings and validate the comparison or return it to the modeler.',
          action: { label: 'Open the review', target: 'review' },
        };
      }
      if (role === 'policy') {
        return {
          kind: 'action',
          title: 'Inspect the swap sets for the review',
          text: 'Set the cut-offs or approval rate you would run, and save them as a scenario for the record.',
          action: { label: 'Open the swap sets', target: 'swap-sets' },
        };
      }
      return null;
    case 'validated':
      if (role === workflowSteps.decide.role) {
        if (own) {
          return {
            kind: 'waiting',
            title: 'Other committee members decide this one',
            text: `${own}, so you cannot vote on it or record its decision (four-eyes rule).`,
          };
        }
        return {
          kind: 'action',
          title: 'Vote and record the decision',
          text: 'The analyst has validated the evidence. Vote to adopt the challenger, keep the champion or defer, and record the decision with its rationale.',
          action: { label: 'Open the decision', target: 'review' },
        };
      }
      return null;
    case 'returned':
      if (role === workflowSteps.submit.role) {
        return {
          kind: 'action',
          title: 'Returned to you: read the findings',
          text: 'The analyst sent this comparison back. Read the findings, change the data, mapping or settings if needed, and submit it again.',
          action: { label: 'Read the findings', target: 'review' },
        };
      }
      return null;
    case 'decided':
      return {
        kind: 'done',
        title: 'Decided',
        text: 'The committee has recorded its decision. The report holds the evidence, the review and the decision.',
        action: { label: 'Open the report', target: 'report' },
      };
  }
}

/** What everyone else sees: who acts next. */
function waiting(input: NextStepInput): NextStep {
  const { state, latestRun, hasReport } = input;
  if (latestRun?.status === 'failed') {
    return {
      kind: 'problem',
      title: hasReport ? 'The latest analysis failed' : 'The analysis failed',
      text: hasReport ? 'The pages show the previous run; a modeler will fix the mapping or settings.' : 'A modeler will fix the mapping or settings and run it again.',
    };
  }
  const texts: Record<ComparisonState, [string, string]> = {
    draft: ['Waiting for the column mapping', 'A modeler maps the columns and runs the analysis; the evidence appears here then.'],
    analysed: ['Analysed, not yet submitted', 'A modeler submits it for review next. You can read the evidence now.'],
    'in-review': ['In review', 'An analyst is reviewing the evidence and will validate it or return it to the modeler.'],
    validated: ['Validated, waiting for the committee', 'The committee votes and records the adoption decision next.'],
    returned: ['Returned to the modeler', 'The analyst sent it back with findings; a modeler fixes and resubmits it.'],
    decided: ['Decided', 'The committee has recorded its decision.'],
  };
  const [title, text] = texts[state];
  return { kind: state === 'decided' ? 'done' : 'waiting', title, text };
}

export function nextSteps(input: NextStepInput): { primary: NextStep; others: NextStep[] } {
  if (input.latestRun && (input.latestRun.status === 'queued' || input.latestRun.status === 'running')) {
    const primary: NextStep = {
      kind: 'waiting',
      title: input.latestRun.status === 'queued' ? 'The analysis is queued' : 'The analysis is running',
      text: input.hasReport
        ? 'A new analysis is on its way; the pages show the previous run until it finishes.'
        : 'The evidence appears here when it finishes. You can leave this page; the analysis carries on.',
    };
    return { primary, others: [] };
  }
  const steps: NextStep[] = [];
  for (const role of roleOrder) {
    if (!input.user.roles.includes(role)) continue;
    const step = forRole(role, input);
    if (step && !steps.some((existing) => existing.title === step.title)) steps.push(step);
  }
  const actionable = steps.find((step) => step.action && step.kind !== 'done') ?? steps.find((step) => step.kind === 'problem');
  const primary = actionable ?? steps[0] ?? waiting(input);
  return { primary, others: steps.filter((step) => step !== primary) };
}

export function nextStep(input: NextStepInput): NextStep {
  return nextSteps(input).primary;
}

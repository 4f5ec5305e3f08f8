import type { ComparisonState } from './comparisons';
import type { Role } from './roles';

/**
 * The review workflow's rules, in one table both the server and the client read: which states a
 * comparison can be set up in, each step's role, the states it starts from and where it leads,
 * whether the four-eyes rule applies, and which roles act in each state. The server enforces it
 * (server/governance/service.ts, server/comparisons/service.ts); the client only shapes its pages
 * with it (src/features/governance/lib/workflow.ts, src/features/comparisons/lib/next-step.ts,
 * the set-up and layout routes); tests/api/governance-matrix.test.ts runs the 403/409 matrix
 * from it.
 */

/** A set-up (mapping, settings, holdout) is accepted in these states; it sends the comparison back to draft. */
export const setupStates: readonly ComparisonState[] = ['draft', 'analysed', 'returned'];

export function canSetUp(state: ComparisonState): boolean {
  return setupStates.includes(state);
}

export type WorkflowStep = 'submit' | 'validate' | 'return' | 'vote' | 'decide';

export interface StepRule {
  /** The one role the step's route admits. */
  role: Role;
  /** States the step starts from (409 otherwise). */
  from: readonly ComparisonState[];
  /** The state it leads to; null when it does not change the state (a vote). */
  to: ComparisonState | null;
  /** Barred to whoever shaped the evidence (creator, uploaders, set-up people, the submitter). */
  fourEyes: boolean;
  /** The API path under /api/comparisons/:id/. */
  path: 'submit' | 'review' | 'votes' | 'decision';
}

export const workflowSteps: Record<WorkflowStep, StepRule> = {
  submit: { role: 'modeler', from: ['analysed', 'returned'], to: 'in-review', fourEyes: false, path: 'submit' },
  validate: { role: 'analyst', from: ['in-review'], to: 'validated', fourEyes: true, path: 'review' },
  return: { role: 'analyst', from: ['in-review'], to: 'returned', fourEyes: true, path: 'review' },
  vote: { role: 'committee', from: ['validated'], to: null, fourEyes: true, path: 'votes' },
  decide: { role: 'committee', from: ['validated'], to: 'decided', fourEyes: true, path: 'decision' },
};

/** Who acts while a comparison is in each state (and is e-mailed when it gets there). */
export const actingRoles: Record<ComparisonState, readonly Role[]> = {
  draft: ['modeler'],
  analysed: ['modeler', 'policy'],
  'in-review': ['analyst', 'policy'],
  validated: ['committee', 'policy'],
  returned: ['modeler'],
  decided: [],
};

export function stepAllowedFrom(step: WorkflowStep, state: ComparisonState): boolean {
  return workflowSteps[step].from.includes(state);
}

/** The four-eyes rule in words, as the server's 403 and the pages say it. */
export const fourEyesReason =
  'You created this comparison, uploaded one of its holdouts, set up one of its analyses or submitted it, so someone else must do this (four-eyes rule).';

import { type ComparisonState } from '@shared/comparisons';
import { type Governance, type VoteChoice, voteChoiceSchema } from '@shared/governance';
import { type Role } from '@shared/roles';
import { fourEyesReason, stepAllowedFrom, workflowSteps } from '@shared/workflow';

/**
 * What the person looking at the review page may do now, from the comparison's state, who shaped
 * its evidence and the person's roles — the same rules the server applies (server/governance/service.ts),
 * so the page offers only what will be accepted and says why the rest is not theirs to do. The
 * server decides; this only shapes the page. Pure, so it is tested on its own.
 */

export type Permission = { kind: 'allowed' } | { kind: 'refused'; reason: string } | { kind: 'hidden' };

export interface ViewerActions {
  submit: Permission;
  review: Permission;
  vote: Permission;
  decide: Permission;
  /** Re-judge the current run under the current policy (analyst, committee, admin). */
  reEvaluate: boolean;
}

export interface WorkflowInput {
  state: ComparisonState;
  /** Who shaped the evidence (Governance.authors): barred from reviewing, voting and deciding. */
  authorIds: readonly number[];
  user: { id: number; roles: readonly Role[] };
  /** The newest run's status, null without runs. */
  latestRunStatus: 'queued' | 'running' | 'done' | 'failed' | null;
  hasReport: boolean;
}

const allowed: Permission = { kind: 'allowed' };
const hidden: Permission = { kind: 'hidden' };
const refused = (reason: string): Permission => ({ kind: 'refused', reason });

const ownReason = fourEyesReason;

export function viewerActions(input: WorkflowInput): ViewerActions {
  const { state, user } = input;
  const has = (role: Role) => user.roles.includes(role);
  const own = input.authorIds.includes(user.id);

  let submit: Permission = hidden;
  if (has(workflowSteps.submit.role)) {
    if (state === 'analysed') {
      submit =
        input.latestRunStatus === 'done'
          ? allowed
          : refused(input.latestRunStatus === 'failed' ? 'The newest analysis failed; fix the set-up and run it again first.' : 'Wait for the analysis to finish.');
    } else if (state === 'returned') {
      submit = refused('Change the holdout, mapping or settings and run the analysis again; then submit it once more.');
    }
  }

  // Review, vote and decide straight from the workflow table: its role, its states, four-eyes.
  const judged = (step: 'validate' | 'vote' | 'decide'): Permission => {
    const rule = workflowSteps[step];
    if (!has(rule.role) || !stepAllowedFrom(step, state)) return hidden;
    return rule.fourEyes && own ? refused(ownReason) : allowed;
  };

  return {
    submit,
    review: judged('validate'),
    vote: judged('vote'),
    decide: judged('decide'),
    reEvaluate: input.hasReport && (has('analyst') || has('committee') || has('admin')),
  };
}

/** The workflow's stations in order, for the progress strip. */
export const stations: { state: ComparisonState; label: string }[] = [
  { state: 'draft', label: 'Set up' },
  { state: 'analysed', label: 'Analysed' },
  { state: 'in-review', label: 'In review' },
  { state: 'validated', label: 'Validated' },
  { state: 'decided', label: 'Decided' },
];

/** Votes per choice, in the schema's order. */
export function tally(votes: Governance['votes']): Record<VoteChoice, number> {
  const counts = Object.fromEntries(voteChoiceSchema.options.map((choice) => [choice, 0])) as Record<VoteChoice, number>;
  for (const vote of votes) counts[vote.vote] += 1;
  return counts;
}

/** "2 of 3 votes needed", "3 votes (no quorum)". */
export function quorumText(votes: number, quorum: number): string {
  const word = (n: number) => (n === 1 ? 'vote' : 'votes');
  if (quorum <= 0) return `${votes} ${word(votes)} cast; the adoption policy sets no quorum`;
  if (votes >= quorum) return `${votes} ${word(votes)} cast; the quorum of ${quorum} is met`;
  return `${votes} of the ${quorum} ${word(quorum)} the adoption policy needs before a decision`;
}

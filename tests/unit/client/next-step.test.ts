import { describe, expect, it } from 'vitest';
import { type ComparisonState } from '@shared/comparisons';
import { type Role } from '@shared/roles';
import { type NextStepInput, nextStep, nextSteps } from '@/features/comparisons/lib/next-step';

// Expected steps follow docs/design.md "Workflow and roles": draft → analysed (modeler submits) → in
// review (analyst validates or returns) → validated (committee decides, never the creator) →
// decided; returned goes back to the modeler.

const creatorId = 1;
/** Uploaded the holdout or set up an analysis: barred by four-eyes like the creator. */
const uploaderId = 3;
function input(state: ComparisonState, roles: Role[], extra: Partial<NextStepInput> = {}): NextStepInput {
  return {
    state,
    latestRun: state === 'draft' ? null : { status: 'done' },
    hasReport: state !== 'draft',
    createdById: creatorId,
    authorIds: [creatorId, uploaderId],
    user: { id: 2, roles },
    ...extra,
  };
}

describe('next step by role and state', () => {
  it('sends a modeler with an unmapped draft to the column mapping', () => {
    const step = nextStep(input('draft', ['modeler']));
    expect(step).toMatchObject({ kind: 'action', action: { target: 'setup' } });
  });

  it('tells everyone else that a draft waits for its mapping', () => {
    for (const role of ['analyst', 'policy', 'committee', 'admin'] as Role[]) {
      const step = nextStep(input('draft', [role]));
      expect(step.kind).toBe('waiting');
      expect(step.action).toBeUndefined();
      expect(step.title).toBe('Waiting for the column mapping');
    }
  });

  it('gives each role its own step on an analysed comparison', () => {
    expect(nextStep(input('analysed', ['modeler'])).action?.target).toBe('review');
    expect(nextStep(input('analysed', ['policy'])).action?.target).toBe('swap-sets');
    expect(nextStep(input('analysed', ['analyst'])).kind).toBe('waiting');
    expect(nextStep(input('analysed', ['committee'])).kind).toBe('waiting');
  });

  it('asks the analyst to review a comparison in review, and the modeler to wait', () => {
    expect(nextStep(input('in-review', ['analyst']))).toMatchObject({ kind: 'action', action: { target: 'review' } });
    expect(nextStep(input('in-review', ['modeler'])).kind).toBe('waiting');
  });

  it('asks the committee to decide a validated comparison, except the member who created it', () => {
    expect(nextStep(input('validated', ['committee']))).toMatchObject({ kind: 'action', action: { target: 'review' } });
    const own = nextStep(input('validated', ['committee'], { user: { id: creatorId, roles: ['committee'] } }));
    expect(own.kind).toBe('waiting');
    expect(own.action).toBeUndefined();
    expect(own.text).toContain('You created this comparison');
    const uploaded = nextStep(input('validated', ['committee'], { user: { id: uploaderId, roles: ['committee'] } }));
    expect(uploaded).toMatchObject({ kind: 'waiting', title: 'Other committee members decide this one' });
    expect(uploaded.text).toContain('uploaded one of its holdouts');
  });

  it('tells an analyst who shaped the evidence that another analyst reviews it', () => {
    for (const id of [creatorId, uploaderId]) {
      const step = nextStep(input('in-review', ['analyst'], { user: { id, roles: ['analyst'] } }));
      expect(step).toMatchObject({ kind: 'waiting', title: 'Another analyst reviews this one' });
      expect(step.action).toBeUndefined();
    }
    // A modeler who is also an analyst, on someone else's comparison, reviews it.
    expect(nextStep(input('in-review', ['modeler', 'analyst']))).toMatchObject({ kind: 'action', action: { target: 'review' } });
  });

  it('sends a returned comparison back to the modeler', () => {
    expect(nextStep(input('returned', ['modeler']))).toMatchObject({ kind: 'action', action: { target: 'review' } });
    expect(nextStep(input('returned', ['analyst'])).title).toBe('Returned to the modeler');
  });

  it('shows a decided comparison as done to everyone, with the report', () => {
    for (const role of ['modeler', 'analyst', 'policy', 'committee', 'admin'] as Role[]) {
      expect(nextStep(input('decided', [role]))).toMatchObject({ kind: 'done', action: { target: 'report' } });
    }
  });

  it('says the analysis runs, whoever looks, while a run is queued or running', () => {
    for (const status of ['queued', 'running'] as const) {
      const step = nextStep(input('draft', ['modeler'], { latestRun: { status }, hasReport: false }));
      expect(step.kind).toBe('waiting');
      expect(step.title).toBe(status === 'queued' ? 'The analysis is queued' : 'The analysis is running');
    }
    // A re-run of an analysed comparison: the old report stays on screen meanwhile.
    expect(nextStep(input('analysed', ['analyst'], { latestRun: { status: 'running' } })).text).toContain('previous run');
  });

  it('points a modeler at the mapping after a failed run, and tells others a modeler will fix it', () => {
    const failed = { latestRun: { status: 'failed' as const, error: 'boom' }, hasReport: false };
    expect(nextStep(input('draft', ['modeler'], failed))).toMatchObject({ kind: 'problem', title: 'The analysis failed', action: { target: 'setup' } });
    const other = nextStep(input('draft', ['analyst'], failed));
    expect(other.kind).toBe('problem');
    expect(other.action).toBeUndefined();
    // An earlier run is still shown.
    expect(nextStep(input('analysed', ['modeler'], { latestRun: { status: 'failed' }, hasReport: true })).title).toBe('The latest analysis failed');
  });

  it('picks the role that can act now for a person with several roles, and lists the others', () => {
    const both = nextSteps(input('in-review', ['modeler', 'analyst']));
    expect(both.primary.action?.target).toBe('review');
    expect(both.primary.title).toContain('validate or return');
    const policyAndCommittee = nextSteps(input('validated', ['policy', 'committee']));
    expect(policyAndCommittee.primary.title).toBe('Vote and record the decision');
    const analystAndPolicy = nextSteps(input('in-review', ['analyst', 'policy']));
    expect(analystAndPolicy.primary.action?.target).toBe('review');
    expect(analystAndPolicy.others.map((step) => step.action?.target)).toEqual(['swap-sets']);
  });
});

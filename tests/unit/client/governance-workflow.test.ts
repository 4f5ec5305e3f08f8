import { describe, expect, it } from 'vitest';
import { type ComparisonState, comparisonStates } from '@shared/comparisons';
import { type Role } from '@shared/roles';
import { quorumText, tally, viewerActions } from '@/features/governance/lib/workflow';

/**
 * The review page offers only the steps the server accepts (server/governance/service.ts and
 * tests/api/governance-matrix.test.ts): the step's role, its starting state, and the four-eyes
 * rule for review, votes and the decision.
 */
const base = { authorIds: [1], latestRunStatus: 'done' as const, hasReport: true };
const person = (id: number, roles: Role[]) => ({ id, roles });

describe('viewerActions', () => {
  it('offers each step only in the state it starts from, to its role', () => {
    const from: Record<'submit' | 'review' | 'vote' | 'decide', [Role, ComparisonState]> = {
      submit: ['modeler', 'analysed'],
      review: ['analyst', 'in-review'],
      vote: ['committee', 'validated'],
      decide: ['committee', 'validated'],
    };
    for (const [step, [role, start]] of Object.entries(from) as [keyof typeof from, [Role, ComparisonState]][]) {
      for (const state of comparisonStates) {
        const actions = viewerActions({ ...base, state, user: person(2, [role]) });
        expect(actions[step].kind, `${step} as ${role} in ${state}`).toBe(state === start ? 'allowed' : step === 'submit' && state === 'returned' ? 'refused' : 'hidden');
        const other = viewerActions({ ...base, state, user: person(2, ['policy']) });
        expect(other[step].kind, `${step} as policy in ${state}`).toBe('hidden');
      }
    }
  });

  it('refuses review, votes and the decision to the creator even when they hold the role, and says why', () => {
    const owner = person(1, ['modeler', 'analyst', 'committee']);
    expect(viewerActions({ ...base, state: 'in-review', user: owner }).review).toEqual({ kind: 'refused', reason: expect.stringMatching(/four-eyes/) });
    const validated = viewerActions({ ...base, state: 'validated', user: owner });
    expect(validated.vote.kind).toBe('refused');
    expect(validated.decide.kind).toBe('refused');
    // Submitting their own comparison is the modeler's job.
    expect(viewerActions({ ...base, state: 'analysed', user: owner }).submit.kind).toBe('allowed');
  });

  it('holds back submission while the newest analysis runs or after it failed', () => {
    const modeler = person(2, ['modeler']);
    expect(viewerActions({ ...base, state: 'analysed', latestRunStatus: 'running', user: modeler }).submit).toEqual({ kind: 'refused', reason: 'Wait for the analysis to finish.' });
    expect(viewerActions({ ...base, state: 'analysed', latestRunStatus: 'failed', user: modeler }).submit.kind).toBe('refused');
  });

  it('lets analysts, committee members and admins re-evaluate once a report exists', () => {
    for (const role of ['analyst', 'committee', 'admin'] as Role[]) expect(viewerActions({ ...base, state: 'analysed', user: person(2, [role]) }).reEvaluate).toBe(true);
    for (const role of ['modeler', 'policy'] as Role[]) expect(viewerActions({ ...base, state: 'analysed', user: person(2, [role]) }).reEvaluate).toBe(false);
    expect(viewerActions({ ...base, hasReport: false, state: 'draft', user: person(2, ['analyst']) }).reEvaluate).toBe(false);
  });
});

describe('votes and quorum in words', () => {
  it('counts each choice and states the quorum', () => {
    const vote = (id: number, choice: 'adopt' | 'keep' | 'defer') => ({ id, vote: choice, challenger: choice === 'adopt' ? 0 : null, comment: '', voter: { id, name: `P${id}` }, createdAt: '2026-01-01T00:00:00Z' });
    expect(tally([vote(1, 'adopt'), vote(2, 'keep'), vote(3, 'adopt')])).toEqual({ adopt: 2, keep: 1, defer: 0 });
    expect(quorumText(1, 3)).toBe('1 of the 3 votes the adoption policy needs before a decision');
    expect(quorumText(3, 3)).toBe('3 votes cast; the quorum of 3 is met');
    expect(quorumText(1, 0)).toBe('1 vote cast; the adoption policy sets no quorum');
  });
});

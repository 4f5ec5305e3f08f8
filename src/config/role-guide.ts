import { type Role } from '@shared/roles';

/**
 * What each role lets a person do, in plain words (docs/design.md, "Workflow and roles"). `summary` is
 * one line for forms that grant roles; `duties` lists the work for the welcome page.
 */
export const roleGuide: Record<Role, { summary: string; duties: string[] }> = {
  admin: {
    summary: 'Manages people and roles, edits the adoption policy, reads the outbox.',
    duties: [
      'Invite people by e-mail and give them roles',
      'Change roles, deactivate and reactivate accounts',
      'Edit the adoption policy that turns evidence into a recommendation (each change is a new version)',
      'Read the outbox of e-mails Scorecourt has sent',
    ],
  },
  modeler: {
    summary: 'Uploads holdouts, maps columns, runs analyses, submits for review.',
    duties: [
      'Upload an out-of-time holdout scored by the champion and the challenger',
      'Map its columns: outcome, both scores and their orientation, segments, amounts, weights',
      'Run the analysis and read the evidence',
      'Submit a comparison for validation, and resubmit it when it is returned',
    ],
  },
  analyst: {
    summary: 'Reviews comparisons, writes findings, validates or returns them.',
    duties: [
      'Review the Gini uplift, its DeLong test and interval, KS with bootstrap intervals, and segment stability',
      'Write findings on the record',
      'Validate a comparison, or return it to the modeler with reasons',
    ],
  },
  policy: {
    summary: 'Sets cut-offs and approval rates, annotates and exports swap sets.',
    duties: [
      'Choose the cut-offs or the approval rate the lender would run',
      'Inspect the swap-in and swap-out sets: counts, bad rates, amounts, the strategy curve',
      'Annotate swap sets and export swap lists',
    ],
  },
  committee: {
    summary: 'Votes and records the adoption decision.',
    duties: [
      'Vote on validated comparisons: adopt, keep the champion, or defer',
      'Record the decision with its rationale and conditions (never on a comparison you uploaded)',
    ],
  },
};

import { decisionInputSchema, reviewInputSchema, submitInputSchema, voteInputSchema } from '@shared/governance';
import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { pageQuerySchema } from '@shared/paging';
import { workflowSteps } from '@shared/workflow';
import { comparisonAuditTrail } from './audit-trail';
import { sendEvidencePack } from './evidence';
import { castVote, getGovernance, recordDecision, reviewComparison, submitComparison } from './service';
import { reEvaluate } from './verdicts';

/**
 * The review workflow, verdict records, the audit trail and the evidence pack (shared/governance.ts).
 * Role rules beyond the guard — the four-eyes rule and the states — are the service's (403 / 409).
 */
export function governanceRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/governance',
      access: 'signed-in',
      summary: 'State, reviews, the current round of votes, the decision, verdict records and the quorum',
      validate: { params: idParams },
      handler: (req) => getGovernance(ctx, req.params.id),
    }),
    defineRoute({
      method: 'post',
      path: `/comparisons/:id/${workflowSteps.submit.path}`,
      access: [workflowSteps.submit.role],
      summary: 'Submit for review: analysed → in review, or returned → in review after a new run (409 otherwise); e-mails the analysts',
      validate: { params: idParams, body: submitInputSchema },
      handler: (req) => submitComparison(ctx, currentUser(req), req.params.id, req.body),
    }),
    defineRoute({
      method: 'post',
      path: `/comparisons/:id/${workflowSteps.validate.path}`,
      // One route for both outcomes of a review (shared/workflow.ts: validate and return).
      access: [...new Set([workflowSteps.validate.role, workflowSteps.return.role])],
      summary: 'Findings and outcome: in review → validated (e-mails the committee) or returned (e-mails the creator); not on your own comparison',
      validate: { params: idParams, body: reviewInputSchema },
      handler: (req) => reviewComparison(ctx, currentUser(req), req.params.id, req.body),
    }),
    defineRoute({
      method: 'post',
      path: `/comparisons/:id/${workflowSteps.vote.path}`,
      access: [workflowSteps.vote.role],
      summary: 'Vote adopt, keep or defer while validated; a new vote replaces your earlier one; not on your own comparison',
      validate: { params: idParams, body: voteInputSchema },
      handler: (req) => castVote(ctx, currentUser(req), req.params.id, req.body),
    }),
    defineRoute({
      method: 'post',
      path: `/comparisons/:id/${workflowSteps.decide.path}`,
      access: [workflowSteps.decide.role],
      summary: "Record the decision: validated → decided, once the policy's quorum is met (409); not on your own comparison; e-mails the creator",
      validate: { params: idParams, body: decisionInputSchema },
      handler: (req) => recordDecision(ctx, currentUser(req), req.params.id, req.body),
    }),
    defineRoute({
      method: 'post',
      path: '/comparisons/:id/verdicts',
      access: ['analyst', 'committee', 'admin'],
      summary: 'Re-evaluate the current run under the current policy → 201 a new verdict record (stored ones never change)',
      validate: { params: idParams },
      handler: async (req, res) => {
        const record = await reEvaluate(ctx, currentUser(req), req.params.id);
        res.status(201);
        return record;
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/audit',
      access: 'signed-in',
      summary: "The comparison's audit events in order, a page at a time (?after&limit → nextAfter), and whether the hash chain verifies (new events checked on each call)",
      validate: { params: idParams, query: pageQuerySchema },
      handler: async (req) => {
        const { events, chainValid, nextAfter } = await comparisonAuditTrail(ctx.dataSource, req.params.id, req.query);
        return { events, chainValid, nextAfter };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/evidence.json',
      access: 'signed-in',
      summary: 'The evidence pack as a download: report, settings, hashes, verdicts, reviews, votes, decision, notes, audit trail',
      validate: { params: idParams },
      handler: async (req, res) => {
        await sendEvidencePack(ctx, currentUser(req), req.params.id, res);
      },
    }),
  ];
}

import {
  createComparisonInputSchema,
  listComparisonsQuerySchema,
  scenarioInputSchema,
  setupComparisonInputSchema,
  swapQuerySchema,
  challengersSwapQuerySchema,
} from '@shared/comparisons';
import { mixedStrategyQuerySchema } from '@shared/mixed-strategy';
import { MAX_CHALLENGERS } from '@shared/report';
import { z } from 'zod';
import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { exportBands, exportReport, exportSwap } from './exports';
import { listScenarios, saveScenario } from './scenarios';
import { mixedStrategyPreview } from './mixed-strategy';
import { createComparison, currentReportJson, getComparisonDetail, listComparisons, setupComparison } from './service';
import { challengersSwapOnDemand, swapOnDemand } from './swap';

/** A query parameter holding a finite number, or absent. */
const optionalNumber = z.string().trim().min(1).transform(Number).pipe(z.number()).optional();

/** Several challengers: which one against the champion, by its index in the report's challengers (default 0, the primary). */
const challengerIndexParam = z.string().trim().min(1).transform(Number).pipe(z.number().int().min(0).max(MAX_CHALLENGERS - 1)).optional();

const swapExportQuerySchema = z
  .object({
    championCutoff: optionalNumber,
    challengerCutoff: optionalNumber,
    approvalRate: z.string().trim().min(1).transform(Number).pipe(z.number().gt(0).lt(1)).optional(),
    challenger: challengerIndexParam,
  })
  .refine((query) => (query.championCutoff === undefined) === (query.challengerCutoff === undefined), {
    message: 'Give both championCutoff and challengerCutoff, or neither',
    path: ['championCutoff'],
  });

export function comparisonRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'post',
      path: '/comparisons',
      access: ['modeler'],
      summary: 'Create a comparison on a holdout → 201 { id, state }; with a mapping it is checked (400 naming row and column) and its analysis queued',
      validate: { body: createComparisonInputSchema },
      handler: async (req, res) => {
        const created = await createComparison(ctx, currentUser(req), req.body);
        res.status(201);
        return created;
      },
    }),
    defineRoute({
      method: 'put',
      path: '/comparisons/:id/setup',
      access: ['modeler'],
      summary: 'Set the mapping and settings (draft, analysed or returned) → the detail; starts a new run, earlier runs kept',
      validate: { params: idParams, body: setupComparisonInputSchema },
      handler: async (req) => setupComparison(ctx, currentUser(req), req.params.id, req.body),
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons',
      access: 'signed-in',
      summary: 'Comparisons: ?state=&q=&page=&pageSize=&sort= → { items, total, page, pageSize } with headline numbers',
      validate: { query: listComparisonsQuerySchema },
      handler: async (req) => listComparisons(ctx.dataSource, req.query),
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id',
      access: 'signed-in',
      summary: 'A comparison with its runs (status, progress, stage), newest first, and the current run',
      validate: { params: idParams },
      handler: async (req) => getComparisonDetail(ctx.dataSource, req.params.id),
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/report',
      access: 'signed-in',
      summary: "The current run's report (the CLI's JSON); 409 while no run is done",
      validate: { params: idParams },
      handler: async (req, res) => {
        const { runId, json } = await currentReportJson(ctx.dataSource, req.params.id);
        // A run's report never changes once stored: its id is its version (and Express need not
        // hash the whole report on every request to make an ETag).
        res.setHeader('ETag', `W/"report-${runId}"`);
        res.type('application/json').send(json);
      },
    }),
    defineRoute({
      method: 'post',
      path: '/comparisons/:id/swap',
      access: 'signed-in',
      summary: 'Swap sets (by segment too), swap matrix and strategy-curve position at { cutoffs } or { approvalRate }, on the current run; { challenger: k } for a further challenger (default 0, the first)',
      validate: { params: idParams, body: swapQuerySchema },
      handler: async (req) => swapOnDemand(ctx, req.params.id, req.body),
    }),
    defineRoute({
      method: 'post',
      path: '/comparisons/:id/challengers/swap',
      access: 'signed-in',
      summary: 'Several challengers side by side: each challenger\'s swap sets against the champion at { approvalRate }, and who each model approves, on the current run',
      validate: { params: idParams, body: challengersSwapQuerySchema },
      handler: async (req) => challengersSwapOnDemand(ctx, req.params.id, req.body),
    }),
    defineRoute({
      method: 'post',
      path: '/comparisons/:id/mixed-strategy',
      access: ['policy', 'committee'],
      summary: 'Conditional adoption: the challenger except in { keepChampion } segment values → the mixed strategy beside pure adoption, on the current run',
      validate: { params: idParams, body: mixedStrategyQuerySchema },
      handler: async (req) => mixedStrategyPreview(ctx, req.params.id, req.body),
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/scenarios',
      access: 'signed-in',
      summary: 'Saved cut-off scenarios → { scenarios }, newest first',
      validate: { params: idParams },
      handler: async (req) => listScenarios(ctx, req.params.id),
    }),
    defineRoute({
      method: 'post',
      path: '/comparisons/:id/scenarios',
      access: ['policy'],
      summary: 'Save cut-offs or an approval rate with its swap sets → 201 the scenario',
      validate: { params: idParams, body: scenarioInputSchema },
      handler: async (req, res) => {
        const scenario = await saveScenario(ctx, currentUser(req), req.params.id, req.body);
        res.status(201);
        return scenario;
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/export/bands.csv',
      access: 'signed-in',
      summary: "The champion's and a challenger's band tables as CSV; ?challenger=k for a further challenger (default 0, the primary)",
      validate: { params: idParams, query: z.object({ challenger: challengerIndexParam }) },
      handler: async (req, res) => {
        await exportBands(ctx, req.params.id, req.query, res);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/export/swap.csv',
      access: ['policy'],
      summary: 'Swap-in and swap-out accounts as CSV: ?championCutoff=&challengerCutoff= or ?approvalRate= (default: the report’s); &challenger=k for a further challenger',
      validate: { params: idParams, query: swapExportQuerySchema },
      handler: async (req, res) => {
        await exportSwap(ctx, req.params.id, req.query, res);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/export/report.json',
      access: 'signed-in',
      summary: "The current run's report as a download",
      validate: { params: idParams },
      handler: async (req, res) => {
        await exportReport(ctx, req.params.id, res);
      },
    }),
  ];
}

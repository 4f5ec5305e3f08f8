import {
  createComparisonInputSchema,
  listComparisonsQuerySchema,
  scenarioInputSchema,
  setupComparisonInputSchema,
  swapQuerySchema,
} from '@shared/comparisons';
import { z } from 'zod';
import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { exportBands, exportReport, exportSwap } from './exports';
import { listScenarios, saveScenario } from './scenarios';
import { createComparison, currentReportJson, getComparisonDetail, listComparisons, setupComparison } from './service';
import { swapOnDemand } from './swap';

/** A query parameter holding a finite number, or absent. */
const optionalNumber = z.string().trim().min(1).transform(Number).pipe(z.number()).optional();

const swapExportQuerySchema = z
  .object({
    championCutoff: optionalNumber,
    challengerCutoff: optionalNumber,
    approvalRate: z.string().trim().min(1).transform(Number).pipe(z.number().gt(0).lt(1)).optional(),
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
      summary: 'Swap sets, swap matrix and strategy-curve position at { cutoffs } or { approvalRate }, on the current run',
      validate: { params: idParams, body: swapQuerySchema },
      handler: async (req) => swapOnDemand(ctx, req.params.id, req.body),
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
      summary: "Both models' band tables as CSV",
      validate: { params: idParams },
      handler: async (req, res) => {
        await exportBands(ctx, req.params.id, res);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/export/swap.csv',
      access: ['policy'],
      summary: 'Swap-in and swap-out accounts as CSV: ?championCutoff=&challengerCutoff= or ?approvalRate= (default: the report’s)',
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

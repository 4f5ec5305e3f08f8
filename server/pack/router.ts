import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { sendPackPdf, sendWorkbook } from './service';

/** The committee pack's downloads: the PDF and the workbook, for every signed-in role. */
export function packRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/export/pack.pdf',
      access: 'signed-in',
      summary: 'The committee pack as PDF: the one archived with the decision once decided (its SHA-256 in the audit trail), else made from the current run',
      validate: { params: idParams },
      handler: async (req, res) => {
        await sendPackPdf(ctx, currentUser(req), req.params.id, res);
      },
    }),
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/export/workbook.xlsx',
      access: 'signed-in',
      summary: "The current run's report as a workbook (.xlsx): summary, bands, swap sets, segments, strategy curve, swap matrix, data quality",
      validate: { params: idParams },
      handler: async (req, res) => {
        await sendWorkbook(ctx, req.params.id, res);
      },
    }),
  ];
}

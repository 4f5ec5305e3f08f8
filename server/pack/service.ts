import { createHash } from 'node:crypto';
import type { Report } from '@shared/report';
import type { Response } from 'express';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit, verifyAuditChain } from '../audit/audit';
import { now } from '../clock';
import { attachment, downloadName } from '../comparisons/csv';
import { currentReportJson, findComparison } from '../comparisons/service';
import type { AppContext } from '../context';
import { DecisionPack, type User } from '../db/entities/index';
import { comparisonAuditEvents, presentAuditEvent } from '../governance/audit-trail';
import { getGovernance } from '../governance/service';
import { listNotes } from '../notes/service';
import { renderPackPdf } from './pdf';
import { renderPackOffThread } from './render-thread';
import type { PackInput } from './sections';
import { buildWorkbook } from './workbook';

/**
 * The committee pack's downloads. The PDF of a decided comparison is the one archived when the
 * decision was recorded (its bytes as stored, the same SHA-256 as its audit event); before a
 * decision it is made afresh from the current run and the governance record. The workbook is
 * always made from the current run's report.
 */

type Source = DataSource | EntityManager;

export async function packInput(source: Source, comparisonId: number, options: { generatedFor: string | null; archived: boolean }): Promise<PackInput> {
  const comparison = await findComparison(source, comparisonId);
  const { runId, json } = await currentReportJson(source, comparisonId);
  // getGovernance reads through whatever it is given; inside the decision's transaction that is the manager.
  const governance = await getGovernance({ dataSource: source as DataSource }, comparisonId);
  const events = await comparisonAuditEvents(source, comparisonId);
  const chain = await verifyAuditChain(source);
  return {
    report: JSON.parse(json) as Report,
    comparison: {
      id: comparison.id,
      name: comparison.name,
      description: comparison.description ?? '',
      state: comparison.state,
      createdBy: comparison.createdBy.name,
      createdAt: comparison.createdAt.toISOString(),
      runId,
    },
    governance,
    audit: { events: events.map(presentAuditEvent), chainValid: chain.ok },
    notes: await listNotes(source, comparisonId),
    generatedAt: now(),
    generatedFor: options.generatedFor,
    archivedWithDecision: options.archived,
  };
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/**
 * Inside the decision's transaction, after the decision and its state change are written: makes
 * the pack as decided, stores it with the decision and records its SHA-256 in the audit trail.
 */
export async function archiveDecisionPack(manager: EntityManager, input: { comparisonId: number; decisionId: number; actor: User }): Promise<DecisionPack> {
  const pack = await renderPackPdf(await packInput(manager, input.comparisonId, { generatedFor: input.actor.name, archived: true }));
  const sha256 = sha256Hex(pack);
  const repository = manager.getRepository(DecisionPack);
  const stored = await repository.save(
    repository.create({ decisionId: input.decisionId, comparisonId: input.comparisonId, sha256, bytes: pack.length, pdf: pack, createdAt: now() }),
  );
  await recordAudit(manager, {
    actor: input.actor,
    action: 'comparison.pack_archived',
    target: { type: 'comparison', id: input.comparisonId },
    details: { decisionId: input.decisionId, sha256, bytes: pack.length, format: 'application/pdf' },
  });
  return stored;
}

export async function archivedPack(source: Source, comparisonId: number): Promise<DecisionPack | null> {
  return source.getRepository(DecisionPack).findOne({ where: { comparisonId } });
}

export async function sendPackPdf(ctx: AppContext, actor: User, comparisonId: number, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const archived = await archivedPack(ctx.dataSource, comparisonId);
  // A pack made afresh is laid out on a worker thread; the archived one is sent as stored.
  const pdf = archived ? archived.pdf : await renderPackOffThread(await packInput(ctx.dataSource, comparisonId, { generatedFor: actor.name, archived: false }));
  res.status(200);
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('X-Pack-SHA256', archived ? archived.sha256 : sha256Hex(pdf));
  res.setHeader('X-Pack-Archived', archived ? 'decision' : 'no');
  attachment(res, downloadName(comparison, archived ? 'decided-pack.pdf' : 'pack.pdf'));
  res.send(pdf);
}

export async function sendWorkbook(ctx: AppContext, comparisonId: number, res: Response): Promise<void> {
  const comparison = await findComparison(ctx.dataSource, comparisonId);
  const { json } = await currentReportJson(ctx.dataSource, comparisonId);
  const bytes = await buildWorkbook(JSON.parse(json) as Report, { id: comparison.id, name: comparison.name });
  res.status(200);
  res.setHeader('Content-Type', 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
  attachment(res, downloadName(comparison, 'workbook.xlsx'));
  res.send(bytes);
}

import { createHash } from 'node:crypto';
import { isDeepStrictEqual } from 'node:util';
import type { Report } from '@shared/report';
import type { Response } from 'express';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit, verifyAuditChain } from '../audit/audit';
import { atMoment, now } from '../clock';
import { attachment, downloadName } from '../comparisons/csv';
import { currentReportJson, findComparison } from '../comparisons/service';
import type { AppContext } from '../context';
import { isPostgres } from '../db/driver';
import { DecisionPack, type User } from '../db/entities/index';
import { inTransaction, insideUnitOfWork } from '../db/transaction';
import { comparisonAuditEvents, presentAuditEvent } from '../governance/audit-trail';
import { getGovernance } from '../governance/service';
import { listNotes } from '../notes/service';
import { packSections, type PackInput } from './sections';
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
 * Inside the decision's transaction, after the decision and its state change are written: stores
 * the pack as decided (laid out by decideWithPack below) with the decision and records its SHA-256
 * in the audit trail.
 */
export async function storeDecisionPack(manager: EntityManager, input: { comparisonId: number; decisionId: number; actor: User; pdf: Buffer }): Promise<DecisionPack> {
  const { pdf } = input;
  const sha256 = sha256Hex(pdf);
  const repository = manager.getRepository(DecisionPack);
  const stored = await repository.save(
    repository.create({ decisionId: input.decisionId, comparisonId: input.comparisonId, sha256, bytes: pdf.length, pdf, createdAt: now() }),
  );
  await recordAudit(manager, {
    actor: input.actor,
    action: 'comparison.pack_archived',
    target: { type: 'comparison', id: input.comparisonId },
    details: { decisionId: input.decisionId, sha256, bytes: pdf.length, format: 'application/pdf' },
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
  const pdf = archived ? archived.pdf : await ctx.layOutPack(await packInput(ctx.dataSource, comparisonId, { generatedFor: actor.name, archived: false }));
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

/**
 * A decision and the committee pack archived with it are stored in one transaction: both, or
 * neither. The pack shows the decision as stored (its record, the comparison decided, the audit
 * trail with the decision's event), so it is made from what the decision's transaction wrote;
 * but laying out the PDF takes seconds, and the transaction holds the database's write lock.
 * So the decision is written twice at one moment (clock.ts `atMoment`):
 *
 * 1. a rehearsal: the decision is written, the pack's input read, and the transaction rolled back
 *    (milliseconds under the lock);
 * 2. the PDF is laid out from that input on a pack thread, with no lock held;
 * 3. the decision is written again, for good, and the pack's input read again: when the pack
 *    would print the same (nothing it shows changed in between), the PDF is stored with the
 *    decision in this transaction.
 *
 * If the record moved in between (another event in the audit chain, a note, a vote), step 3 rolls
 * back and the decision is written once more at the current time with the pack laid out inside
 * that transaction, as before: slower, never wrong. On PostgreSQL a rehearsal's ids are not given
 * back (sequences do not roll back), so the decision's audit event would always differ: there the
 * decision is written once with the pack laid out inside its transaction. A decision whose checks
 * fail fails in the rehearsal, before any layout.
 *
 * `decide` writes the decision and calls `archive(decisionId)` where the pack belongs among its
 * writes (right after the decision's own audit event); it may run up to three times.
 */
export type DecideWithPack = (manager: EntityManager, archive: (decisionId: number) => Promise<void>) => Promise<void>;

class Rehearsed extends Error {
  constructor(readonly input: PackInput) {
    super('rehearsal of a decision (rolled back on purpose)');
  }
}

class RecordMoved extends Error {
  constructor() {
    super('the record changed while the decision pack was laid out');
  }
}

/** What the PDF prints: every section's blocks, the footer's comparison and the date in its metadata. */
function printed(input: PackInput): unknown {
  return { sections: packSections.map((section) => section(input)), id: input.comparison.id, name: input.comparison.name, at: input.generatedAt.getTime() };
}

export async function decideWithPack(ctx: Pick<AppContext, 'dataSource' | 'log' | 'layOutPack'>, comparisonId: number, actor: User, decide: DecideWithPack): Promise<void> {
  const options = { generatedFor: actor.name, archived: true };
  const laidOutInside = () =>
    inTransaction(ctx.dataSource, (manager) =>
      decide(manager, async (decisionId) => {
        const pdf = await ctx.layOutPack(await packInput(manager, comparisonId, options));
        await storeDecisionPack(manager, { comparisonId, decisionId, actor, pdf });
      }),
    );
  // Inside a caller's transaction a rehearsal could not be rolled back alone; on PostgreSQL it
  // could never be used (its ids are not given back), so the pack is laid out inside at once.
  if (insideUnitOfWork(ctx.dataSource) || isPostgres(ctx.dataSource)) return laidOutInside();

  const moment = now();
  let rehearsal: PackInput | null = null;
  try {
    await atMoment(moment, () =>
      inTransaction(ctx.dataSource, async (manager) => {
        await decide(manager, async () => {
          throw new Rehearsed(await packInput(manager, comparisonId, options));
        });
        throw new Error('a decision was written without archiving its pack');
      }),
    );
  } catch (error) {
    if (!(error instanceof Rehearsed)) throw error;
    rehearsal = error.input;
  }
  if (!rehearsal) throw new Error('the rehearsal of a decision ended without its pack');
  const pdf = await ctx.layOutPack(rehearsal);
  const expected = printed(rehearsal);
  try {
    await atMoment(moment, () =>
      inTransaction(ctx.dataSource, (manager) =>
        decide(manager, async (decisionId) => {
          if (!isDeepStrictEqual(printed(await packInput(manager, comparisonId, options)), expected)) throw new RecordMoved();
          await storeDecisionPack(manager, { comparisonId, decisionId, actor, pdf });
        }),
      ),
    );
  } catch (error) {
    if (!(error instanceof RecordMoved)) throw error;
    ctx.log.info('decision pack laid out again inside the transaction: the record changed meanwhile', { comparisonId });
    await laidOutInside();
  }
}

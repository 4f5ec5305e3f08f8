import type { HoldoutInfo, ValidationReport } from '@shared/comparisons';
import type { ColumnMapping } from '@shared/report';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import type { AppContext } from '../context';
import { Holdout, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { notFound } from '../errors';
import { sanitiseFileName } from './file-name';
import { asBadInput } from './input-error';
import { presentHoldout } from './present';
import { type MappedHoldout, type MappedReference, runReaderTask } from './reading';
import { ensureRoomFor } from './free-space';
import { unstage } from './staged-rows';
import { CHUNK_BYTES, storeHoldoutFile } from './storage';
import { databaseAddress } from '../config';

/**
 * Holdouts: an upload is scanned by the engine's reader on a worker thread (columns, row count,
 * preview, a mapping guess, SHA-256), then stored — the holdout row, the file's bytes in chunks
 * and the audit event in one transaction, so a rejected or failed upload leaves nothing behind. A
 * mapping is applied later by reading the stored bytes again (validation, and the set-up of a
 * comparison), also on a worker.
 */

export interface UploadedFile {
  /** Where multer wrote it (a random name in the upload folder). */
  path: string;
  /** The client's file name: untrusted, only shown after sanitising. */
  originalname: string;
  /** For an .xlsx workbook: the worksheet to read (default: the first); refused for CSV. */
  sheet?: string | null;
  /**
   * Its row in staged_uploads (staged-uploads.ts): removed in the storing transaction, which is
   * refused when the row is gone (another instance stored it). `resumed`: this instance took it
   * over from one that stopped.
   */
  staged?: { id: number; resumed: boolean };
}

export async function uploadHoldout(ctx: Pick<AppContext, 'config' | 'dataSource'>, actor: User, file: UploadedFile): Promise<HoldoutInfo> {
  const fileName = sanitiseFileName(file.originalname);
  const scan = await asBadInput(() => runReaderTask({ task: 'scan', path: file.path, fileName, sheet: file.sheet ?? null }));
  const chunkCount = Math.ceil(scan.bytes / CHUNK_BYTES);
  // The received file is on disk: its chunks (in the WAL, then the database) must fit too, or 507.
  ensureRoomFor(ctx.config.databasePath, scan.bytes, 2);
  const id = await inTransaction(ctx.dataSource, async (manager) => {
    if (file.staged) await unstage(manager, file.staged.id);
    const holdout = await manager.save(
      manager.create(Holdout, {
        fileName,
        sha256: scan.sha256,
        bytes: scan.bytes,
        rowCount: scan.rowCount,
        sheet: scan.sheet,
        delimiter: scan.delimiter,
        columns: scan.columns,
        preview: scan.preview,
        guess: scan.guess,
        chunkSize: CHUNK_BYTES,
        chunkCount,
        uploadedById: actor.id,
        uploadedAt: now(),
      }),
    );
    const stored = await storeHoldoutFile(manager, holdout.id, file.path);
    if (stored.bytes !== scan.bytes || stored.chunks !== chunkCount) {
      throw new Error(`holdout upload: stored ${stored.bytes} bytes in ${stored.chunks} chunks, the reader read ${scan.bytes}`);
    }
    await recordAudit(manager, {
      actor,
      action: 'holdout.uploaded',
      target: { type: 'holdout', id: holdout.id },
      details: { fileName, ...(scan.sheet === null ? {} : { sheet: scan.sheet }), ...(file.staged?.resumed ? { resumedByAnotherInstance: true } : {}), sha256: scan.sha256, bytes: scan.bytes, rowCount: scan.rowCount, columns: scan.columns.map((column) => column.name) },
    });
    return holdout.id;
  });
  return getHoldout(ctx.dataSource, id, actor);
}

export async function findHoldout(source: DataSource | EntityManager, id: number): Promise<Holdout> {
  const holdout = await source.getRepository(Holdout).findOne({ where: { id }, relations: { uploadedBy: true } });
  if (!holdout) throw notFound(`There is no holdout ${id}.`);
  return holdout;
}

export async function getHoldout(source: DataSource | EntityManager, id: number, viewer: Pick<User, 'roles'>): Promise<HoldoutInfo> {
  return presentHoldout(await findHoldout(source, id), viewer);
}

/** The upload wizard's validation report: the first 50 problems, each naming its row and column, or a summary. */
export async function validateMapping(ctx: AppContext, id: number, mapping: ColumnMapping, dropMissing: boolean): Promise<ValidationReport> {
  await findHoldout(ctx.dataSource, id);
  return runReaderTask({ task: 'validate', databasePath: databaseAddress(ctx.config), holdoutId: id, mapping, dropMissing });
}

/**
 * Applies a mapping to the stored file, on a worker thread: the run's input summary and its
 * columns in typed-array form, ready to store. Bad data → 400 naming the row and column (nothing
 * has been stored yet).
 */
/** The PSI's reference sample: the mapping's score columns read from another stored holdout (on the reader's thread). */
export async function mapReference(ctx: AppContext, holdout: Holdout, mapping: ColumnMapping, dropMissing: boolean): Promise<MappedReference> {
  return asBadInput(() => runReaderTask({ task: 'reference', databasePath: databaseAddress(ctx.config), holdoutId: holdout.id, mapping, dropMissing }));
}

export async function mapHoldout(ctx: AppContext, holdout: Holdout, mapping: ColumnMapping, dropMissing: boolean): Promise<MappedHoldout> {
  return asBadInput(() => runReaderTask({ task: 'map', databasePath: databaseAddress(ctx.config), holdoutId: holdout.id, mapping, dropMissing }));
}

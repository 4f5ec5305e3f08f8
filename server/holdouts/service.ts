import type { HoldoutInfo, ValidationReport } from '@shared/comparisons';
import type { ColumnMapping } from '@shared/report';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import type { AppContext } from '../context';
import { Holdout, type RunInput, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { notFound } from '../errors';
import { loadHoldout, validateHoldout } from '../reader/load';
import { scanHoldout } from '../reader/scan';
import { encodeHoldout, type EncodedColumn } from './columns';
import { sanitiseFileName } from './file-name';
import { asBadInput } from './input-error';
import { presentHoldout } from './present';
import { CHUNK_BYTES, holdoutBytes, storeHoldoutFile } from './storage';

/**
 * Holdouts: an upload is scanned by the engine's reader (columns, row count, preview, a mapping
 * guess, SHA-256), then stored — the holdout row, the file's bytes in chunks and the audit event
 * in one transaction, so a rejected or failed upload leaves nothing behind. A mapping is applied
 * later by reading the stored bytes again (validate, and set-up of a comparison).
 */

export interface UploadedFile {
  /** Where multer wrote it (a random name in the upload folder). */
  path: string;
  /** The client's file name: untrusted, only shown after sanitising. */
  originalname: string;
}

export async function uploadHoldout(ctx: AppContext, actor: User, file: UploadedFile): Promise<HoldoutInfo> {
  const fileName = sanitiseFileName(file.originalname);
  const scan = await asBadInput(() => scanHoldout({ path: file.path, fileName }));
  const chunkCount = Math.ceil(scan.bytes / CHUNK_BYTES);
  const id = await inTransaction(ctx.dataSource, async (manager) => {
    const holdout = await manager.save(
      manager.create(Holdout, {
        fileName,
        sha256: scan.sha256,
        bytes: scan.bytes,
        rowCount: scan.rowCount,
        delimiter: scan.delimiter,
        columns: scan.columns,
        preview: scan.preview,
        guess: scan.guess,
        chunkSize: CHUNK_BYTES,
        chunkCount,
        uploadedById: actor.id,
        uploadedAt: new Date(),
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
      details: { fileName, sha256: scan.sha256, bytes: scan.bytes, rowCount: scan.rowCount, columns: scan.columns.map((column) => column.name) },
    });
    return holdout.id;
  });
  return getHoldout(ctx.dataSource, id);
}

export async function findHoldout(source: DataSource | EntityManager, id: number): Promise<Holdout> {
  const holdout = await source.getRepository(Holdout).findOne({ where: { id }, relations: { uploadedBy: true } });
  if (!holdout) throw notFound(`There is no holdout ${id}.`);
  return holdout;
}

export async function getHoldout(source: DataSource | EntityManager, id: number): Promise<HoldoutInfo> {
  return presentHoldout(await findHoldout(source, id));
}

/** The stored file as the reader's source. */
async function sourceOf(ctx: AppContext, holdout: Holdout) {
  return { bytes: await holdoutBytes(ctx.dataSource, holdout), fileName: holdout.fileName };
}

/** The upload wizard's validation report: the first 50 problems, each naming its row and column, or a summary. */
export async function validateMapping(ctx: AppContext, id: number, mapping: ColumnMapping, dropMissing: boolean): Promise<ValidationReport> {
  const holdout = await findHoldout(ctx.dataSource, id);
  const result = await validateHoldout(await sourceOf(ctx, holdout), mapping, { dropMissing, maxErrors: 50 });
  return { ok: result.ok, errors: result.errors, summary: result.summary };
}

/**
 * Applies a mapping to the stored file: the run's input summary and its columns in typed-array
 * form, ready to store. Bad data → 400 naming the row and column (nothing has been stored yet).
 */
export async function mapHoldout(
  ctx: AppContext,
  holdout: Holdout,
  mapping: ColumnMapping,
  dropMissing: boolean,
): Promise<{ input: RunInput; columns: EncodedColumn[] }> {
  const source = await sourceOf(ctx, holdout);
  const loaded = await asBadInput(() => loadHoldout(source, mapping, { dropMissing }));
  if (loaded.input.sha256 !== holdout.sha256) {
    throw new Error(`holdout ${holdout.id}: the stored bytes no longer match the upload's SHA-256`);
  }
  const { read } = loaded;
  const input: RunInput = {
    fileName: loaded.input.fileName,
    sha256: loaded.input.sha256,
    bytes: loaded.input.bytes,
    n: loaded.holdout.n,
    read: {
      rowsRead: read.rowsRead,
      rowsUsed: read.rowsUsed,
      rowsDroppedMissingScore: read.rowsDroppedMissingScore,
      missingByColumn: read.missingByColumn,
      badValue: read.badValue,
      goodValue: read.goodValue,
      goods: read.goods,
      bads: read.bads,
      delimiter: read.delimiter,
    },
    hasIds: loaded.holdout.ids !== null,
    hasExposure: loaded.holdout.exposure !== null,
    segments: loaded.holdout.segments.map((segment) => ({ column: segment.column, levels: segment.levels })),
  };
  return { input, columns: encodeHoldout(loaded.holdout) };
}

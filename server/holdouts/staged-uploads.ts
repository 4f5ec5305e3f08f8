import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { HoldoutInfo } from '@shared/comparisons';
import type { DataSource } from 'typeorm';
import { now } from '../clock';
import type { Config } from '../config';
import { User } from '../db/entities/index';
import type { Logger } from '../log';
import { clearStaged, dropStaged, renewClaim, stage, stagedFiles, takeOver, unclaimed } from './staged-rows';
import { abandonedUploadMs, clearUploadDir } from './upload-dir';
import { uploadHoldout, type UploadedFile } from './service';

/**
 * Uploads that survive the instance receiving them. A file received in full into the upload folder
 * is recorded in staged_uploads before it is read and stored (staged-rows.ts); the storing
 * transaction removes the record, and the request removes what is left (the record, the file)
 * however it ends. So a record outlives its request only when the instance stopped mid-way (killed,
 * lost): its claim then runs out, and any instance sharing the folder (UPLOAD_DIR) and the
 * database takes it over — one instance, by a claim in the database — and finishes storing it
 * for the person who sent it (the audit event says it was resumed), or removes it and its file
 * when it cannot be stored (its file is gone, the person can no longer upload, the file is
 * refused). Files half-received by a stopped instance have no record; the start-up clean-up of
 * the folder removes them (holdouts/upload-dir.ts).
 */

export interface StagingContext {
  config: Config;
  dataSource: DataSource;
  log: Logger;
  uploadDir: string;
}

/** How long a staged upload stays this instance's without renewal (UPLOAD_CLAIM_SECONDS). */
const claimMsOf = (ctx: StagingContext) => ctx.config.uploadClaimSeconds * 1000;

/** Stores `file` under its staged record, renewing the claim on it while the work lasts. */
async function storeStaged(ctx: StagingContext, actor: User, file: UploadedFile & { staged: { id: number; resumed: boolean } }): Promise<HoldoutInfo> {
  let renewing: Promise<unknown> = Promise.resolve();
  const timer = setInterval(() => {
    renewing = renewing.then(() => renewClaim(ctx.dataSource, file.staged.id, claimMsOf(ctx))).catch((error: unknown) => ctx.log.warn('could not renew the claim on a staged upload', error));
  }, claimMsOf(ctx) / 3);
  try {
    return await uploadHoldout(ctx, actor, file);
  } finally {
    clearInterval(timer);
    await renewing;
  }
}

/** The upload route's storing: staged, stored, and the record and file removed whatever the outcome. */
export async function storeUpload(ctx: StagingContext, actor: User, file: UploadedFile): Promise<HoldoutInfo> {
  const id = await stage(ctx.dataSource, { path: file.path, originalname: file.originalname, sheet: file.sheet ?? null }, actor.id, claimMsOf(ctx));
  try {
    return await storeStaged(ctx, actor, { ...file, staged: { id, resumed: false } });
  } finally {
    await dropStaged(ctx.dataSource, id).catch((error: unknown) => ctx.log.warn(`staged upload ${id}: could not remove its record`, error));
  }
}

/**
 * Finishes the staged uploads whose instance stopped (their claim has ended): each is taken over
 * by one instance and stored, or removed with its file. Safe to call from every instance at once.
 */
export async function finishAbandonedUploads(ctx: StagingContext): Promise<{ stored: number; removed: number }> {
  const counts = { stored: 0, removed: 0 };
  for (const row of await unclaimed(ctx.dataSource, now())) {
    if (!(await takeOver(ctx.dataSource, row, claimMsOf(ctx)))) continue; // another instance has it
    const path = join(ctx.uploadDir, row.file);
    try {
      const person = await ctx.dataSource.getRepository(User).findOne({ where: { id: row.uploadedById } });
      if (!existsSync(path)) throw new Error(`its file ${row.file} is not in ${ctx.uploadDir}`);
      if (!person || !person.active || !person.roles.includes('modeler')) throw new Error('the person who sent it can no longer upload holdouts');
      const holdout = await storeStaged(ctx, person, { path, originalname: row.originalName, sheet: row.sheet, staged: { id: row.id, resumed: true } });
      counts.stored += 1;
      ctx.log.info(`staged upload ${row.id} (${row.originalName}), left by an instance that stopped: stored as holdout ${holdout.id}`);
    } catch (error) {
      counts.removed += 1;
      ctx.log.warn(`staged upload ${row.id} (${row.originalName}), left by an instance that stopped, was not stored and is removed: ${error instanceof Error ? error.message : String(error)}`);
    } finally {
      await dropStaged(ctx.dataSource, row.id);
      rmSync(path, { force: true });
    }
  }
  return counts;
}

/**
 * At a server's start, before it serves. SQLite (one server): what a previous process left in the
 * folder, staged or half-received, is removed and never stored, as before there were records (a
 * restart does not wait to store an upload nobody was told of; its sender sends it again).
 * PostgreSQL (servers sharing UPLOAD_DIR): half-received files abandoned for hours are removed,
 * and the staged uploads of stopped instances are finished in the background, now and every
 * `everyMs` (default: a minute, or half a claim when claims are shorter; the start does not wait
 * for them). `stop()` ends the looking.
 */
export async function startUploadStaging(ctx: StagingContext, everyMs = Math.min(60_000, claimMsOf(ctx) / 2)): Promise<{ stop: () => Promise<void> }> {
  mkdirSync(ctx.uploadDir, { recursive: true });
  if (!ctx.config.databaseUrl) {
    await clearStaged(ctx.dataSource);
    const leftovers = clearUploadDir(ctx.uploadDir);
    if (leftovers > 0) ctx.log.info(`removed ${leftovers} unfinished upload(s) from ${ctx.uploadDir}`);
    return { stop: async () => undefined };
  }
  const leftovers = clearUploadDir(ctx.uploadDir, { olderThanMs: abandonedUploadMs, keep: await stagedFiles(ctx.dataSource) });
  if (leftovers > 0) ctx.log.info(`removed ${leftovers} unfinished upload(s) from ${ctx.uploadDir}`);
  let running: Promise<unknown> = Promise.resolve();
  const look = () => {
    running = running
      .then(() => finishAbandonedUploads(ctx))
      .catch((error: unknown) => ctx.log.error('could not finish the staged uploads of stopped instances', error));
  };
  look();
  const timer = setInterval(look, everyMs);
  timer.unref();
  return {
    stop: async () => {
      clearInterval(timer);
      await running;
    },
  };
}

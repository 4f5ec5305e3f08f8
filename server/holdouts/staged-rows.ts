import { basename } from 'node:path';
import { LessThan, type DataSource, type EntityManager } from 'typeorm';
import { now } from '../clock';
import { StagedUpload } from '../db/entities/index';
import { withWriteLock } from '../db/transaction';
import { conflict } from '../errors';

/**
 * The rows of staged_uploads (db/entities/staged-upload.ts): an upload received in full and not
 * yet stored. What is done with them is staged-uploads.ts's.
 */

/*
 * A claim: how long an instance holds a staged upload without renewing it (`claimMs`, the
 * config's UPLOAD_CLAIM_SECONDS; the instance storing it renews it every third of it).
 */
const claimEnd = (claimMs: number) => new Date(now().getTime() + claimMs);

/** Records a file received into the upload folder, claimed by this instance for `claimMs`; its id. */
export async function stage(dataSource: DataSource, file: { path: string; originalname: string; sheet: string | null }, uploadedById: number, claimMs: number): Promise<number> {
  return withWriteLock(dataSource, async () => {
    const row = await dataSource
      .getRepository(StagedUpload)
      .save({ file: basename(file.path), originalName: file.originalname, sheet: file.sheet, uploadedById, receivedAt: now(), claimedUntil: claimEnd(claimMs), takeovers: 0 });
    return row.id;
  });
}

/** Inside the storing transaction: removes the row, or refuses (409) when it is gone (another instance stored or removed it). */
export async function unstage(manager: EntityManager, id: number): Promise<void> {
  const result = await manager.delete(StagedUpload, { id });
  if (result.affected !== 1) throw conflict('This upload was already stored or removed by another instance.');
}

/** Moves the claim on a staged upload forward (the instance storing it is alive); false when the row is gone. */
export async function renewClaim(dataSource: DataSource, id: number, claimMs: number): Promise<boolean> {
  const result = await withWriteLock(dataSource, () => dataSource.getRepository(StagedUpload).update({ id }, { claimedUntil: claimEnd(claimMs) }));
  return result.affected === 1;
}

/** Removes the row, if it is still there (the request that received it ended, whatever its outcome). */
export async function dropStaged(dataSource: DataSource, id: number): Promise<void> {
  await withWriteLock(dataSource, () => dataSource.getRepository(StagedUpload).delete({ id }));
}

/** Staged uploads whose claim ended before `before` (their instance stopped). */
export async function unclaimed(dataSource: DataSource, before: Date): Promise<StagedUpload[]> {
  return dataSource.getRepository(StagedUpload).find({ where: { claimedUntil: LessThan(before) }, order: { id: 'ASC' } });
}

/** Removes every record (a single server starting: its previous process's uploads are dropped with their files). */
export async function clearStaged(dataSource: DataSource): Promise<void> {
  await withWriteLock(dataSource, () => dataSource.createQueryBuilder().delete().from(StagedUpload).execute());
}

/** Takes an unclaimed staged upload over: true for the one instance whose claim succeeded. */
export async function takeOver(dataSource: DataSource, row: StagedUpload, claimMs: number): Promise<boolean> {
  const result = await withWriteLock(dataSource, () =>
    dataSource
      .createQueryBuilder()
      .update(StagedUpload)
      .set({ claimedUntil: claimEnd(claimMs), takeovers: () => '"takeovers" + 1' })
      .where({ id: row.id, takeovers: row.takeovers })
      .execute(),
  );
  return result.affected === 1;
}

/** The staged files' names (kept by the start-up clean-up of the upload folder). */
export async function stagedFiles(dataSource: DataSource): Promise<Set<string>> {
  return new Set((await dataSource.getRepository(StagedUpload).find({ select: { file: true } })).map((row) => row.file));
}

import { createHash, randomBytes } from 'node:crypto';
import { existsSync, readdirSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auditDetails } from '@server/audit/audit';
import { openDatabase } from '@server/db/data-source';
import { AuditEvent, Holdout, StagedUpload, User } from '@server/db/entities/index';
import { stage } from '@server/holdouts/staged-rows';
import { finishAbandonedUploads, startUploadStaging, type StagingContext } from '@server/holdouts/staged-uploads';
import { createLogger } from '@server/log';
import { onPostgres } from '../setup/test-database';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { rowCounts, sample2k, uploadFile } from './helpers/holdouts';

/**
 * Uploads that outlive the instance receiving them (holdouts/staged-uploads.ts). A file received in
 * full is recorded as staged before it is stored; when the instance stops mid-way (here: the record
 * and the file as `stage` leaves them, with the claim run out as it does once nobody renews it),
 * another instance finishes storing it for the person who sent it, exactly once even when two
 * instances look at the same moment, or removes it and its file when it cannot be stored. On
 * PostgreSQL the second instance has its own connection pool (a data source of its own).
 */

let t: TestApp;
let other: DataSource;
let modeler: TestClient;
let uploadDir: string;
let modelerId: number;
const log = createLogger('silent');
/** A file the reader refuses (gzip-compressed, not CSV text). */
const gzipped = gzipSync(Buffer.from('bad,champion,challenger\n0,600,0.1\n', 'utf8'));

/** What a stopped instance leaves: the received file in the upload folder and its record, with the claim `claimAgeMs` past (negative: still held). */
async function leftBehind(bytes: Buffer, originalname: string, claimAgeMs = 60_000): Promise<{ id: number; file: string }> {
  const file = `staged-${randomBytes(8).toString('hex')}`;
  writeFileSync(join(uploadDir, file), bytes);
  const id = await stage(t.dataSource, { path: join(uploadDir, file), originalname, sheet: null }, modelerId, t.config.uploadClaimSeconds * 1000);
  await t.dataSource.getRepository(StagedUpload).update({ id }, { claimedUntil: new Date(Date.now() - claimAgeMs) });
  return { id, file };
}

const instance = (dataSource: DataSource): StagingContext => ({ config: t.config, dataSource, log, uploadDir });

describe('staged uploads finished or cleaned up by another instance', () => {
  beforeAll(async () => {
    t = await buildTestApp();
    other = onPostgres ? await openDatabase(t.config.databaseUrl!) : t.dataSource;
    uploadDir = join(t.directory, 'uploads');
    modeler = await signedInAs(t.app, 'modeler');
    modelerId = (await t.dataSource.getRepository(User).findOneByOrFail({ email: 'modeler@tallowmere.test' })).id;
  });
  afterAll(async () => {
    if (other !== t?.dataSource) await other?.destroy();
    await t?.close();
  });

  it('an upload answered by its instance leaves no staged record and no file behind', async () => {
    const response = await uploadFile(modeler, sample2k(), 'answered.csv');
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    expect(await t.dataSource.getRepository(StagedUpload).count()).toBe(0);
    expect(readdirSync(uploadDir)).toEqual([]);
    // A refused file too.
    expect((await uploadFile(modeler, gzipped, 'refused.csv')).status).toBe(400);
    expect(await t.dataSource.getRepository(StagedUpload).count()).toBe(0);
    expect(readdirSync(uploadDir)).toEqual([]);
  });

  it('stores an upload whose instance stopped, once, for the person who sent it, when two instances look at once', async () => {
    const bytes = sample2k();
    const before = await rowCounts(t.dataSource);
    const { file } = await leftBehind(bytes, 'month-end holdout.csv');
    const results = await Promise.all([finishAbandonedUploads(instance(t.dataSource)), finishAbandonedUploads(instance(other))]);
    expect(results.reduce((sum, counts) => sum + counts.stored, 0)).toBe(1);
    expect(results.reduce((sum, counts) => sum + counts.removed, 0)).toBe(0);

    const after = await rowCounts(t.dataSource);
    // (COUNT(*) comes back as a string on PostgreSQL.)
    expect(Number(after.holdouts)).toBe(Number(before.holdouts) + 1);
    expect(Number(after.audit_events)).toBe(Number(before.audit_events) + 1);
    const holdout = await t.dataSource.getRepository(Holdout).findOneOrFail({ where: {}, order: { id: 'DESC' } });
    expect(holdout).toMatchObject({ fileName: 'month-end holdout.csv', uploadedById: modelerId, sha256: createHash('sha256').update(bytes).digest('hex'), bytes: bytes.length });
    const event = await t.dataSource.getRepository(AuditEvent).findOneOrFail({ where: { action: 'holdout.uploaded', targetId: String(holdout.id) } });
    expect(event.actorId).toBe(modelerId);
    expect(auditDetails(event)).toMatchObject({ resumedByAnotherInstance: true, rowCount: 2000 });
    // Readable through the API like any upload.
    const shown = await modeler.get(`/api/holdouts/${holdout.id}`);
    expect(shown.status).toBe(200);
    expect(shown.body.rowCount).toBe(2000);

    expect(await t.dataSource.getRepository(StagedUpload).count()).toBe(0);
    expect(existsSync(join(uploadDir, file))).toBe(false);
    // Nothing left for a later look.
    expect(await finishAbandonedUploads(instance(other))).toEqual({ stored: 0, removed: 0 });
  });

  it('removes a staged upload that cannot be stored (a refused file, a missing file), storing nothing of it', async () => {
    const before = await rowCounts(t.dataSource);
    await leftBehind(gzipped, 'refused.csv');
    const missing = await leftBehind(sample2k(), 'missing.csv');
    rmSync(join(uploadDir, missing.file));
    expect(await finishAbandonedUploads(instance(other))).toEqual({ stored: 0, removed: 2 });
    expect(await rowCounts(t.dataSource)).toEqual(before);
    expect(await t.dataSource.getRepository(StagedUpload).count()).toBe(0);
    expect(readdirSync(uploadDir)).toEqual([]);
  });

  it('leaves alone an upload whose instance still holds it (its claim is not over)', async () => {
    const held = await leftBehind(sample2k(), 'held.csv', -60_000);
    try {
      expect(await finishAbandonedUploads(instance(other))).toEqual({ stored: 0, removed: 0 });
      expect(await t.dataSource.getRepository(StagedUpload).countBy({ id: held.id })).toBe(1);
      expect(existsSync(join(uploadDir, held.file))).toBe(true);
    } finally {
      await t.dataSource.getRepository(StagedUpload).delete({ id: held.id });
      rmSync(join(uploadDir, held.file), { force: true });
    }
  });

  it('at a server’s start: with PostgreSQL, stores what a stopped instance staged; with SQLite, removes it, storing nothing', async () => {
    const before = await rowCounts(t.dataSource);
    // PostgreSQL: once its claim has ended. SQLite: the previous process is gone, whatever its claim says.
    const staged = await leftBehind(sample2k(), 'restart.csv', onPostgres ? 60_000 : -60_000);
    const half = join(uploadDir, 'half-received');
    writeFileSync(half, 'bad,champion,chall');
    const hoursAgo = new Date(Date.now() - 7 * 60 * 60_000);
    utimesSync(half, hoursAgo, hoursAgo);
    const staging = await startUploadStaging(instance(t.dataSource));
    await staging.stop();
    expect(Number((await rowCounts(t.dataSource)).holdouts)).toBe(Number(before.holdouts) + (onPostgres ? 1 : 0));
    expect(await t.dataSource.getRepository(StagedUpload).count()).toBe(0);
    expect(existsSync(join(uploadDir, staged.file))).toBe(false);
    expect(readdirSync(uploadDir)).toEqual([]);
  });
});

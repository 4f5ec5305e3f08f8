import { createHash } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { holdoutSchema, validationReportSchema } from '@shared/comparisons';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { databaseAddress } from '@server/config';
import { rawQuery } from '@server/db/driver';
import { onPostgres } from '../setup/test-database';
import { AuditEvent } from '@server/db/entities/index';
import { storedFile } from '@server/holdouts/reading';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, type TestClient } from './helpers/client';
import { rowCounts, sample2k, sampleDir, sampleMapping, uploadFile } from './helpers/holdouts';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

let t: TestApp;
let modeler: TestClient;
beforeAll(async () => {
  // A 1 MB upload limit, so the 413 test stays small.
  t = await buildTestApp({ config: { uploadLimitMb: 1 } });
  modeler = await signedInAs(t.app, 'modeler');
});
afterAll(async () => {
  await t.close();
});

const uploadsLeft = () => readdirSync(join(t.directory, 'uploads'));

describe('uploading a holdout', () => {
  it('stores the file whole with its SHA-256 and answers with columns, a 20-row preview and a mapping guess', async () => {
    const bytes = sample2k();
    const response = await uploadFile(modeler, bytes, 'tallowmere-holdout-2025-sample-2k.csv');
    expect(response.status, JSON.stringify(response.body)).toBe(201);
    const holdout = holdoutSchema.parse(response.body);
    // SHA-256 of the bytes sent, by node:crypto on the whole buffer.
    expect(holdout.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(holdout).toMatchObject({ fileName: 'tallowmere-holdout-2025-sample-2k.csv', bytes: bytes.length, rowCount: 2000 });
    expect(holdout.columns.map((column) => column.name)).toEqual([
      'account_id',
      'application_month',
      'product',
      'channel',
      'product_channel',
      'loan_amount',
      'bad_12m',
      'champion_points',
      'challenger_points',
    ]);
    expect(holdout.columns.find((column) => column.name === 'channel')).toMatchObject({ kind: 'categorical', distinct: 3 });
    expect(holdout.preview).toHaveLength(20);
    // The first data line of the file, as text.
    expect(holdout.preview[0]).toEqual(['TCC-25-000001', '2025-05', 'credit-card', 'branch', 'credit-card/branch', '3900', '0', '622', '643']);
    expect(holdout.guess).toMatchObject({
      outcome: 'bad_12m',
      badValue: '1',
      champion: 'champion_points',
      challenger: 'challenger_points',
      higherIs: { champion: 'safer', challenger: 'safer' },
      id: 'account_id',
      exposure: 'loan_amount',
    });
    expect(holdout.uploadedBy.name).toBeTruthy();

    // The stored chunks are the file, byte for byte.
    const stored = await storedFile(databaseAddress(t.config), holdout.id);
    expect(stored.bytes.equals(bytes)).toBe(true);
    const event = await t.dataSource.getRepository(AuditEvent).findOneByOrFail({ action: 'holdout.uploaded', targetId: String(holdout.id) });
    expect(JSON.parse(event.details)).toMatchObject({ sha256: holdout.sha256, rowCount: 2000, bytes: bytes.length });
    expect(uploadsLeft()).toEqual([]);

    const again = await modeler.get(`/api/holdouts/${holdout.id}`);
    expect(again.status).toBe(200);
    expect(again.body).toEqual(response.body);
  });

  it('keeps only a sanitised file name, never a path, and names the stored holdout by its id', async () => {
    const response = await uploadFile(modeler, 'bad,champion,challenger\n0,600,0.1\n1,550,0.4\n', '../../etc/\u202Eexe.csv');
    expect(response.status).toBe(201);
    expect(response.body.fileName).toBe('exe.csv');
    const windows = await uploadFile(modeler, 'bad,champion,challenger\n0,600,0.1\n1,550,0.4\n', '..\\..\\Users\\x\\holdout 2025.csv');
    expect(windows.body.fileName).toBe('holdout 2025.csv');
    expect(uploadsLeft()).toEqual([]);
  });

  it('answers a malformed multipart body with 400, not 500', async () => {
    // A control character in the part header: busboy refuses the header.
    const response = await uploadFile(modeler, 'bad,champion,challenger\n0,600,0.1\n', 'a\u0007b.csv');
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe('bad_input');
    expect(uploadsLeft()).toEqual([]);
  });

  it('completes five uploads sent at once', async () => {
    const bytes = sample2k();
    const responses = await Promise.all(Array.from({ length: 5 }, (_, i) => uploadFile(modeler, bytes, `copy-${i}.csv`)));
    expect(responses.map((response) => response.status)).toEqual([201, 201, 201, 201, 201]);
    expect(new Set(responses.map((response) => response.body.id)).size).toBe(5);
    for (const response of responses) expect(response.body).toMatchObject({ rowCount: 2000, bytes: bytes.length });
    expect(uploadsLeft()).toEqual([]);
  });
});

describe('the preview', () => {
  it('cuts long cells to 200 characters and keeps the whole preview within 64 KB (a file of 200 KB fields)', async () => {
    // 21 rows of five 100,000-character fields (200 KB each in UTF-8, longer than a read chunk):
    // 20 MB of preview before the bound.
    const field = (row: number, column: number) => `${row}-${column}-${'ü'.repeat(100_000)}`;
    const lines = ['id,a,b,c,d', ...Array.from({ length: 21 }, (_, row) => Array.from({ length: 5 }, (_, column) => field(row, column)).join(','))];
    const limited = await buildTestApp({ config: { uploadLimitMb: 64 } });
    try {
      const uploader = await signedInAs(limited.app, 'modeler');
      const response = await uploadFile(uploader, lines.join('\n') + '\n', 'wide.csv');
      expect(response.status, JSON.stringify(response.body).slice(0, 300)).toBe(201);
      const holdout = holdoutSchema.parse(response.body);
      const bytes = Buffer.byteLength(JSON.stringify(holdout.preview));
      const unbounded = Buffer.byteLength(JSON.stringify(lines.slice(1, 21).map((line) => line.split(','))));
      expect(bytes).toBeLessThanOrEqual(64 * 1024);
      expect(holdout.preview.length).toBeGreaterThan(0);
      for (const row of holdout.preview) {
        expect(row).toHaveLength(5);
        for (const cell of row) expect(cell.length).toBeLessThanOrEqual(200);
      }
      expect(holdout.preview[0][0]).toMatch(/^0-0-ü+…$/);
      // What is stored is bounded too, not only the answer.
      const bytesSql = onPostgres ? 'OCTET_LENGTH("preview")' : 'LENGTH(CAST("preview" AS BLOB))';
      const [stored] = await rawQuery<{ n: number }>(limited.dataSource, `SELECT ${bytesSql} AS n FROM "holdouts" WHERE "id" = ?`, [holdout.id]);
      console.log(`[preview] a file of 100,000-character (200 KB) fields: ${unbounded} bytes in its first 20 rows; preview stored ${stored.n} bytes, answered ${bytes} bytes in ${holdout.preview.length} rows`);
      expect(stored.n).toBeLessThanOrEqual(64 * 1024);
    } finally {
      await limited.close();
    }
  });

  it('shows the rows to modeler and analyst; other roles see the column names and kinds only', async () => {
    const uploaded = holdoutSchema.parse((await uploadFile(modeler, sample2k(), 'roles.csv')).body);
    for (const role of ['analyst'] as const) {
      const seen = holdoutSchema.parse((await (await signedInAs(t.app, role)).get(`/api/holdouts/${uploaded.id}`)).body);
      expect(seen.preview, role).toHaveLength(20);
      expect(seen.previewWithheld).toBeUndefined();
    }
    for (const role of ['policy', 'committee', 'admin'] as const) {
      const response = await (await signedInAs(t.app, role)).get(`/api/holdouts/${uploaded.id}`);
      expect(response.status, role).toBe(200);
      const seen = holdoutSchema.parse(response.body);
      expect(seen.preview, role).toEqual([]);
      expect(seen.previewWithheld, role).toBe(true);
      expect(seen.columns.map((column) => column.name)).toEqual(uploaded.columns.map((column) => column.name));
      expect(JSON.stringify(response.body)).not.toContain('TCC-25-000001');
    }
  });
});

describe('refused uploads leave nothing behind', () => {
  // Each case: the bytes, and what the 400 must name (the file's line number, header = line 1).
  const cases: { name: string; bytes: Buffer; row: number | null; message: RegExp }[] = [
    { name: 'an empty file', bytes: Buffer.alloc(0), row: null, message: /empty/ },
    { name: 'a header and no rows', bytes: Buffer.from('bad,champion,challenger\n'), row: null, message: /no data rows/ },
    { name: 'binary garbage', bytes: Buffer.from([0x00, 0xff, 0x13, 0x37, 0x00, 0x9f, 0x80, 0x81, 0x00, 0x00]), row: null, message: /binary|UTF-8/ },
    { name: 'a ZIP archive (a workbook)', bytes: Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00]), row: null, message: /ZIP/ },
    { name: 'a repeated column', bytes: Buffer.from('bad,champion,champion\n0,600,0.1\n1,550,0.4\n'), row: 1, message: /"champion" appears more than once/ },
  ];
  for (const bad of cases) {
    it(`refuses ${bad.name} with a 400 that says where`, async () => {
      const before = await rowCounts(t.dataSource);
      const response = await uploadFile(modeler, bad.bytes, 'bad.csv');
      expect(response.status, JSON.stringify(response.body)).toBe(400);
      expect(response.body.error.code).toBe('bad_input');
      expect(response.body.error.message).toMatch(bad.message);
      expect(response.body.error.details.row).toBe(bad.row);
      expect(await rowCounts(t.dataSource)).toEqual(before);
      expect(uploadsLeft()).toEqual([]);
    });
  }

  it('refuses a file over UPLOAD_LIMIT_MB with 413 in the error shape, and removes the partial file', async () => {
    const before = await rowCounts(t.dataSource);
    const line = '0,600,0.1\n';
    const big = Buffer.from('bad,champion,challenger\n' + line.repeat(Math.ceil((1.2 * 1024 * 1024) / line.length)));
    const response = await uploadFile(modeler, big, 'big.csv');
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe('payload_too_large');
    expect(await rowCounts(t.dataSource)).toEqual(before);
    expect(uploadsLeft()).toEqual([]);
  });

  it('refuses a request without the file field, and other roles', async () => {
    const empty = await modeler.post('/api/holdouts', {});
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toMatch(/field "file"/);

    const analyst = await signedInAs(t.app, 'analyst');
    const before = await rowCounts(t.dataSource);
    const refused = await uploadFile(analyst, sample2k(), 'x.csv');
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('forbidden');
    expect(await rowCounts(t.dataSource)).toEqual(before);
    expect(uploadsLeft()).toEqual([]);
  });
});

describe('validating a mapping', () => {
  it('lists the problems of the broken demo file, each with its line and column', async () => {
    // sample-data/README.md: text in a score, "#VALUE!" (line 13), an outcome of 2 (line 58), a short row
    // (line 102), an empty score (line 151). The upload takes the file (the scan counts a short
    // row and leaves it to this report); the mapping finds all four.
    const upload = await uploadFile(modeler, readFileSync(join(sampleDir, 'tallowmere-holdout-broken.csv')), 'broken.csv');
    expect(upload.status, JSON.stringify(upload.body)).toBe(201);
    expect(upload.body.rowCount).toBe(200);
    const response = await modeler.post(`/api/holdouts/${upload.body.id}/validate`, { mapping: sampleMapping });
    expect(response.status).toBe(200);
    const report = validationReportSchema.parse(response.body);
    expect(report.ok).toBe(false);
    expect(report.summary).toBeNull();
    expect(report.errors.map((error) => [error.row, error.column])).toEqual([
      [13, 'challenger_points'],
      [58, 'bad_12m'],
      [102, null],
      [151, 'champion_points'],
    ]);
    for (const error of report.errors) expect(error.message).toMatch(new RegExp(`^row ${error.row}`));
    expect(report.errors[2].message).toBe('row 102 has 7 fields, the header has 9');
  });

  it('refuses repeated segment columns, or more than 10, at once (bounded work)', async () => {
    const upload = await uploadFile(modeler, sample2k(), 'segments.csv');
    const started = performance.now();
    const repeated = await modeler.post(`/api/holdouts/${upload.body.id}/validate`, { mapping: { ...sampleMapping, segments: Array.from({ length: 100_000 }, () => 'channel') } });
    const repeatedMs = performance.now() - started;
    expect(repeated.status).toBe(400);
    expect(repeated.body.error.message).toBe('mapping.segments: at most 10 segment columns');
    const twice = await modeler.post(`/api/holdouts/${upload.body.id}/validate`, { mapping: { ...sampleMapping, segments: ['channel', 'product', 'channel'] } });
    expect(twice.status).toBe(400);
    expect(twice.body.error.message).toBe('mapping.segments: name each segment column at most once');
    const created = await modeler.post('/api/comparisons', { name: 'Repeated segments', holdoutId: upload.body.id, mapping: { ...sampleMapping, segments: ['channel', 'channel'] } });
    expect(created.status).toBe(400);
    // Before the bound, 100,000 repeated columns took minutes to check on 2,000 rows.
    console.log(`[segments] 100,000 repeated segment columns refused in ${Math.round(repeatedMs)} ms`);
    expect(repeatedMs).toBeLessThan(20_000);
  });

  it('summarises a good mapping: rows, goods, bads, bad rate', async () => {
    const upload = await uploadFile(modeler, sample2k(), 's.csv');
    const response = await modeler.post(`/api/holdouts/${upload.body.id}/validate`, { mapping: sampleMapping });
    const report = validationReportSchema.parse(response.body);
    expect(report.ok).toBe(true);
    // 150 bads in the 2,000-row sample (counted by the reader; the same count the report gives).
    expect(report.summary).toMatchObject({ rows: 2000, rowsUsed: 2000, bads: 150, goods: 1850, badRate: 0.075 });
  });
});

import { createHash, randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, testDatabaseUrl, type TestDatabase } from '../setup/test-database';
import { Client, holdoutCsv, type Proc, start, stopAll } from './processes';

/**
 * Servers killed in the middle of an upload (holdouts/staged-uploads.ts), as separate processes
 * started from dist/ on one PostgreSQL database and one shared UPLOAD_DIR:
 * - killed (SIGKILL) while the large file is still being received: the client gets no answer,
 *   and nothing of the file is stored by anyone (no holdout, no staged record; the half-received
 *   file waits in the folder for the start-up clean-up of abandoned files);
 * - killed after the file was received in full and recorded as staged, before it was stored:
 *   the client gets no answer, and once the dead server's claim has run out the surviving server
 *   stores it, exactly once, for the person who sent it (the audit event says it was resumed), and
 *   removes the record and the file.
 * The claim is UPLOAD_CLAIM_SECONDS (here 6 s; 300 by default) so that the take-over is seen in
 * seconds. The large file has UPLOAD_KILL_ROWS accounts (default 1,000,000, about 19 MB).
 */

const rows = Number(process.env.UPLOAD_KILL_ROWS ?? 1_000_000);
const claimSeconds = 6;
const password = 'upload-kill-password-1';

let directory: string;
let uploadDir: string;
let database: TestDatabase;
let db: pg.Client;
const servers: (Proc & { base: string })[] = [];

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function startServer(): Promise<Proc & { base: string }> {
  const server = await start(
    'dist/server/index.js',
    {
      DATABASE_URL: database.address,
      DATABASE_PATH: join(directory, 'unused.sqlite'),
      UPLOAD_DIR: uploadDir,
      UPLOAD_CLAIM_SECONDS: String(claimSeconds),
      SESSION_SECRET: 'upload-kill-session-secret-that-is-long-enough',
      BCRYPT_COST: '4',
      LOG_LEVEL: 'info',
      NODE_ENV: 'development',
      PORT: '0',
      HOST: '127.0.0.1',
      SERVE_CLIENT: 'false',
      DEMO_SCENARIO: 'false',
      ANALYSIS_IN_SERVER: 'false',
    },
    /running at http:\/\/localhost:(\d+)/,
  );
  // (Not spread into a new object: `output` is a getter that keeps reading what the process says.)
  const started = Object.assign(server, { base: `http://127.0.0.1:${server.match[1]}` });
  servers.push(started);
  return started;
}

async function kill(server: Proc): Promise<void> {
  const exited = new Promise((resolve) => server.child.once('exit', resolve));
  server.child.kill('SIGKILL');
  await exited;
}

const count = async (sql: string, parameters: unknown[] = []) => ((await db.query(sql, parameters)).rows[0] as { n: number }).n;

describe.runIf(testDatabaseUrl)(`a server killed in the middle of an upload (${rows.toLocaleString('en')} accounts), another sharing its database and upload folder`, () => {
  beforeAll(async () => {
    directory = mkdtempSync(join(tmpdir(), 'scorecourt-upload-kill-'));
    uploadDir = join(directory, 'shared-uploads');
    mkdirSync(uploadDir);
    database = await createTestDatabase(directory);
    // The first server migrates and adds the demo people; the second finds them.
    await startServer();
    await startServer();
    db = new pg.Client({ connectionString: database.address });
    await db.connect();
  }, 300_000);

  afterAll(async () => {
    await db?.end();
    await stopAll(servers);
    await database?.drop();
    if (directory) rmSync(directory, { recursive: true, force: true });
  }, 120_000);

  it('stores nothing of a file cut off mid-way; a file received in full is stored once, for its sender, by the other server', async () => {
    const [receiving, surviving] = servers;
    try {
      const { hashPassword } = await import('../../server/auth/password');
      await db.query(`UPDATE "users" SET "passwordHash" = $1, "active" = true WHERE "email" IN ('modeler@tallowmere.test', 'admin@tallowmere.test')`, [
        await hashPassword(password, 4),
      ]);
      const modelerId = await count(`SELECT "id" AS n FROM "users" WHERE "email" = 'modeler@tallowmere.test'`);
      const modeler = new Client(receiving.base);
      expect((await modeler.send('POST', '/api/auth/login', { email: 'modeler@tallowmere.test', password })).status).toBe(200);
      // The same person on another server: sessions are shared.
      const on = (server: { base: string }) => Object.assign(new Client(server.base), { cookie: modeler.cookie, csrf: modeler.csrf });
      const csv = holdoutCsv(rows, 23);
      const sha256 = createHash('sha256').update(csv).digest('hex');

      // 1. Killed while receiving: half the file sent, the rest held back until the server is gone.
      const boundary = `scorecourt-${randomBytes(8).toString('hex')}`;
      const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="cut-off.csv"\r\nContent-Type: text/csv\r\n\r\n`);
      const half = Math.floor(csv.length / 2);
      let release!: () => void;
      const released = new Promise<void>((resolve) => (release = resolve));
      const body = new ReadableStream<Uint8Array>({
        async start(controller) {
          controller.enqueue(new Uint8Array(head));
          for (let at = 0; at < half; at += 1 << 20) controller.enqueue(new Uint8Array(csv.subarray(at, Math.min(half, at + (1 << 20)))));
          await released;
          try {
            controller.enqueue(new Uint8Array(csv.subarray(half)));
            controller.enqueue(new Uint8Array(Buffer.from(`\r\n--${boundary}--\r\n`)));
            controller.close();
          } catch {
            // The request was aborted with the server: nothing left to send to.
          }
        },
      });
      const cutOff = fetch(`${receiving.base}/api/holdouts`, {
        method: 'POST',
        headers: { Cookie: modeler.cookie, 'X-CSRF-Token': modeler.csrf, 'Content-Type': `multipart/form-data; boundary=${boundary}` },
        body,
        duplex: 'half',
        signal: AbortSignal.timeout(300_000),
      } as RequestInit).then(
        (response) => `answered ${response.status}`,
        (error: unknown) => `no answer (${error instanceof Error ? error.message : String(error)})`,
      );
      // Wait until the receiving server has written most of the sent half into the upload folder.
      const received = () => readdirSync(uploadDir).map((name) => ({ name, bytes: statSync(join(uploadDir, name)).size }));
      for (const deadline = Date.now() + 120_000; !received().some((file) => file.bytes >= half * 0.9); ) {
        if (Date.now() > deadline) throw new Error(`the receiving server did not write the first half of the file: ${JSON.stringify(received())}`);
        await sleep(20);
      }
      await kill(receiving);
      release();
      expect(await cutOff).toMatch(/^no answer/);
      const [halfFile] = received();
      expect(halfFile.bytes).toBeLessThan(csv.length);
      expect(await count(`SELECT COUNT(*)::int AS n FROM "staged_uploads"`)).toBe(0);
      expect(await count(`SELECT COUNT(*)::int AS n FROM "holdouts"`)).toBe(0);

      // 2. Killed after the file was received in full and staged, before it was stored.
      const another = await startServer();
      const form = new FormData();
      form.append('file', new Blob([new Uint8Array(csv)]), 'month-end.csv');
      const uploading = on(another)
        .send('POST', '/api/holdouts', form)
        .then(
          (response) => `answered ${response.status}`,
          (error: unknown) => `no answer (${error instanceof Error ? error.message : String(error)})`,
        );
      let staged: { id: number; file: string } | undefined;
      for (const deadline = Date.now() + 300_000; !staged; ) {
        [staged] = (await db.query(`SELECT "id", "file" FROM "staged_uploads"`)).rows as { id: number; file: string }[];
        if (!staged && Date.now() > deadline) throw new Error('the upload was never staged');
        if (!staged) await sleep(5);
      }
      await kill(another);
      expect(await uploading).toMatch(/^no answer/);
      // The storing transaction removes the record: it is still there, so the killed server stored nothing.
      expect(await count(`SELECT COUNT(*)::int AS n FROM "staged_uploads" WHERE "id" = $1`, [staged.id]), 'killed before it stored the file').toBe(1);
      expect(await count(`SELECT COUNT(*)::int AS n FROM "holdouts"`)).toBe(0);
      expect(existsSync(join(uploadDir, staged.file))).toBe(true);

      // The surviving server takes it over once the claim has run out, and stores it once.
      for (const deadline = Date.now() + 600_000; (await count(`SELECT COUNT(*)::int AS n FROM "staged_uploads"`)) > 0; ) {
        if (Date.now() > deadline) throw new Error('the staged upload was not finished by the other server');
        await sleep(250);
      }
      const holdouts = (await db.query(`SELECT "id", "fileName", "sha256", "uploadedById", "rowCount" FROM "holdouts"`)).rows as {
        id: number;
        fileName: string;
        sha256: string;
        uploadedById: number;
        rowCount: number;
      }[];
      expect(holdouts).toHaveLength(1);
      expect(holdouts[0]).toMatchObject({ fileName: 'month-end.csv', sha256, uploadedById: modelerId, rowCount: rows });
      // Its log says so (the line may still be in the pipe when the record is gone).
      const said = new RegExp(`staged upload ${staged.id} \\(month-end\\.csv\\), left by an instance that stopped: stored as holdout ${holdouts[0].id}`);
      for (const deadline = Date.now() + 30_000; !said.test(surviving.output) && Date.now() < deadline; ) await sleep(100);
      expect(surviving.output).toMatch(said);
      const events = (await db.query(`SELECT "actorId", "details" FROM "audit_events" WHERE "action" = 'holdout.uploaded'`)).rows as { actorId: number; details: string }[];
      expect(events).toHaveLength(1);
      expect(events[0].actorId).toBe(modelerId);
      expect(JSON.parse(events[0].details)).toMatchObject({ resumedByAnotherInstance: true, rowCount: rows });
      // Its file is gone; what is left in the folder is the half-received file of the first kill, unrecorded.
      expect(readdirSync(uploadDir)).toEqual([halfFile.name]);
      // The sender sees it through the surviving server.
      const shown = await on(surviving).get(`/api/holdouts/${holdouts[0].id}`);
      expect(shown.status).toBe(200);
      expect(((await shown.json()) as { rowCount: number }).rowCount).toBe(rows);

      // The audit chain verifies (as an administrator, through the surviving server).
      const admin = new Client(surviving.base);
      expect((await admin.send('POST', '/api/auth/login', { email: 'admin@tallowmere.test', password })).status).toBe(200);
      const verifying = await admin.send('POST', '/api/audit/verify');
      const verified = await verifying.text();
      expect(verifying.status, verified).toBe(200);
      expect((JSON.parse(verified) as { ok: boolean }).ok, verified).toBe(true);
    } catch (error) {
      const tails = servers.map((proc, i) => `--- server ${i} (exit ${proc.child.exitCode ?? proc.child.signalCode ?? 'running'}):\n${proc.output.slice(-3000)}`);
      throw new Error(`${error instanceof Error ? error.message : String(error)}\n${tails.join('\n')}`, { cause: error });
    }
  });
});

import { SMTPServer } from 'smtp-server';
import type { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '@server/log';
import { outboxIdHeader } from '@server/mail/mailer';
import { createMailTransport } from '@server/mail/transport';
import { buildTestApp, type TestApp } from '../api/helpers/app';
import { signedInAs, TestClient } from '../api/helpers/client';
import { sample2k, sampleMapping, uploadFile } from '../api/helpers/holdouts';
import { freePort } from '../e2e/helpers/server';
import { record } from './helpers/figures';

/**
 * SMTP unreachable: SMTP_URL points at a loopback port where nothing listens (the transport is
 * made by the server's own createMailTransport from that URL). The whole workflow — analysis,
 * submission, review, vote, decision — still completes; every e-mail it causes is kept in the
 * outbox as queued, with its attempts and the connection error, and retried. Then an SMTP server
 * starts on that port, and every message is delivered exactly once and shown as sent. Retries
 * here start at 250 ms (production: 30 s) so the test stays short; the schedule is the mailer's.
 */

let t: TestApp;
let port: number;
let smtp: SMTPServer | null = null;
const received: { id: number; to: string[] }[] = [];
let modeler: TestClient;
let analyst: TestClient;
let committee: TestClient;
let admin: TestClient;

beforeAll(async () => {
  port = await freePort();
  const log = createLogger('silent');
  // createMailTransport needs the database only for the local sink, which a set SMTP_URL replaces.
  const mail = await createMailTransport({ smtpUrl: `smtp://127.0.0.1:${port}` }, undefined as unknown as DataSource, log);
  expect(mail.sink).toBeNull();
  t = await buildTestApp({ transport: mail.transport, mailer: { retryBaseMs: 250, retryMaxMs: 1000, maxAttempts: 30, pollMs: 100 } });
  await t.mailer.start();
  [modeler, analyst, committee, admin] = await Promise.all((['modeler', 'analyst', 'committee', 'admin'] as const).map((role) => signedInAs(t.app, role)));
}, 60_000);
afterAll(async () => {
  await t?.close();
  if (smtp) await new Promise<void>((resolve) => smtp!.close(() => resolve()));
});

type OutboxMessage = { id: number; to: string[]; subject: string; status: string; attempts: number; lastError: string | null };
const outbox = async () => (await admin.get('/api/outbox?pageSize=200')).body as { messages: OutboxMessage[]; total: number };

async function waitFor<T>(what: string, read: () => Promise<T>, done: (value: T) => boolean, ms = 20_000): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const value = await read();
    if (done(value)) return value;
    if (Date.now() > deadline) throw new Error(`${what} not within ${ms} ms: ${JSON.stringify(value).slice(0, 1500)}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
}

function startSmtp(): Promise<SMTPServer> {
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      let raw = '';
      stream.on('data', (chunk: Buffer) => (raw += chunk.toString()));
      stream.on('end', () => {
        const match = new RegExp(`^${outboxIdHeader}: (\\d+)`, 'im').exec(raw);
        received.push({ id: match ? Number(match[1]) : -1, to: session.envelope.rcptTo.map((rcpt) => rcpt.address) });
        callback();
      });
    },
  });
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve(server));
  });
}

describe('SMTP unreachable', () => {
  it('completes the workflow, keeps every e-mail queued with its error and retries it, then delivers each once SMTP is back', async () => {
    const upload = await uploadFile(modeler, sample2k(), 'sample-2k.csv');
    expect(upload.status).toBe(201);
    const created = await modeler.post('/api/comparisons', { name: 'Mail down', holdoutId: upload.body.id, mapping: sampleMapping, settings: { bootstrap: 0 } });
    expect(created.status).toBe(201);
    const id = created.body.id as number;
    await t.jobs.whenIdle();
    expect((await modeler.get(`/api/comparisons/${id}`)).body.state).toBe('analysed');
    expect((await modeler.post(`/api/comparisons/${id}/submit`, { message: 'Ready.' })).status).toBe(200);
    expect((await analyst.post(`/api/comparisons/${id}/review`, { outcome: 'validated', findings: 'Fine.' })).status).toBe(200);
    expect((await committee.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: '' })).status).toBe(200);
    // The default quorum is two votes: the demo's second committee member votes too.
    const committee2 = new TestClient(t.app);
    expect((await committee2.signIn('committee2@tallowmere.test')).status).toBe(200);
    expect((await committee2.post(`/api/comparisons/${id}/votes`, { vote: 'adopt', comment: '' })).status).toBe(200);
    const decided = await committee.post(`/api/comparisons/${id}/decision`, { outcome: 'adopt', rationale: 'Better ranking, acceptable swap sets.' });
    expect(decided.status, JSON.stringify(decided.body)).toBe(200);
    expect((await modeler.get(`/api/comparisons/${id}`)).body.state).toBe('decided');
    // An invitation too: people are told later, not never.
    expect((await admin.post('/api/users/invitations', { email: 'later@tallowmere.test', name: 'Later Person', roles: ['policy'] })).status).toBe(201);

    // Every message is kept, queued, with its error, and tried more than once while SMTP is down.
    const down = await waitFor('every message retried', outbox, ({ messages }) => messages.length >= 5 && messages.every((m) => m.attempts >= 2));
    for (const message of down.messages) {
      expect(message.status).toBe('queued');
      expect(message.lastError).toMatch(/ECONNREFUSED/);
    }
    const subjects = down.messages.map((message) => message.subject);
    expect(subjects.some((subject) => subject.startsWith('Ready for review'))).toBe(true);
    expect(received).toEqual([]);

    smtp = await startSmtp();
    const up = await waitFor('every message sent', outbox, ({ messages }) => messages.every((m) => m.status === 'sent'));
    await waitFor('the SMTP server to have them all', async () => received.length, (n) => n >= up.messages.length);
    const ids = received.map((message) => message.id).sort((a, b) => a - b);
    expect(ids).toEqual(up.messages.map((message) => message.id).sort((a, b) => a - b));
    for (const message of up.messages) {
      expect(message.lastError).toBeNull();
      expect(received.find((got) => got.id === message.id)!.to).toEqual(message.to);
    }
    record('faults: SMTP unreachable', {
      messages: up.messages.length,
      attemptsWhileDown: down.messages.map((m) => m.attempts),
      deliveredOnce: ids.length === new Set(ids).size,
      finalState: 'decided',
    });
  });
});

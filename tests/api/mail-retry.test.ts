import nodemailer, { type Transport } from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MailMessage } from '@server/db/entities/index';
import { Mailer } from '@server/mail/mailer';
import { createLogger } from '@server/log';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs } from './helpers/client';

/**
 * SMTP unreachable: the change still happens, the message stays queued with its error and is
 * retried with backoff until it goes through, or is marked failed after the last attempt.
 */

let t: TestApp;
let unreachable = true;
beforeAll(async () => {
  // A transport that fails while `unreachable` is set, then hands over to the real sink over SMTP.
  const holder: { sink?: TestApp['sink'] } = {};
  const flakyTransport: Transport<SMTPTransport.SentMessageInfo> = {
    name: 'flaky',
    version: '1',
    send(mail, callback) {
      if (unreachable || !holder.sink) {
        callback(new Error('connect ECONNREFUSED 127.0.0.1:2525'), undefined as unknown as SMTPTransport.SentMessageInfo);
        return;
      }
      const real = nodemailer.createTransport({ host: holder.sink.host, port: holder.sink.port, secure: false, ignoreTLS: true });
      real.sendMail(mail.data).then(
        (info) => callback(null, info),
        (error: Error) => callback(error, undefined as unknown as SMTPTransport.SentMessageInfo),
      );
    },
  };
  const flaky = nodemailer.createTransport(flakyTransport);
  t = await buildTestApp({ transport: flaky, mailer: { retryBaseMs: 40, retryMaxMs: 200, maxAttempts: 3 } });
  holder.sink = t.sink;
});
afterAll(async () => {
  await t.close();
});

async function waitFor<T>(read: () => Promise<T>, done: (value: T) => boolean, ms = 5000): Promise<T> {
  const deadline = Date.now() + ms;
  for (;;) {
    const value = await read();
    if (done(value)) return value;
    if (Date.now() > deadline) throw new Error(`condition not met within ${ms} ms: ${JSON.stringify(value)}`);
    await new Promise((resolve) => setTimeout(resolve, 25));
  }
}

describe('mail retry', () => {
  it('keeps a failed message queued with its error, then delivers it on a later attempt', async () => {
    const admin = await signedInAs(t.app, 'admin');
    const response = await admin.post('/api/users/invitations', { email: 'retry@tallowmere.test', name: 'Retry Person', roles: ['policy'] });
    expect(response.status).toBe(201); // the invitation exists although mail is down

    const repository = t.dataSource.getRepository(MailMessage);
    const failedOnce = await waitFor(
      () => repository.findOneByOrFail({ subject: 'You have been invited to Scorecourt' }),
      (message) => message.attempts >= 1,
    );
    expect(failedOnce.status).toBe('queued');
    expect(failedOnce.lastError).toContain('ECONNREFUSED');
    expect(failedOnce.nextAttemptAt!.getTime()).toBeGreaterThan(failedOnce.createdAt.getTime());

    const outbox = await admin.get('/api/outbox').expect(200);
    expect(outbox.body.messages[0]).toMatchObject({ status: 'queued', lastError: expect.stringContaining('ECONNREFUSED') });

    unreachable = false;
    const sent = await waitFor(
      async () => {
        await t.mailer.deliverDue();
        return repository.findOneByOrFail({ id: failedOnce.id });
      },
      (message) => message.status === 'sent' && message.receivedAt !== null,
    );
    expect(sent.attempts).toBeGreaterThanOrEqual(2);
    expect(sent.lastError).toBeNull();
    expect(sent.receivedText).toContain('/accept/');
  });

  it('marks a message failed after the last attempt', async () => {
    unreachable = true;
    const message = await t.mailer.send({ to: 'never@tallowmere.test', subject: 'Test', text: 'Body' });
    const repository = t.dataSource.getRepository(MailMessage);
    const failed = await waitFor(
      async () => {
        await t.mailer.deliverDue();
        return repository.findOneByOrFail({ id: message.id });
      },
      (row) => row.status !== 'queued',
    );
    expect(failed).toMatchObject({ status: 'failed', attempts: 3, nextAttemptAt: null });
  });

  it('retries at start what a previous run left queued', async () => {
    const repository = t.dataSource.getRepository(MailMessage);
    const later = new Date(Date.now() + 3_600_000);
    const left = await repository.save(
      repository.create({ to: ['left@tallowmere.test'], subject: 'Left over', text: 'From before the restart', status: 'queued', attempts: 1, nextAttemptAt: later, createdAt: new Date() }),
    );
    unreachable = false;
    const transport = nodemailer.createTransport({ host: t.sink.host, port: t.sink.port, secure: false, ignoreTLS: true });
    const restarted = new Mailer(t.dataSource, transport, { from: t.config.mailFrom, log: createLogger('silent'), pollMs: 60_000 });
    await restarted.start();
    const sent = await waitFor(() => repository.findOneByOrFail({ id: left.id }), (row) => row.status === 'sent' && row.receivedAt !== null);
    expect(sent.attempts).toBe(2);
    await restarted.stop();
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { outboxResponseSchema } from '@shared/users';
import { buildTestApp, type TestApp } from './helpers/app';
import { signedInAs, TestClient } from './helpers/client';

/**
 * One-time links in the outbox: withheld when mail goes to a real SMTP server (SMTP_URL set), so an
 * administrator cannot take over a colleague's account by requesting a reset and reading the link;
 * shown, and marked, with the local sink. Every read of the outbox is audited.
 */

const apps: TestApp[] = [];
afterAll(async () => {
  for (const app of apps) await app.close();
});

async function resetThenRead(smtpUrl: string | undefined) {
  const t = await buildTestApp({ config: { smtpUrl } });
  apps.push(t);
  const anonymous = new TestClient(t.app);
  expect((await anonymous.post('/api/auth/password-reset', { email: 'analyst@tallowmere.test' })).status).toBe(202);
  const mail = await t.deliveredMail({ to: 'analyst@tallowmere.test' });
  expect(mail.text).toMatch(/\/accept\/[\w-]{43}/);
  const admin = await signedInAs(t.app, 'admin');
  const response = await admin.get('/api/outbox');
  expect(response.status).toBe(200);
  const outbox = outboxResponseSchema.parse(response.body);
  const reset = outbox.messages.find((message) => message.id === mail.id)!;
  const events = (await t.dataSource.query(`SELECT "details" FROM "audit_events" WHERE "action" = 'outbox.read'`)) as { details: string }[];
  return { outbox, reset, stored: mail.text, events: events.map((event) => JSON.parse(event.details) as { messageIds: number[]; linksShown: boolean }) };
}

describe('one-time links in the outbox', () => {
  let real: Awaited<ReturnType<typeof resetThenRead>>;
  let sink: Awaited<ReturnType<typeof resetThenRead>>;
  beforeAll(async () => {
    real = await resetThenRead('smtp://mail.tallowmere.test:587');
    sink = await resetThenRead(undefined);
  });

  it('are withheld when mail goes to a real SMTP server; the e-mail keeps them', () => {
    const token = /\/accept\/([\w-]{43})/.exec(real.stored)![1];
    expect(real.reset.oneTimeLinks).toBe('withheld');
    expect(real.reset.text).not.toContain(token);
    expect(real.reset.text).toMatch(/one-time link withheld/);
    expect(real.outbox.localSink).toBe(false);
  });

  it('are shown, and marked, with the local sink', () => {
    expect(sink.reset.oneTimeLinks).toBe('shown');
    expect(sink.reset.text).toBe(sink.stored);
    expect(sink.outbox.localSink).toBe(true);
  });

  it('every read of the outbox is in the audit trail, with the messages shown', () => {
    expect(real.events).toHaveLength(1);
    expect(real.events[0].messageIds).toContain(real.reset.id);
    expect(real.events[0].linksShown).toBe(false);
    expect(sink.events[0].linksShown).toBe(true);
  });
});

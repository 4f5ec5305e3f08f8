import { outboxResponseSchema, tokenInfoSchema, usersResponseSchema } from '@shared/users';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent, MailMessage, OneTimeToken, Session, User } from '@server/db/entities/index';
import { hashToken } from '@server/auth/tokens';
import { buildTestApp, type TestApp } from './helpers/app';
import type { AppContext } from '@server/context';
import type { AppError } from '@server/errors';
import { updateUser } from '@server/users/service';
import { TestClient, signedInAs } from './helpers/client';
import { lastOutboxId } from './helpers/governance';

let t: TestApp;
let admin: TestClient;
beforeAll(async () => {
  t = await buildTestApp();
  admin = await signedInAs(t.app, 'admin');
});
afterAll(async () => {
  await t.close();
});

/** The one-time token in a link of the form PUBLIC_URL/accept/<token>, as the recipient received it. */
function tokenFrom(text: string): string {
  const match = /http:\/\/scorecourt\.test\/accept\/([A-Za-z0-9_-]{43})/.exec(text);
  if (!match) throw new Error(`no accept link in:\n${text}`);
  return match[1];
}

async function invite(email: string, name: string, roles: string[]) {
  const response = await admin.post('/api/users/invitations', { email, name, roles });
  expect(response.status, JSON.stringify(response.body)).toBe(201);
  return response.body.user as { id: number; active: boolean };
}

describe('invitations', () => {
  it('e-mails a one-time link over SMTP to the sink, and the link sets a password once only', async () => {
    const user = await invite('Ines.Ferreira@Tallowmere.test', 'Inês Ferreira', ['analyst', 'modeler', 'analyst']);
    expect(user.active).toBe(false);

    const mail = await t.deliveredMail({ to: 'ines.ferreira@tallowmere.test' });
    expect(mail.status).toBe('sent');
    expect(mail.subject).toMatch(/Scorecourt/);
    // What the sink parsed from the SMTP stream, not what we queued:
    expect(mail.envelopeTo).toEqual(['ines.ferreira@tallowmere.test']);
    expect(mail.receivedText).toContain('Inês Ferreira');
    expect(mail.receivedText).toContain('Modeler, Analyst (validation)');
    const token = tokenFrom(mail.receivedText!);

    // Only the hash is stored.
    const stored = await t.dataSource.getRepository(OneTimeToken).findOneByOrFail({ userId: user.id });
    expect(stored.tokenHash).toBe(hashToken(token));
    expect(stored.tokenHash).not.toContain(token);
    const days = (stored.expiresAt.getTime() - stored.createdAt.getTime()) / 86_400_000;
    expect(days).toBe(7);

    const invitee = new TestClient(t.app);
    const info = await invitee.get(`/api/auth/tokens/${token}`).expect(200);
    expect(tokenInfoSchema.parse(info.body)).toMatchObject({ purpose: 'invitation', email: 'ines.ferreira@tallowmere.test', name: 'Inês Ferreira' });

    const short = await invitee.post(`/api/auth/tokens/${token}/accept`, { password: 'short' });
    expect(short.status).toBe(400);

    const accepted = await invitee.post(`/api/auth/tokens/${token}/accept`, { password: 'a long enough password' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.user).toMatchObject({ active: true, roles: ['modeler', 'analyst'] });
    await invitee.get('/api/auth/me').expect(200);

    const again = await new TestClient(t.app).post(`/api/auth/tokens/${token}/accept`, { password: 'another long password' });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('link_used');
    await new TestClient(t.app).get(`/api/auth/tokens/${token}`).expect(410);

    expect((await new TestClient(t.app).signIn('ines.ferreira@tallowmere.test', 'a long enough password')).status).toBe(200);
    expect((await new TestClient(t.app).signIn('ines.ferreira@tallowmere.test', 'another long password')).status).toBe(401);
  });

  it('refuses an expired invitation link with 410', async () => {
    const user = await invite('late@tallowmere.test', 'Late Comer', ['policy']);
    const token = tokenFrom((await t.deliveredMail({ to: 'late@tallowmere.test' })).receivedText!);
    await t.dataSource.getRepository(OneTimeToken).update({ userId: user.id }, { expiresAt: new Date(Date.now() - 1000) });
    const response = await new TestClient(t.app).post(`/api/auth/tokens/${token}/accept`, { password: 'a long enough password' });
    expect(response.status).toBe(410);
    expect(response.body.error.code).toBe('link_expired');
    expect((await t.dataSource.getRepository(User).findOneByOrFail({ id: user.id })).active).toBe(false);
  });

  it('lets only one of two simultaneous uses of a link succeed', async () => {
    await invite('twice@tallowmere.test', 'Twice Clicked', ['analyst']);
    const token = tokenFrom((await t.deliveredMail({ to: 'twice@tallowmere.test' })).receivedText!);
    const [a, b] = await Promise.all([
      new TestClient(t.app).post(`/api/auth/tokens/${token}/accept`, { password: 'first long password' }),
      new TestClient(t.app).post(`/api/auth/tokens/${token}/accept`, { password: 'second long password' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 410]);
    const winner = a.status === 200 ? 'first long password' : 'second long password';
    expect((await new TestClient(t.app).signIn('twice@tallowmere.test', winner)).status).toBe(200);
  });

  it('answers an unknown link with 404', async () => {
    await new TestClient(t.app).get(`/api/auth/tokens/${'A'.repeat(43)}`).expect(404);
  });

  it('refuses a second account for the same e-mail with 409', async () => {
    const response = await admin.post('/api/users/invitations', { email: 'ADMIN@tallowmere.test', name: 'Again', roles: ['admin'] });
    expect(response.status).toBe(409);
    expect(response.body.error.code).toBe('conflict');
  });

  it('records the invitation in the audit trail in the same transaction', async () => {
    const events = await t.dataSource.getRepository(AuditEvent).find({ where: { action: 'user.invited' }, order: { id: 'ASC' } });
    expect(events.length).toBeGreaterThanOrEqual(2);
    expect(JSON.parse(events[0].details)).toMatchObject({ email: 'ines.ferreira@tallowmere.test', roles: ['modeler', 'analyst'] });
  });
});

describe('password reset', () => {
  it('answers 202 for known and unknown addresses, and only a known one gets mail', async () => {
    const before = await t.dataSource.getRepository(MailMessage).count();
    const unknown = await new TestClient(t.app).post('/api/auth/password-reset', { email: 'nobody@tallowmere.test' });
    expect(unknown.status).toBe(202);
    expect(unknown.body).toEqual({ ok: true });
    await t.mailer.whenIdle();
    expect(await t.dataSource.getRepository(MailMessage).count()).toBe(before);
  });

  it('sends a one-hour link that sets a new password and ends the old sessions', async () => {
    const elsewhere = await signedInAs(t.app, 'policy');
    const last = await lastOutboxId(t);
    const request = await new TestClient(t.app).post('/api/auth/password-reset', { email: 'policy@tallowmere.test' });
    expect(request.status).toBe(202);
    const mail = await t.deliveredMail({ to: 'policy@tallowmere.test', afterId: last });
    const token = tokenFrom(mail.receivedText!);
    const record = await t.dataSource.getRepository(OneTimeToken).findOneByOrFail({ tokenHash: hashToken(token) });
    expect(record.purpose).toBe('password-reset');
    expect(record.expiresAt.getTime() - record.createdAt.getTime()).toBe(60 * 60 * 1000);

    const person = new TestClient(t.app);
    const info = await person.get(`/api/auth/tokens/${token}`).expect(200);
    expect(info.body.purpose).toBe('password-reset');
    const accepted = await person.post(`/api/auth/tokens/${token}/accept`, { password: 'a brand new passphrase' });
    expect(accepted.status).toBe(200);

    await elsewhere.get('/api/auth/me').expect(401);
    await person.get('/api/auth/me').expect(200);
    expect((await new TestClient(t.app).signIn('policy@tallowmere.test')).status).toBe(401);
    expect((await new TestClient(t.app).signIn('policy@tallowmere.test', 'a brand new passphrase')).status).toBe(200);
    const reuse = await new TestClient(t.app).post(`/api/auth/tokens/${token}/accept`, { password: 'yet another passphrase' });
    expect(reuse.status).toBe(410);
  });

  it('retires an older reset link when a newer one is sent', async () => {
    const last = await lastOutboxId(t);
    await new TestClient(t.app).post('/api/auth/password-reset', { email: 'analyst@tallowmere.test' });
    const first = tokenFrom((await t.deliveredMail({ to: 'analyst@tallowmere.test', afterId: last })).receivedText!);
    const middle = await lastOutboxId(t);
    await new TestClient(t.app).post('/api/auth/password-reset', { email: 'analyst@tallowmere.test' });
    const second = tokenFrom((await t.deliveredMail({ to: 'analyst@tallowmere.test', afterId: middle })).receivedText!);
    await new TestClient(t.app).get(`/api/auth/tokens/${first}`).expect(410);
    await new TestClient(t.app).get(`/api/auth/tokens/${second}`).expect(200);
  });
});

describe('people (admin)', () => {
  it('lists everyone without password hashes', async () => {
    const response = await admin.get('/api/users').expect(200);
    const { users } = usersResponseSchema.parse(response.body);
    expect(users.map((user) => user.email)).toContain('committee2@tallowmere.test');
    expect(JSON.stringify(response.body)).not.toMatch(/passwordHash|\$2[aby]\$/);
  });

  it('changes roles and name, each with an audit event', async () => {
    const modeler = await t.dataSource.getRepository(User).findOneByOrFail({ email: 'modeler@tallowmere.test' });
    const response = await admin.patch(`/api/users/${modeler.id}`, { name: 'Priya N.', roles: ['policy', 'modeler'] });
    expect(response.status).toBe(200);
    expect(response.body.user).toMatchObject({ name: 'Priya N.', roles: ['modeler', 'policy'] });
    const actions = (await t.dataSource.getRepository(AuditEvent).find({ where: { targetId: String(modeler.id) } })).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['user.renamed', 'user.roles_changed']));
  });

  it('deactivating someone ends their session at once and they cannot sign in', async () => {
    const committee = await signedInAs(t.app, 'committee');
    await committee.get('/api/auth/me').expect(200);
    const person = await t.dataSource.getRepository(User).findOneByOrFail({ email: 'committee@tallowmere.test' });
    expect(await t.dataSource.getRepository(Session).countBy({ userId: person.id })).toBeGreaterThan(0);

    const response = await admin.patch(`/api/users/${person.id}`, { active: false });
    expect(response.status).toBe(200);
    expect(response.body.user.active).toBe(false);
    expect(await t.dataSource.getRepository(Session).countBy({ userId: person.id })).toBe(0);
    await committee.get('/api/auth/me').expect(401);
    expect((await new TestClient(t.app).signIn('committee@tallowmere.test')).status).toBe(403);

    const back = await admin.patch(`/api/users/${person.id}`, { active: true });
    expect(back.body.user.active).toBe(true);
    expect((await new TestClient(t.app).signIn('committee@tallowmere.test')).status).toBe(200);
    const actions = (await t.dataSource.getRepository(AuditEvent).find({ where: { targetId: String(person.id) } })).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['user.deactivated', 'user.reactivated']));
  });

  it('deactivating a pending invitee retires the link; reactivating sends a fresh invitation', async () => {
    const user = await invite('pending@tallowmere.test', 'Pending Person', ['analyst']);
    const firstToken = tokenFrom((await t.deliveredMail({ to: 'pending@tallowmere.test' })).receivedText!);
    await admin.patch(`/api/users/${user.id}`, { active: false });
    await new TestClient(t.app).get(`/api/auth/tokens/${firstToken}`).expect(410);
    const last = await lastOutboxId(t);
    await admin.patch(`/api/users/${user.id}`, { active: true });
    const secondToken = tokenFrom((await t.deliveredMail({ to: 'pending@tallowmere.test', afterId: last })).receivedText!);
    expect(secondToken).not.toBe(firstToken);
    await new TestClient(t.app).get(`/api/auth/tokens/${secondToken}`).expect(200);
  });

  it('an admin cannot deactivate themselves or drop their own admin role', async () => {
    const me = (await admin.get('/api/auth/me').expect(200)).body.user as { id: number };
    const deactivate = await admin.patch(`/api/users/${me.id}`, { active: false });
    expect(deactivate.status).toBe(409);
    const demote = await admin.patch(`/api/users/${me.id}`, { roles: ['analyst'] });
    expect(demote.status).toBe(409);
    const stillAdmin = await t.dataSource.getRepository(User).findOneByOrFail({ id: me.id });
    expect(stillAdmin).toMatchObject({ active: true, roles: ['admin'] });
    // issue 13: nobody changes their own roles, not even to add one (an admin granting themselves
    // the committee role could then decide).
    const grant = await admin.patch(`/api/users/${me.id}`, { roles: ['admin', 'committee'] });
    expect(grant.status).toBe(409);
    expect((grant.body as { error: { message: string } }).error.message).toBe('You cannot change your own roles; ask another administrator.');
    expect((await t.dataSource.getRepository(User).findOneByOrFail({ id: me.id })).roles).toEqual(['admin']);
  });

  it('keeps one active admin when two admins remove each other at the same moment', async () => {
    const me = (await admin.get('/api/auth/me').expect(200)).body.user as { id: number };
    const analyst = (await t.dataSource.getRepository(User).find()).find((person) => person.roles.join() === 'analyst')!;
    expect((await admin.patch(`/api/users/${analyst.id}`, { roles: ['analyst', 'admin'] })).status).toBe(200);
    const other = await signedInAs(t.app, 'analyst');
    const otherMe = (await other.get('/api/auth/me').expect(200)).body.user as { id: number; roles: string[] };
    expect(otherMe.roles).toContain('admin');
    // Both past the route's guard, the two changes meet in the service: transactions run one at a
    // time and the count of other admins is read inside each, so the second is refused.
    const users = t.dataSource.getRepository(User);
    const [meUser, otherUser] = [await users.findOneByOrFail({ id: me.id }), await users.findOneByOrFail({ id: otherMe.id })];
    const ctx = { dataSource: t.dataSource, mailer: t.mailer, config: t.config } as unknown as AppContext;
    const results = await Promise.allSettled([
      updateUser(ctx, meUser, otherMe.id, { roles: ['analyst'] }),
      updateUser(ctx, otherUser, me.id, { active: false }),
    ]);
    expect(results.map((result) => result.status).sort()).toEqual(['fulfilled', 'rejected']);
    const refused = results.find((result) => result.status === 'rejected') as PromiseRejectedResult;
    expect((refused.reason as AppError).status).toBe(409);
    expect((refused.reason as AppError).message).toMatch(/is the last active administrator/);
    const admins = (await t.dataSource.getRepository(User).find()).filter((person) => person.active && person.roles.includes('admin'));
    expect(admins).toHaveLength(1);
    // Put things back for the tests after this one.
    if (!admins.some((person) => person.id === me.id)) {
      await t.dataSource.query(`UPDATE "users" SET "active" = 1 WHERE "id" = ?`, [me.id]);
      await t.dataSource.query(`UPDATE "users" SET "roles" = ? WHERE "id" = ?`, [JSON.stringify(['analyst']), otherMe.id]);
    }
  });

  it('answers 404 for a person who does not exist and 400 for an empty change', async () => {
    expect((await admin.patch('/api/users/999999', { name: 'Nobody' })).status).toBe(404);
    expect((await admin.patch('/api/users/2', {})).status).toBe(400);
    expect((await admin.patch('/api/users/abc', { name: 'X' })).status).toBe(400);
  });
});

describe('outbox', () => {
  it('shows every message newest first, paginated, with its status', async () => {
    const total = await t.dataSource.getRepository(MailMessage).count();
    const first = outboxResponseSchema.parse((await admin.get('/api/outbox?page=1&pageSize=2').expect(200)).body);
    expect(first.total).toBe(total);
    expect(first.messages).toHaveLength(2);
    expect(first.messages[0].id).toBeGreaterThan(first.messages[1].id);
    const second = outboxResponseSchema.parse((await admin.get('/api/outbox?page=2&pageSize=2').expect(200)).body);
    expect(second.messages[0].id).toBeLessThan(first.messages[1].id);
    expect(first.messages.every((message) => message.status === 'sent' && message.attempts === 1)).toBe(true);
    expect((await admin.get('/api/outbox?pageSize=500')).status).toBe(400);
  });
});

import { acceptTokenInputSchema, loginInputSchema, passwordResetRequestSchema, type TokenInfo } from '@shared/users';
import type { Request, Response } from 'express';
import { z } from 'zod';
import { recordAudit } from '../audit/audit';
import type { AppContext } from '../context';
import { Session, User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { AppError, notFound } from '../errors';
import { defineRoute, type AnyRequest, type RouteDefinition } from '../http/routes';
import { passwordResetMail } from '../mail/templates';
import { presentUser } from '../users/present';
import { csrfToken, renewCsrfToken } from './csrf';
import { currentUser } from './guards';
import type { PassportInstance } from './passport';
import { hashPassword } from './password';
import { resetRequestLimiter, signInLimiter } from './rate-limits';
import { consumeToken, findToken, issueToken, tokenLink, type TokenState } from './tokens';

const tokenParams = z.object({ token: z.string().min(1).max(200) });

const invalidCredentials = () => new AppError('invalid_credentials', 'The e-mail address or password is not correct.', 401);

function gone(state: Exclude<TokenState, 'valid'>, purpose: string): AppError {
  const again = purpose === 'invitation' ? 'Ask an administrator to invite you again.' : 'Request a new password-reset link.';
  return state === 'used'
    ? new AppError('link_used', `This link has already been used. ${again}`, 410)
    : new AppError('link_expired', `This link has expired. ${again}`, 410);
}

function authenticate(passport: PassportInstance, req: AnyRequest, res: Response): Promise<User | null> {
  return new Promise((resolve, reject) => {
    passport.authenticate('local', { session: false }, (error: unknown, user: User | false) => {
      if (error) reject(error instanceof Error ? error : new Error(String(error)));
      else resolve(user || null);
    })(req as Request, res, (error: unknown) => reject(error instanceof Error ? error : new Error(String(error))));
  });
}

/** Starts a new session (a new id: no session fixation) for the person, with a new CSRF token. */
function signIn(req: AnyRequest, res: Response, user: User): Promise<void> {
  return new Promise((resolve, reject) => {
    req.login(user, (error: unknown) => {
      if (error) return reject(error instanceof Error ? error : new Error(String(error)));
      renewCsrfToken(req as Request, res);
      resolve();
    });
  });
}

export function authRoutes(ctx: AppContext, passport: PassportInstance): RouteDefinition[] {
  const { dataSource, config } = ctx;
  return [
    defineRoute({
      method: 'get',
      path: '/auth/csrf',
      access: 'public',
      summary: 'The session’s CSRF token → { token }',
      handler: (req) => ({ token: csrfToken(req) }),
    }),
    defineRoute({
      method: 'post',
      path: '/auth/login',
      access: 'public',
      summary: 'Sign in with { email, password } → { user }; 401 wrong, 403 deactivated, 429 too many failures',
      validate: { body: loginInputSchema },
      before: [signInLimiter(ctx.dataSource)],
      handler: async (req, res) => {
        const user = await authenticate(passport, req, res);
        if (!user) throw invalidCredentials();
        if (!user.active) throw new AppError('account_inactive', 'This account has been deactivated. Ask an administrator.', 403);
        await signIn(req, res, user);
        await inTransaction(dataSource, (manager) =>
          recordAudit(manager, { actor: user, action: 'auth.signed_in', target: { type: 'user', id: user.id } }),
        );
        return { user: presentUser(user) };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/auth/logout',
      access: 'public',
      summary: 'Sign out (harmless when already signed out) → { ok: true }',
      handler: async (req, res) => {
        const user = req.user;
        await new Promise<void>((resolve, reject) => req.logout((error: unknown) => (error ? reject(error instanceof Error ? error : new Error(String(error))) : resolve())));
        renewCsrfToken(req, res);
        if (user) {
          await inTransaction(dataSource, (manager) =>
            recordAudit(manager, { actor: user, action: 'auth.signed_out', target: { type: 'user', id: user.id } }),
          );
        }
        return { ok: true };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/auth/me',
      access: 'signed-in',
      summary: 'The signed-in person → { user }, or 401',
      handler: (req) => ({ user: presentUser(currentUser(req)) }),
    }),
    defineRoute({
      method: 'post',
      path: '/auth/password-reset',
      access: 'public',
      summary: 'E-mail a one-hour password-reset link → 202 { ok: true }, known address or not',
      validate: { body: passwordResetRequestSchema },
      before: [resetRequestLimiter(ctx.dataSource)],
      handler: async (req, res) => {
        const user = await dataSource.getRepository(User).findOneBy({ email: req.body.email });
        if (user && user.active) {
          await inTransaction(dataSource, async (manager) => {
            const { token, expiresAt } = await issueToken(manager, user.id, 'password-reset');
            await ctx.mailer.queue(manager, passwordResetMail({ to: user.email, name: user.name, link: tokenLink(config, token), expiresAt }));
            await recordAudit(manager, {
              actor: null,
              action: 'auth.password_reset_requested',
              target: { type: 'user', id: user.id },
              details: { linkExpiresAt: expiresAt.toISOString() },
            });
          });
          ctx.mailer.kick();
        } else {
          ctx.log.info(`password reset requested for an unknown or inactive address`);
        }
        res.status(202);
        return { ok: true };
      },
    }),
    defineRoute({
      method: 'get',
      path: '/auth/tokens/:token',
      access: 'public',
      summary: 'What a one-time link is for → { purpose, email, name, expiresAt }; 404 unknown, 410 used or expired',
      validate: { params: tokenParams },
      handler: async (req): Promise<TokenInfo> => {
        const found = await findToken(dataSource, req.params.token);
        if (!found) throw notFound('This link is not valid. Check that it was copied completely.');
        if (found.state !== 'valid') throw gone(found.state, found.record.purpose);
        return {
          purpose: found.record.purpose,
          email: found.record.user.email,
          name: found.record.user.name,
          expiresAt: found.record.expiresAt.toISOString(),
        };
      },
    }),
    defineRoute({
      method: 'post',
      path: '/auth/tokens/:token/accept',
      access: 'public',
      summary: 'Use a one-time link: set the password { password } and sign in → { user }; 410 used or expired',
      validate: { params: tokenParams, body: acceptTokenInputSchema },
      handler: async (req, res) => {
        const found = await findToken(dataSource, req.params.token);
        if (!found) throw notFound('This link is not valid. Check that it was copied completely.');
        if (found.state !== 'valid') throw gone(found.state, found.record.purpose);
        const { record } = found;
        // Hash outside the transaction: it is the slow part and needs no database.
        const passwordHash = await hashPassword(req.body.password, config.bcryptCost);
        const user = await inTransaction(dataSource, async (manager) => {
          if (!(await consumeToken(manager, record))) throw gone('used', record.purpose);
          const users = manager.getRepository(User);
          const user = await users.findOneByOrFail({ id: record.userId });
          user.passwordHash = passwordHash;
          if (record.purpose === 'invitation') user.active = true;
          if (!user.active) throw new AppError('account_inactive', 'This account has been deactivated. Ask an administrator.', 403);
          // A new password signs the person out everywhere else.
          const ended = await manager.getRepository(Session).delete({ userId: user.id });
          await recordAudit(manager, {
            actor: user,
            action: record.purpose === 'invitation' ? 'auth.invitation_accepted' : 'auth.password_reset',
            target: { type: 'user', id: user.id },
            details: { sessionsEnded: ended.affected ?? 0 },
          });
          return users.save(user);
        });
        await signIn(req, res, user);
        return { user: presentUser(user) };
      },
    }),
  ];
}

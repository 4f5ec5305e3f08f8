import type { Role } from '@shared/roles';
import type { InviteInput, UpdateUserInput } from '@shared/users';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { issueToken, retireTokens, tokenLink } from '../auth/tokens';
import type { AppContext } from '../context';
import { Session, User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { conflict, notFound } from '../errors';
import { invitationMail } from '../mail/templates';
import { normaliseRoles } from './present';
import { now } from '../clock';

/** People: the admin's rules for inviting, changing and deactivating them. */

export function listUsers(dataSource: DataSource): Promise<User[]> {
  return dataSource.getRepository(User).find({ order: { name: 'ASC', id: 'ASC' } });
}

/** Active people holding `role` (for e-mailing the people who act next). */
export async function activeUsersWithRole(source: DataSource | EntityManager, role: Role): Promise<User[]> {
  const active = await source.getRepository(User).find({ where: { active: true }, order: { id: 'ASC' } });
  return active.filter((user) => user.roles.includes(role));
}

/** Creates the person inactive, with an invitation link by e-mail; 409 when the e-mail is taken. */
export async function inviteUser(ctx: AppContext, actor: User, input: InviteInput): Promise<User> {
  const user = await inTransaction(ctx.dataSource, async (manager) => {
    const users = manager.getRepository(User);
    if (await users.existsBy({ email: input.email })) {
      throw conflict(`${input.email} already has a Scorecourt account.`, { field: 'email' });
    }
    const created = await users.save(
      users.create({ email: input.email, name: input.name, passwordHash: null, roles: normaliseRoles(input.roles), active: false, createdAt: now() }),
    );
    const { token, expiresAt } = await issueToken(manager, created.id, 'invitation');
    await ctx.mailer.queue(
      manager,
      invitationMail({ to: created.email, name: created.name, invitedBy: actor.name, roles: created.roles, link: tokenLink(ctx.config, token), expiresAt }),
    );
    await recordAudit(manager, {
      actor,
      action: 'user.invited',
      target: { type: 'user', id: created.id },
      details: { email: created.email, name: created.name, roles: created.roles, linkExpiresAt: expiresAt.toISOString() },
    });
    return created;
  });
  ctx.mailer.kick();
  return user;
}

/**
 * Renames, changes roles, deactivates or reactivates a person; one audit event per kind of
 * change. Deactivating ends the person's sessions and retires their unused links (for a pending
 * invitee it withdraws the invitation). Reactivating
 * someone who never set a password sends them a fresh invitation. Nobody changes their own roles
 * or deactivates themselves, and the last active admin can neither be deactivated nor lose the
 * role (checked inside the transaction), so there is always an active admin.
 */
export async function updateUser(ctx: AppContext, actor: User, id: number, changes: UpdateUserInput): Promise<User> {
  let mailQueued = false;
  const user = await inTransaction(ctx.dataSource, async (manager) => {
    const users = manager.getRepository(User);
    const user = await users.findOneBy({ id });
    if (!user) throw notFound('There is no such person.');
    const self = user.id === actor.id;
    if (self && changes.active === false) throw conflict('You cannot deactivate your own account; ask another administrator.');
    const roles = changes.roles ? normaliseRoles(changes.roles) : undefined;
    // Nobody changes their own roles: an admin granting themselves the committee role could then decide.
    if (self && roles && roles.join() !== normaliseRoles(user.roles).join()) {
      throw conflict('You cannot change your own roles; ask another administrator.');
    }
    // The last active administrator stays: checked here, inside the transaction, so two admins
    // removing each other at once leave one (transactions run one at a time, inTransaction).
    const losesAdmin = user.active && user.roles.includes('admin') && ((roles && !roles.includes('admin')) || changes.active === false);
    if (losesAdmin) {
      const admins = (await activeUsersWithRole(manager, 'admin')).filter((person) => person.id !== user.id);
      if (admins.length === 0) throw conflict(`${user.name} is the last active administrator; make someone else an administrator first.`);
    }
    const target = { type: 'user', id: user.id };

    if (changes.name !== undefined && changes.name !== user.name) {
      await recordAudit(manager, { actor, action: 'user.renamed', target, details: { from: user.name, to: changes.name } });
      user.name = changes.name;
    }
    if (roles && roles.join() !== user.roles.join()) {
      await recordAudit(manager, { actor, action: 'user.roles_changed', target, details: { from: user.roles, to: roles } });
      user.roles = roles;
    }
    if (changes.active === false && user.active) {
      user.active = false;
      const ended = await manager.getRepository(Session).delete({ userId: user.id });
      await retireTokens(manager, user.id);
      await recordAudit(manager, { actor, action: 'user.deactivated', target, details: { sessionsEnded: ended.affected ?? 0 } });
    } else if (changes.active === false && user.passwordHash === null) {
      // Still inactive because the invitation is pending: deactivating withdraws it.
      const withdrawn = await retireTokens(manager, user.id);
      if (withdrawn > 0) await recordAudit(manager, { actor, action: 'user.invitation_withdrawn', target, details: { links: withdrawn } });
    } else if (changes.active === true && !user.active) {
      user.active = true;
      const invitationSent = user.passwordHash === null;
      if (invitationSent) {
        const { token, expiresAt } = await issueToken(manager, user.id, 'invitation');
        await ctx.mailer.queue(
          manager,
          invitationMail({ to: user.email, name: user.name, invitedBy: actor.name, roles: user.roles, link: tokenLink(ctx.config, token), expiresAt }),
        );
        mailQueued = true;
      }
      await recordAudit(manager, { actor, action: 'user.reactivated', target, details: { invitationSent } });
    }
    return users.save(user);
  });
  if (mailQueued) ctx.mailer.kick();
  return user;
}

import { parseArgs } from 'node:util';
import { passwordResetRequestSchema } from '@shared/users';
import { recordAudit } from '../audit/audit';
import { issueToken, tokenLink } from '../auth/tokens';
import { now } from '../clock';
import { ConfigError, databaseAddress, loadConfig } from '../config';
import { openDatabase } from '../db/data-source';
import { User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';

/**
 * `npm run create-admin -- EMAIL [--name "Full Name"]`: makes the first administrator of a
 * production database (where no demo people are added). Run it on the server, with the same
 * DATABASE_PATH and PUBLIC_URL as the service. The person is created inactive with the admin role,
 * and the one-time invitation link is printed here, on the operator's terminal, not mailed and not
 * put in the outbox: opening it sets the password and activates the account (valid 7 days). An
 * address that already has an account is refused. The creation is in the audit trail.
 */

const usage = 'usage: npm run create-admin -- EMAIL [--name "Full Name"]';

async function main(): Promise<number> {
  const { positionals, values } = parseArgs({ allowPositionals: true, options: { name: { type: 'string' } } });
  if (positionals.length !== 1) {
    console.error(usage);
    return 2;
  }
  const parsed = passwordResetRequestSchema.safeParse({ email: positionals[0] });
  if (!parsed.success) {
    console.error(`${positionals[0]}: ${parsed.error.issues[0]?.message ?? 'not an e-mail address'}\n${usage}`);
    return 2;
  }
  const email = parsed.data.email;
  const name = (values.name ?? email.split('@')[0]).trim().slice(0, 120) || email;
  let config;
  try {
    config = loadConfig();
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(error.message);
      return 2;
    }
    throw error;
  }
  const dataSource = await openDatabase(databaseAddress(config));
  try {
    const result = await inTransaction(dataSource, async (manager) => {
      const users = manager.getRepository(User);
      if (await users.existsBy({ email })) return null;
      const created = await users.save(users.create({ email, name, passwordHash: null, roles: ['admin'], active: false, createdAt: now() }));
      const { token, expiresAt } = await issueToken(manager, created.id, 'invitation', now());
      await recordAudit(manager, {
        actor: null,
        action: 'user.created_by_operator',
        target: { type: 'user', id: created.id },
        details: { email, name, roles: ['admin'], linkExpiresAt: expiresAt.toISOString(), via: 'npm run create-admin' },
      });
      return { link: tokenLink(config, token), expiresAt };
    });
    if (!result) {
      console.error(`${email} already has a Scorecourt account; nothing was changed. An administrator can change its roles on the People page.`);
      return 1;
    }
    console.log(
      [
        `Created the administrator ${email} (${name}), not yet active.`,
        `Open this one-time link to set the password (valid until ${result.expiresAt.toISOString()}); keep it private:`,
        `  ${result.link}`,
      ].join('\n'),
    );
    return 0;
  } finally {
    await dataSource.destroy();
  }
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error('create-admin failed:', error);
    process.exit(1);
  },
);

import { createHash, randomBytes } from 'node:crypto';
import { IsNull, type DataSource, type EntityManager } from 'typeorm';
import type { Config } from '../config';
import { OneTimeToken } from '../db/entities/index';
import type { TokenPurpose } from '../db/entities/one-time-token';
import { now as clockNow } from '../clock';

/**
 * One-time links for invitations (7 days) and password resets (1 hour). The token is 32 random
 * bytes (base64url) sent only in the e-mail; the database keeps its SHA-256. A link is used at
 * most once: using it sets `usedAt` with a conditional UPDATE, so two simultaneous uses cannot
 * both succeed. Issuing a new link of the same purpose, or deactivating the person, retires the
 * older ones.
 */

export const tokenLifetimeMs: Record<TokenPurpose, number> = {
  invitation: 7 * 24 * 60 * 60 * 1000,
  'password-reset': 60 * 60 * 1000,
};

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function tokenLink(config: Pick<Config, 'publicUrl'>, token: string): string {
  return `${config.publicUrl}/accept/${token}`;
}

export async function issueToken(
  manager: EntityManager,
  userId: number,
  purpose: TokenPurpose,
  now = clockNow(),
): Promise<{ token: string; expiresAt: Date }> {
  const repository = manager.getRepository(OneTimeToken);
  await repository.update({ userId, purpose, usedAt: IsNull() }, { usedAt: now });
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(now.getTime() + tokenLifetimeMs[purpose]);
  await repository.insert({ userId, purpose, tokenHash: hashToken(token), createdAt: now, expiresAt, usedAt: null });
  return { token, expiresAt };
}

/** Retires every unused link of a person; returns how many there were. */
export async function retireTokens(manager: EntityManager, userId: number, now = clockNow()): Promise<number> {
  const result = await manager.getRepository(OneTimeToken).update({ userId, usedAt: IsNull() }, { usedAt: now });
  return result.affected ?? 0;
}

export type TokenState = 'valid' | 'used' | 'expired';

export async function findToken(
  source: DataSource | EntityManager,
  token: string,
  now = clockNow(),
): Promise<{ record: OneTimeToken; state: TokenState } | null> {
  if (token.length < 20 || token.length > 100) return null;
  const record = await source.getRepository(OneTimeToken).findOne({ where: { tokenHash: hashToken(token) }, relations: { user: true } });
  if (!record) return null;
  const state: TokenState = record.usedAt ? 'used' : record.expiresAt.getTime() <= now.getTime() ? 'expired' : 'valid';
  return { record, state };
}

/** Marks the link used; false when it was used (or retired) meanwhile. */
export async function consumeToken(manager: EntityManager, record: OneTimeToken, now = clockNow()): Promise<boolean> {
  const result = await manager.getRepository(OneTimeToken).update({ id: record.id, usedAt: IsNull() }, { usedAt: now });
  return result.affected === 1;
}

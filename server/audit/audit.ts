import { createHash } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { now } from '../clock';
import { AuditEvent, User } from '../db/entities/index';
import { canonicalJson } from './canonical-json';

/**
 * The append-only audit trail with a hash chain.
 *
 * hash_i = SHA-256( prevHash_i + "\n" + canonical_i ), prevHash_i = hash_{i−1} (64 zeros for the
 * first event), canonical_i = canonical JSON of { action, actorId, createdAt (ISO 8601),
 * details, prevHash, targetId, targetType }, plus actorName and actorEmail when the event has them
 * (events recorded before names were kept have neither, so their hashes are unchanged). Changing, removing or reordering any stored event
 * breaks the chain at that event or the next; `verifyAuditChain` finds where. (Removing only the
 * newest events cannot be detected from the chain alone.)
 *
 * There is no update or delete here, and database triggers refuse both.
 */

export const genesisHash = '0'.repeat(64);

export interface AuditInput {
  /** The signed-in person, or null for the system. Name and e-mail are looked up when not given. */
  actor: { id: number; name?: string; email?: string } | null;
  action: string;
  target: { type: string; id: string | number | null };
  details?: Record<string, unknown>;
}

function canonicalEvent(
  event: Pick<AuditEvent, 'action' | 'actorId' | 'createdAt' | 'details' | 'prevHash' | 'targetId' | 'targetType'> & Partial<Pick<AuditEvent, 'actorName' | 'actorEmail'>>,
): string {
  return canonicalJson({
    action: event.action,
    actorId: event.actorId,
    ...(event.actorName != null ? { actorName: event.actorName } : {}),
    ...(event.actorEmail != null ? { actorEmail: event.actorEmail } : {}),
    createdAt: event.createdAt.toISOString(),
    details: JSON.parse(event.details) as unknown,
    prevHash: event.prevHash,
    targetId: event.targetId,
    targetType: event.targetType,
  });
}

export function hashEvent(event: Parameters<typeof canonicalEvent>[0]): string {
  return createHash('sha256').update(`${event.prevHash}\n${canonicalEvent(event)}`).digest('hex');
}

/**
 * Appends one event. Call it with the transaction's manager, inside the same transaction as the
 * change it records (see db/transaction.ts), so the change and its record are stored together.
 */
export async function recordAudit(manager: EntityManager, input: AuditInput): Promise<AuditEvent> {
  if (!manager.queryRunner?.isTransactionActive) {
    throw new Error('recordAudit must run inside the transaction of the change it records');
  }
  const repository = manager.getRepository(AuditEvent);
  const [last] = await repository.find({ order: { id: 'DESC' }, take: 1, select: { id: true, hash: true } });
  // The name and e-mail the actor has now, at the act (a later rename does not rewrite the event).
  let actor: { name: string; email: string } | null = null;
  if (input.actor) {
    actor =
      input.actor.name !== undefined && input.actor.email !== undefined
        ? { name: input.actor.name, email: input.actor.email }
        : await manager.getRepository(User).findOne({ where: { id: input.actor.id }, select: { id: true, name: true, email: true } });
  }
  const event = repository.create({
    actorId: input.actor?.id ?? null,
    actorName: actor?.name ?? null,
    actorEmail: actor?.email ?? null,
    action: input.action,
    targetType: input.target.type,
    targetId: input.target.id === null ? null : String(input.target.id),
    details: canonicalJson(input.details ?? {}),
    createdAt: now(),
    prevHash: last?.hash ?? genesisHash,
  });
  event.hash = hashEvent(event);
  return repository.save(event);
}

export type ChainCheck = { ok: true; events: number } | { ok: false; events: number; brokenAt: number; reason: string };

/** A verified point of the chain: the event `id` with `hash`, the `events`-th from the start. */
export interface ChainHead {
  id: number;
  hash: string;
  events: number;
}

export const chainStart: ChainHead = { id: 0, hash: genesisHash, events: 0 };

/**
 * Re-computes every hash in order after `from` (the whole chain by default); reports the first
 * event where the chain breaks. `onBatch` runs around each batch's read (audit/chain-state.ts
 * reads each batch in turn with the writes, so no uncommitted event is ever verified).
 */
export async function verifyChainFrom(
  source: DataSource | EntityManager,
  batchSize = 1000,
  from: ChainHead = chainStart,
  around: <T>(read: () => Promise<T>) => Promise<T> = (read) => read(),
): Promise<ChainCheck & { head: ChainHead }> {
  const repository = source.getRepository(AuditEvent);
  if (from.id > 0) {
    // The remembered head is still there, as it was (this also notices the newest events removed).
    const head = await around(() => repository.findOneBy({ id: from.id }));
    let intact = head !== null && head.hash === from.hash;
    try {
      intact &&= hashEvent(head!) === from.hash;
    } catch {
      intact = false;
    }
    if (!intact) {
      return { ok: false, events: from.events - 1, brokenAt: from.id, reason: 'the last verified event was changed or removed', head: from };
    }
  }
  let prevHash = from.hash;
  let afterId = from.id;
  let events = from.events;
  for (;;) {
    const batch = await around(() =>
      repository.createQueryBuilder('event').where('event.id > :afterId', { afterId }).orderBy('event.id', 'ASC').take(batchSize).getMany(),
    );
    const head = { id: afterId, hash: prevHash, events };
    if (batch.length === 0) return { ok: true, events, head };
    for (const event of batch) {
      const at = { id: afterId, hash: prevHash, events };
      if (event.prevHash !== prevHash) {
        return { ok: false, events, brokenAt: event.id, reason: 'its link to the previous event does not match (an event was removed, added or reordered)', head: at };
      }
      let expected: string;
      try {
        expected = hashEvent(event);
      } catch {
        return { ok: false, events, brokenAt: event.id, reason: 'its details are not valid JSON', head: at };
      }
      if (event.hash !== expected) {
        return { ok: false, events, brokenAt: event.id, reason: 'its content does not match its hash (the event was changed)', head: at };
      }
      prevHash = event.hash;
      afterId = event.id;
      events += 1;
    }
    // Other requests get a turn between batches.
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
}

/** The whole chain, from its first event (the full verification). */
export async function verifyAuditChain(source: DataSource | EntityManager, batchSize = 1000): Promise<ChainCheck> {
  const { head: _head, ...check } = await verifyChainFrom(source, batchSize);
  return check;
}

/** The details of a stored event, parsed. */
export function auditDetails(event: AuditEvent): Record<string, unknown> {
  return JSON.parse(event.details) as Record<string, unknown>;
}

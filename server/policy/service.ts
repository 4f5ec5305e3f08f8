import type { PolicyUpdate, PolicyVersion as PolicyVersionBody } from '@shared/governance';
import { adoptionPolicySchema, type AdoptionPolicy } from '@shared/policy';
import type { DataSource, EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import type { AppContext } from '../context';
import { PolicyVersion, type StoredPolicy, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { iso } from '@shared/format';
import { personRef } from '../users/present';
import { now } from '../clock';

/**
 * The adoption policy, versioned. The newest stored version is the current one: new analyses are
 * judged under it and re-evaluations use it. A change by an admin appends a version (with the
 * admin's reason and an audit event naming the fields that changed); stored versions are never
 * changed (database triggers refuse it), so every verdict can be read back under its own rules.
 */

const policyKeys = [
  'alpha',
  'sided',
  'materialityGiniPoints',
  'requireIntervalAboveZero',
  'swapRule',
  'minBads',
  'quorum',
  'segmentRule',
  // Calibration and stability criteria.
  'calibrationRule',
  'psiRule',
  'periodSignRule',
] as const;

function toPolicy(row: PolicyVersion): AdoptionPolicy {
  // Parse on the way out: a stored row always satisfies the schema the API promises.
  return adoptionPolicySchema.parse({ ...row.policy, version: row.version });
}

export function presentPolicyVersion(row: PolicyVersion): PolicyVersionBody {
  return {
    policy: toPolicy(row),
    createdBy: row.createdBy ? personRef(row.createdBy) : null,
    createdAt: iso(row.createdAt),
    reason: row.reason,
  };
}

async function newestRow(source: DataSource | EntityManager): Promise<PolicyVersion> {
  const [row] = await source.getRepository(PolicyVersion).find({ order: { version: 'DESC' }, take: 1, relations: { createdBy: true } });
  // The migration writes version 1, so this only happens on a database that skipped it.
  if (!row) throw new Error('no adoption policy is stored (the governance migration writes version 1)');
  return row;
}

/** The policy new analyses and re-evaluations use: the newest stored version. */
export async function currentPolicy(source: DataSource | EntityManager): Promise<AdoptionPolicy> {
  return toPolicy(await newestRow(source));
}

/** One stored version (the current one when `version` is null). */
export async function policyAt(source: DataSource | EntityManager, version: number | null): Promise<AdoptionPolicy> {
  if (version === null) return currentPolicy(source);
  const row = await source.getRepository(PolicyVersion).findOneBy({ version });
  if (!row) throw new Error(`adoption policy version ${version} is not stored`);
  return toPolicy(row);
}

/**
 * The policy governing a comparison's review and decision: the version in force when it was last
 * submitted (comparisons.governingPolicyVersion), until it is submitted again; the current one
 * before its first submission.
 */
export function governingPolicy(source: DataSource | EntityManager, comparison: { governingPolicyVersion: number | null }): Promise<AdoptionPolicy> {
  return policyAt(source, comparison.governingPolicyVersion);
}

export async function currentPolicyVersion(source: DataSource | EntityManager): Promise<PolicyVersionBody> {
  return presentPolicyVersion(await newestRow(source));
}

/** Every version, newest first. */
export async function listPolicyVersions(source: DataSource | EntityManager): Promise<PolicyVersionBody[]> {
  const rows = await source.getRepository(PolicyVersion).find({ order: { version: 'DESC' }, relations: { createdBy: true } });
  return rows.map(presentPolicyVersion);
}

function sameValue(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/** Appends a new version with the admin's fields and reason; the previous versions stay as they are. */
export async function changePolicy(ctx: AppContext, actor: User, input: PolicyUpdate): Promise<PolicyVersionBody> {
  const { reason, ...fields } = input;
  const stored: StoredPolicy = {
    alpha: fields.alpha,
    sided: fields.sided,
    materialityGiniPoints: fields.materialityGiniPoints,
    requireIntervalAboveZero: fields.requireIntervalAboveZero,
    swapRule: { enabled: fields.swapRule.enabled, approvalRate: fields.swapRule.approvalRate },
    minBads: fields.minBads,
    quorum: fields.quorum,
    // Calibration and stability criteria.
    calibrationRule: { enabled: fields.calibrationRule.enabled, alpha: fields.calibrationRule.alpha },
    psiRule: { enabled: fields.psiRule.enabled, threshold: fields.psiRule.threshold },
    periodSignRule: { enabled: fields.periodSignRule.enabled, minBads: fields.periodSignRule.minBads },
    segmentRule: { enabled: fields.segmentRule.enabled, minBads: fields.segmentRule.minBads },
  };
  const version = await inTransaction(ctx.dataSource, async (manager) => {
    const previous = await newestRow(manager);
    const next = previous.version + 1;
    const repository = manager.getRepository(PolicyVersion);
    await repository.insert({ version: next, policy: stored, reason, createdById: actor.id, createdAt: now() });
    const changes: Record<string, { from: unknown; to: unknown }> = {};
    // Read through the schema, so that fields an older version lacks count as their defaults.
    const before = toPolicy(previous);
    for (const key of policyKeys) {
      if (!sameValue(before[key], stored[key])) changes[key] = { from: before[key], to: stored[key] };
    }
    await recordAudit(manager, {
      actor,
      action: 'policy.changed',
      target: { type: 'policy', id: next },
      details: { version: next, previousVersion: previous.version, reason, changes },
    });
    return next;
  });
  const row = await ctx.dataSource.getRepository(PolicyVersion).findOneOrFail({ where: { version }, relations: { createdBy: true } });
  return presentPolicyVersion(row);
}

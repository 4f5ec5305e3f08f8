import type { AuditEvent as AuditEventBody } from '@shared/governance';
import { Brackets, type DataSource, type EntityManager } from 'typeorm';
import { pageOf, type PageQuery } from '@shared/paging';
import { auditDetails, type ChainCheck } from '../audit/audit';
import { auditChainStatus } from '../audit/chain-state';
import { findComparison } from '../comparisons/service';
import { AnalysisRun, AuditEvent, Decision, VerdictRecord } from '../db/entities/index';
import { iso } from './people';
import { atTheTime } from './present';

/**
 * A comparison's audit trail: every event recorded against the comparison (creation, set-ups,
 * runs, verdicts, scenarios, notes, the workflow's steps and votes), the upload of each holdout
 * its runs read, and the changes that made the policy versions its verdicts and decision used.
 * In the order they were recorded, a page at a time, with whether the chain verifies (audit/audit.ts,
 * audit/chain-state.ts).
 * Reads only: nothing here, or anywhere, changes or removes an event.
 */

type Source = DataSource | EntityManager;

export function presentAuditEvent(event: AuditEvent): AuditEventBody {
  return {
    id: event.id,
    // The name and e-mail at the act; events from before names were kept show the person's current ones.
    actor: event.actor ? atTheTime(event.actor, event.actorName, event.actorEmail) : null,
    action: event.action,
    targetType: event.targetType,
    targetId: event.targetId,
    details: auditDetails(event),
    createdAt: iso(event.createdAt),
    hash: event.hash,
    prevHash: event.prevHash,
  };
}

/** The comparison's events, oldest first; a page of them (`limit + 1` read, so the caller knows whether there is more) when `page` is given. */
export async function comparisonAuditEvents(source: Source, comparisonId: number, page?: PageQuery): Promise<AuditEvent[]> {
  const comparison = await findComparison(source, comparisonId);
  const runs = await source.getRepository(AnalysisRun).find({ where: { comparisonId }, select: { id: true, holdoutId: true } });
  const holdoutIds = [...new Set([comparison.holdoutId, ...runs.map((run) => run.holdoutId)])].map(String);
  const verdictVersions = await source
    .getRepository(VerdictRecord)
    .createQueryBuilder('record')
    .select('DISTINCT record.policyVersion', 'version')
    .where('record.comparisonId = :comparisonId', { comparisonId })
    .getRawMany<{ version: number }>();
  const decision = await source.getRepository(Decision).findOne({ where: { comparisonId }, select: { id: true, policyVersion: true } });
  const versions = [...new Set([...verdictVersions.map((row) => row.version), ...(decision ? [decision.policyVersion] : [])])].map(String);

  return source
    .getRepository(AuditEvent)
    .createQueryBuilder('event')
    .leftJoinAndSelect('event.actor', 'actor')
    .where(
      new Brackets((where) => {
        where.where("event.targetType = 'comparison' AND event.targetId = :id", { id: String(comparisonId) });
        where.orWhere("event.targetType = 'holdout' AND event.targetId IN (:...holdoutIds)", { holdoutIds });
        if (versions.length > 0) where.orWhere("event.targetType = 'policy' AND event.targetId IN (:...versions)", { versions });
      }),
    )
    .andWhere('event.id > :after', { after: page?.after ?? 0 })
    .orderBy('event.id', 'ASC')
    .take(page ? page.limit + 1 : undefined)
    .getMany();
}

export async function comparisonAuditTrail(
  source: DataSource,
  comparisonId: number,
  page?: PageQuery,
): Promise<{ events: AuditEventBody[]; chainValid: boolean; chain: ChainCheck; nextAfter: number | null }> {
  const rows = await comparisonAuditEvents(source, comparisonId, page);
  const { items, nextAfter } = page ? pageOf(rows, page.limit) : { items: rows, nextAfter: null };
  // Verified incrementally: only the events appended since the last call (audit/chain-state.ts).
  const chain = await auditChainStatus(source);
  return { events: items.map(presentAuditEvent), chainValid: chain.ok, chain, nextAfter };
}

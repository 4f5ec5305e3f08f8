import { In, type DataSource, type EntityManager } from 'typeorm';
import { AnalysisRun, AuditEvent, Holdout, type Comparison } from '../db/entities/index';

/**
 * The ids of the people who shaped a comparison's evidence: its creator, the uploader of its
 * holdout and of every holdout one of its runs used, whoever set up one of its runs, and whoever
 * submitted it for review (their `comparison.submitted` audit events). The four-eyes rule keeps
 * each of them from reviewing, voting on or deciding it.
 */
export async function authorsOf(
  source: DataSource | EntityManager,
  comparison: Comparison,
  /** The comparison's runs when the caller has read them already (with requestedById and holdoutId). */
  knownRuns?: readonly (Pick<AnalysisRun, 'requestedById' | 'holdoutId'> & Partial<Pick<AnalysisRun, 'referenceHoldoutId'>>)[],
): Promise<Set<number>> {
  const authors = new Set<number>([comparison.createdById]);
  const runs = knownRuns ?? (await source.getRepository(AnalysisRun).find({ where: { comparisonId: comparison.id }, select: { requestedById: true, holdoutId: true, referenceHoldoutId: true } }));
  const holdoutIds = new Set<number>([comparison.holdoutId]);
  for (const run of runs) {
    authors.add(run.requestedById);
    holdoutIds.add(run.holdoutId);
    // The PSI's reference sample is evidence too: its uploader is an author.
    if (run.referenceHoldoutId) holdoutIds.add(run.referenceHoldoutId);
  }
  // The comparison's own holdout is usually loaded with it: only the others are read.
  if (comparison.holdout) {
    authors.add(comparison.holdout.uploadedById);
    holdoutIds.delete(comparison.holdout.id);
  }
  if (holdoutIds.size > 0) {
    const holdouts = await source.getRepository(Holdout).find({ where: { id: In([...holdoutIds]) }, select: { id: true, uploadedById: true } });
    for (const holdout of holdouts) authors.add(holdout.uploadedById);
  }
  const submitters = await source
    .getRepository(AuditEvent)
    .find({ where: { targetType: 'comparison', targetId: String(comparison.id), action: 'comparison.submitted' }, select: { id: true, actorId: true } });
  for (const event of submitters) if (event.actorId !== null) authors.add(event.actorId);
  return authors;
}

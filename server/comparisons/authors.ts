import { In, type DataSource, type EntityManager } from 'typeorm';
import { AnalysisRun, Holdout, type Comparison } from '../db/entities/index';

/**
 * The ids of the people who shaped a comparison's evidence: its creator, the uploader of its
 * holdout and of every holdout one of its runs used, and whoever set up one of its runs. The
 * four-eyes rule keeps each of them from reviewing, voting on or deciding it.
 */
export async function authorsOf(source: DataSource | EntityManager, comparison: Comparison): Promise<Set<number>> {
  const authors = new Set<number>([comparison.createdById]);
  if (comparison.holdout) authors.add(comparison.holdout.uploadedById);
  const runs = await source.getRepository(AnalysisRun).find({ where: { comparisonId: comparison.id }, select: { requestedById: true, holdoutId: true } });
  const holdoutIds = new Set<number>([comparison.holdoutId]);
  for (const run of runs) {
    authors.add(run.requestedById);
    holdoutIds.add(run.holdoutId);
  }
  const holdouts = await source.getRepository(Holdout).find({ where: { id: In([...holdoutIds]) }, select: { id: true, uploadedById: true } });
  for (const holdout of holdouts) authors.add(holdout.uploadedById);
  return authors;
}

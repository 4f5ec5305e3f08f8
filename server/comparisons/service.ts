import type {
  ComparisonDetail,
  ComparisonList,
  ComparisonState,
  CreateComparisonInput,
  ListComparisonsQuery,
  SetupComparisonInput,
} from '@shared/comparisons';
import { analysisSettingsSchema, type AnalysisSettings, type ColumnMapping } from '@shared/report';
import { In, type DataSource, type EntityManager } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import type { AppContext } from '../context';
import { AnalysisRun, Comparison, type Holdout, type RunInput, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { isPostgres, jsonNumberSql, likeSql, numberOf, rawQuery } from '../db/driver';
import { conflict, notFound } from '../errors';
import type { EncodedColumn } from '../holdouts/columns';
import { findHoldout, mapHoldout, mapReference } from '../holdouts/service';
import { currentVerdict, currentVerdicts } from './current-verdict';
import { decidedOf } from './decided';

// The verdict a comparison shows everywhere, for the workflow's e-mails too.
export { currentVerdict } from './current-verdict';
import { authorsOf } from './authors';
import { presentDetail, presentSummary } from './present';
import { setupStates } from '@shared/workflow';
import { requireState, transition } from './state';

/**
 * Comparisons: creation and set-up (the mapping is applied to the stored holdout first — bad
 * data is a 400 naming the row and column and nothing is stored — then the comparison, its new
 * analysis run with the mapped columns, and the audit event are written in one transaction and
 * the run is queued), the list and the detail, and the current run's report.
 * The current run is the newest run that is done; its report is what the pages show.
 */

/** States from which a modeler may change the mapping or settings (a new run starts). */
export { setupStates } from '@shared/workflow';

/** The mapping in the form the CLI builds it, so that the stored report equals the CLI's. */
export function normaliseMapping(mapping: ColumnMapping): ColumnMapping {
  const normal: ColumnMapping = {
    outcome: mapping.outcome,
    badValue: mapping.badValue,
    champion: mapping.champion,
    challenger: mapping.challenger,
    higherIs: { champion: mapping.higherIs.champion, challenger: mapping.higherIs.challenger },
    id: mapping.id ?? null,
    segments: mapping.segments ?? [],
    exposure: mapping.exposure ?? null,
  };
  if (mapping.weight) normal.weight = mapping.weight;
  // Applicants without an outcome, in the order the CLI sets them (cli/compare.ts).
  if (mapping.keepUnknown) {
    normal.keepUnknown = true;
    if (mapping.unknownValues && mapping.unknownValues.length > 0) normal.unknownValues = mapping.unknownValues;
    if (mapping.inferredBad) normal.inferredBad = mapping.inferredBad;
  }
  // Calibration and stability columns, only when given (earlier mappings keep their form).
  if (mapping.probabilityOfDefault) normal.probabilityOfDefault = { champion: mapping.probabilityOfDefault.champion, challenger: mapping.probabilityOfDefault.challenger };
  if (mapping.grades && (mapping.grades.champion || mapping.grades.challenger)) {
    normal.grades = { champion: mapping.grades.champion ?? null, challenger: mapping.grades.challenger ?? null };
  }
  if (mapping.period) normal.period = mapping.period;
  // Several challengers: names and further challengers only when given (a two-model mapping keeps its form).
  if (mapping.championName !== undefined) normal.championName = mapping.championName;
  if (mapping.challengerName !== undefined) normal.challengerName = mapping.challengerName;
  if (mapping.moreChallengers && mapping.moreChallengers.length > 0) {
    normal.moreChallengers = mapping.moreChallengers.map((extra) => ({ column: extra.column, higherIs: extra.higherIs, ...(extra.name !== undefined ? { name: extra.name } : {}) }));
  }
  return normal;
}

/**
 * Comparisons with their creator and holdout — the holdout without what only its own page shows
 * (columns, preview, mapping guess: JSON that would be parsed on every request for nothing).
 */
function comparisonsWithRelations(source: DataSource | EntityManager) {
  return source
    .getRepository(Comparison)
    .createQueryBuilder('comparison')
    .leftJoinAndSelect('comparison.createdBy', 'createdBy')
    .leftJoin('comparison.holdout', 'holdout')
    .addSelect(holdoutSummaryColumns.map((column) => `holdout.${column}`));
}
const holdoutSummaryColumns = ['id', 'fileName', 'sha256', 'bytes', 'rowCount', 'delimiter', 'chunkSize', 'chunkCount', 'uploadedById', 'uploadedAt'] as const;

export async function findComparison(source: DataSource | EntityManager, id: number): Promise<Comparison> {
  const comparison = await comparisonsWithRelations(source).where('comparison.id = :id', { id }).getOne();
  if (!comparison) throw notFound(`There is no comparison ${id}.`);
  return comparison;
}

/** The newest done run of a comparison, or null. */
export async function currentRun(source: DataSource | EntityManager, comparisonId: number, withReport = false): Promise<AnalysisRun | null> {
  const query = source
    .getRepository(AnalysisRun)
    .createQueryBuilder('run')
    .where('run.comparisonId = :comparisonId', { comparisonId })
    .andWhere("run.status = 'done'")
    .orderBy('run.id', 'DESC')
    .limit(1);
  if (withReport) query.addSelect('run.report');
  return query.getOne();
}

/**
 * The current run, or 404 without the comparison and 409 while no run is done. The done run is
 * looked up first: one implies its comparison exists, so the comparison is read only without one.
 */
export async function requireCurrentRun(source: DataSource | EntityManager, comparisonId: number, withReport = false): Promise<AnalysisRun> {
  const run = await currentRun(source, comparisonId, withReport);
  if (!run) {
    await findComparison(source, comparisonId); // throws the 404
    const latest = await source.getRepository(AnalysisRun).findOne({ where: { comparisonId }, order: { id: 'DESC' } });
    const why = !latest
      ? 'it has no analysis yet (set its mapping first)'
      : latest.status === 'failed'
        ? `its analysis failed: ${latest.error ?? 'no reason recorded'}`
        : `its analysis is ${latest.status} (${Math.round(latest.progress * 100)}%)`;
    throw conflict(`This comparison has no finished analysis yet: ${why}.`, { latestRun: latest ? { id: latest.id, status: latest.status } : null });
  }
  return run;
}

interface PreparedRun {
  holdout: Holdout;
  mapping: ColumnMapping;
  settings: AnalysisSettings;
  input: RunInput;
  columns: EncodedColumn[];
  /** The PSI's reference holdout, when the set-up chose one. */
  referenceHoldoutId?: number | null;
}

/** Reads the chosen reference sample's scores into the prepared run (a 400 naming row and column on bad data). */
async function withReference(ctx: AppContext, prepared: PreparedRun, referenceHoldoutId: number | null | undefined): Promise<PreparedRun> {
  if (referenceHoldoutId === undefined || referenceHoldoutId === null) return prepared;
  const holdout = await findHoldout(ctx.dataSource, referenceHoldoutId);
  const mapped = await mapReference(ctx, holdout, prepared.mapping, prepared.settings.dropMissing);
  return { ...prepared, input: { ...prepared.input, reference: mapped.reference }, columns: [...prepared.columns, ...mapped.columns], referenceHoldoutId: holdout.id };
}

/** Inserts a queued run with its input columns. */
async function insertRun(manager: EntityManager, comparisonId: number, prepared: PreparedRun, actor: User): Promise<AnalysisRun> {
  const run = await manager.save(
    manager.create(AnalysisRun, {
      comparisonId,
      holdoutId: prepared.holdout.id,
      status: 'queued',
      progress: 0,
      stage: 'Waiting to start',
      attempts: 0,
      error: null,
      engineVersion: null,
      queuedAt: now(),
      startedAt: null,
      finishedAt: null,
      mapping: prepared.mapping,
      settings: prepared.settings,
      input: prepared.input,
      report: null,
      headline: null,
      requestedById: actor.id,
      referenceHoldoutId: prepared.referenceHoldoutId ?? null,
    }),
  );
  for (const column of prepared.columns) {
    await rawQuery(manager, 'INSERT INTO "run_columns" ("runId", "name", "data") VALUES (?, ?, ?)', [run.id, column.name, column.data]);
    // A turn for other requests between columns (8 MB each at 1,000,000 accounts).
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
  return run;
}

function auditMapping(prepared: PreparedRun) {
  return {
    holdoutId: prepared.holdout.id,
    sha256: prepared.holdout.sha256,
    mapping: prepared.mapping,
    settings: prepared.settings,
    rowsUsed: prepared.input.n,
    rowsDroppedMissingScore: prepared.input.read.rowsDroppedMissingScore,
    ...(prepared.input.reference ? { reference: prepared.input.reference } : {}),
  };
}

export async function createComparison(ctx: AppContext, actor: User, input: CreateComparisonInput): Promise<{ id: number; state: ComparisonState }> {
  const holdout = await findHoldout(ctx.dataSource, input.holdoutId);
  const settings = analysisSettingsSchema.parse(input.settings ?? {});
  let prepared: PreparedRun | null = null;
  if (input.mapping) {
    const mapping = normaliseMapping(input.mapping);
    prepared = await withReference(ctx, { holdout, mapping, settings, ...(await mapHoldout(ctx, holdout, mapping, settings.dropMissing)) }, input.referenceHoldoutId);
  }
  const created = await inTransaction(ctx.dataSource, async (manager) => {
    const at = now();
    const comparison = await manager.save(
      manager.create(Comparison, {
        name: input.name,
        description: input.description ? input.description : null,
        holdoutId: holdout.id,
        mapping: prepared?.mapping ?? null,
        settings,
        state: 'draft',
        createdById: actor.id,
        createdAt: at,
        updatedAt: at,
      }),
    );
    const run = prepared ? await insertRun(manager, comparison.id, prepared, actor) : null;
    await recordAudit(manager, {
      actor,
      action: 'comparison.created',
      target: { type: 'comparison', id: comparison.id },
      details: prepared
        ? { name: comparison.name, ...auditMapping(prepared), runId: run!.id }
        : { name: comparison.name, holdoutId: holdout.id, sha256: holdout.sha256, mapping: null, settings },
    });
    return { comparison, run };
  });
  if (created.run) ctx.jobs.kick();
  return { id: created.comparison.id, state: created.comparison.state };
}

export async function setupComparison(ctx: AppContext, actor: User, id: number, input: SetupComparisonInput): Promise<ComparisonDetail> {
  const comparison = await findComparison(ctx.dataSource, id);
  // Checked before the (possibly long) read, and again inside the transaction by transition().
  requireState(comparison, setupStates, 'its mapping and settings can change only while it is a draft, analysed or returned');
  const holdout = input.holdoutId === undefined || input.holdoutId === comparison.holdoutId ? comparison.holdout : await findHoldout(ctx.dataSource, input.holdoutId);
  // shared/comparisons.ts parses `settings` with analysisSettingsSchema.partial(), which still fills
  // in every default: given settings are therefore complete. Without them the current ones stay.
  const settings = analysisSettingsSchema.parse(input.settings ?? comparison.settings ?? {});
  const mapping = normaliseMapping(input.mapping);
  const prepared = await withReference(ctx, { holdout, mapping, settings, ...(await mapHoldout(ctx, holdout, mapping, settings.dropMissing)) }, input.referenceHoldoutId);

  await inTransaction(ctx.dataSource, async (manager) => {
    const at = now();
    // Runs of an earlier set-up that have not started yet would only be overtaken: end them.
    const superseded = await manager.find(AnalysisRun, { where: { comparisonId: id, status: 'queued' }, select: { id: true } });
    if (superseded.length > 0) {
      await manager.update(
        AnalysisRun,
        { id: In(superseded.map((run) => run.id)) },
        { status: 'failed', stage: 'Replaced', error: 'Replaced by a newer set-up before it started.', finishedAt: at },
      );
    }
    const run = await insertRun(manager, id, prepared, actor);
    await manager.update(Comparison, { id }, { holdoutId: holdout.id, mapping, settings, updatedAt: at });
    await transition(manager, id, setupStates, 'draft', {
      actor,
      action: 'comparison.setup',
      details: {
        ...auditMapping(prepared),
        runId: run.id,
        supersededRunIds: superseded.map((r) => r.id),
        // A set-up by another modeler than the creator is recorded and named as such (issue 13).
        ...(actor.id !== comparison.createdById ? { byOtherThanCreator: { id: actor.id, name: actor.name }, creator: { id: comparison.createdBy.id, name: comparison.createdBy.name } } : {}),
      },
    });
  });
  ctx.jobs.kick();
  return getComparisonDetail(ctx.dataSource, id);
}

export async function getComparisonDetail(source: DataSource | EntityManager, id: number): Promise<ComparisonDetail> {
  const comparison = await findComparison(source, id);
  // What the detail shows of each run (presentRun, and the current run's headline), and who set it
  // up on which holdout (the four-eyes authors).
  const runs = await source.getRepository(AnalysisRun).find({
    where: { comparisonId: id },
    order: { id: 'DESC' },
    select: {
      id: true,
      comparisonId: true,
      status: true,
      progress: true,
      stage: true,
      attempts: true,
      error: true,
      engineVersion: true,
      queuedAt: true,
      startedAt: true,
      finishedAt: true,
      headline: true,
      requestedById: true,
      holdoutId: true,
      referenceHoldoutId: true,
    },
  });
  const decided = comparison.state === 'decided' ? ((await decidedOf(source, [id])).get(id) ?? null) : null;
  return presentDetail(comparison, runs, await authorsOf(source, comparison, runs), await currentVerdict(source, id), decided);
}

/** ORDER BY for each sort (names ignore ASCII case on both databases). */
function sortSql(source: DataSource, sort: ListComparisonsQuery['sort']): string {
  switch (sort) {
    case 'updated-desc':
      return 'c."updatedAt" DESC, c."id" DESC';
    case 'created-desc':
      return 'c."createdAt" DESC, c."id" DESC';
    case 'name-asc':
      return isPostgres(source) ? `LOWER(c."name") COLLATE "C" ASC, c."id" ASC` : 'c."name" COLLATE NOCASE ASC, c."id" ASC';
    case 'delta-gini-desc':
      return (
        `(SELECT ${jsonNumberSql(source, 'r."headline"', 'deltaGini')} FROM "analysis_runs" r WHERE r."comparisonId" = c."id" AND r."status" = 'done' ` +
        `ORDER BY r."id" DESC LIMIT 1) DESC NULLS LAST, c."updatedAt" DESC, c."id" DESC`
      );
  }
}

/** Filter by state, search in the name and description, sort, one page; headline numbers from each current run. */
export async function listComparisons(source: DataSource, query: ListComparisonsQuery): Promise<ComparisonList> {
  const where: string[] = [];
  const parameters: unknown[] = [];
  if (query.state) {
    where.push('c."state" = ?');
    parameters.push(query.state);
  }
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, (character) => `\\${character}`)}%`;
    const match = likeSql(source);
    where.push(`(c."name" ${match} ? ESCAPE '\\' OR c."description" ${match} ? ESCAPE '\\')`);
    parameters.push(like, like);
  }
  const whereSql = where.length > 0 ? `WHERE ${where.join(' AND ')}` : '';
  const [counted] = await rawQuery<{ total: number | string }>(source, `SELECT COUNT(*) AS "total" FROM "comparisons" c ${whereSql}`, parameters);
  const total = numberOf(counted.total);
  const page = await rawQuery<{ id: number }>(source, `SELECT c."id" AS "id" FROM "comparisons" c ${whereSql} ORDER BY ${sortSql(source, query.sort)} LIMIT ? OFFSET ?`, [
    ...parameters,
    query.pageSize,
    (query.page - 1) * query.pageSize,
  ]);
  const ids = page.map((row) => row.id);
  if (ids.length === 0) return { items: [], total, page: query.page, pageSize: query.pageSize };

  // Only what the list shows (presentSummary): no mapping, settings, roles or password hash to parse.
  const comparisons = await source
    .getRepository(Comparison)
    .createQueryBuilder('comparison')
    .select(['comparison.id', 'comparison.name', 'comparison.state', 'comparison.createdAt', 'comparison.updatedAt', 'comparison.createdById', 'comparison.holdoutId'])
    .leftJoin('comparison.createdBy', 'createdBy')
    .addSelect(['createdBy.id', 'createdBy.name'])
    .leftJoin('comparison.holdout', 'holdout')
    .addSelect(['holdout.id', 'holdout.fileName', 'holdout.rowCount'])
    .where('comparison.id IN (:...ids)', { ids })
    .getMany();
  const runIds = await rawQuery<{ id: number }>(
    source,
    `SELECT MAX("id") AS "id" FROM "analysis_runs" WHERE "comparisonId" IN (${ids.map(() => '?').join(', ')}) GROUP BY "comparisonId" ` +
      `UNION SELECT MAX("id") FROM "analysis_runs" WHERE "status" = 'done' AND "comparisonId" IN (${ids.map(() => '?').join(', ')}) GROUP BY "comparisonId"`,
    [...ids, ...ids],
  );
  // Only what the list shows of each run (not its mapping, settings and input).
  const runs =
    runIds.length > 0
      ? await source.getRepository(AnalysisRun).find({
          where: { id: In(runIds.map((row) => row.id)) },
          select: { id: true, comparisonId: true, status: true, progress: true, stage: true, headline: true },
        })
      : [];
  const byId = new Map(comparisons.map((comparison) => [comparison.id, comparison]));
  const verdicts = await currentVerdicts(source, ids);
  const decided = await decidedOf(
    source,
    comparisons.filter((comparison) => comparison.state === 'decided').map((comparison) => comparison.id),
  );
  const items = ids.map((id) => {
    const mine = runs.filter((run) => run.comparisonId === id).sort((a, b) => b.id - a.id);
    return presentSummary(byId.get(id)!, mine[0] ?? null, mine.find((run) => run.status === 'done') ?? null, verdicts.get(id) ?? null, decided.get(id) ?? null);
  });
  return { items, total, page: query.page, pageSize: query.pageSize };
}

/**
 * The current run's report as the stored JSON text (404 without the comparison, 409 while no run
 * is done). One plain query in the usual case: a done run implies its comparison exists, and the
 * text is sent as it is stored, without building the run's entity.
 */
export async function currentReportJson(source: DataSource | EntityManager, comparisonId: number): Promise<{ runId: number; json: string }> {
  const [row] = await rawQuery<{ id: number; report: string | null }>(
    source,
    `SELECT "id", "report" FROM "analysis_runs" WHERE "comparisonId" = ? AND "status" = 'done' ORDER BY "id" DESC LIMIT 1`,
    [comparisonId],
  );
  if (!row) {
    await requireCurrentRun(source, comparisonId); // throws the 404 or the 409 that says why
    throw new Error(`comparison ${comparisonId}: no done run, yet requireCurrentRun found one`);
  }
  if (row.report === null) throw new Error(`analysis run ${row.id} is done but has no report`);
  return { runId: row.id, json: row.report };
}

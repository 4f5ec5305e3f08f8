import { flaggedSegmentsOf } from '@shared/challenger-sections';
import { segmentFlagsText } from '@shared/segments-words';
import { equalApprovalSentence } from '@shared/equal-approval-words';
import { segmentsTable } from '@shared/segments-words';
import { type WordedTable } from '@shared/word-table';
import { parseArgs } from 'node:util';
import { MISSING, formatCount, formatFixed, formatGini, formatPStatement, formatPercent, formatSignedNumber } from '@shared/format';
import {
  type AnalysisSettings,
  type ColumnMapping,
  fullSwapCell,
  type HigherIs,
  inferenceOf,
  MAX_CHALLENGERS,
  modelNameSchema,
  populationOf,
  type RejectInference,
  rejectInferenceMethods,
  type Report,
  swapInRiskier,
} from '@shared/report';
import { HoldoutInputError } from '@server/reader/errors';
import { fileWithSheet } from '@shared/input-file';
import { loadHoldout } from '@server/reader/load';
import { loadReference } from '@server/reader/load-reference';
import { calibrationStabilityLines } from './calibration-text';
import { buildReport } from '@server/stats/report';
import { StatisticError } from '@server/stats/statistic-error';

/**
 * `npm run compare -- FILE [options]`: the champion–challenger comparison of one holdout file,
 * the same report the API serves. With --json the report is printed as JSON on stdout and nothing
 * else; without it, a readable summary. Exit 0 on success, 2 on bad input (one line on stderr,
 * naming the row and column), 1 on anything unexpected — never a stack trace.
 */

export const usage = `Usage: npm run -s compare -- FILE [options]

Compares a challenger credit-scoring model with the champion on one holdout CSV (one row per
account: the observed outcome and both models' scores) and prints the report.

Columns
  --sheet NAME               for an .xlsx holdout: the worksheet to read (default: the first;
                             a --reference workbook is read from its first sheet)
  --outcome COL              outcome column (default: bad)
  --bad-value V              the outcome value that means bad (default: 1)
  --champion COL             champion's score column (default: champion)
  --challenger COL           challenger's score column (default: challenger); repeat it for
                             several challengers (1 to 5; the first is the primary one)
  --challenger-name NAME     the modeler's name of each challenger, in the same order (optional)
  --champion-name NAME       the modeler's name of the champion (optional)
  --higher-is safer|riskier  orientation of both scores (default: safer; points are safer,
                             probabilities of default riskier)
  --champion-higher-is safer|riskier     orientation of the champion's score only
  --challenger-higher-is safer|riskier   orientation of the challenger's score only; with several
                             challengers give it once per --challenger, in the same order
  --segment COL              a categorical column to compare within (repeatable)
  --exposure COL             exposure / amount column, summed in the swap sets
  --id COL                   account id column
  --drop-missing             leave out (and count) rows with an empty score instead of stopping
  --pd champion|challenger   that model's score is a probability of default (higher = riskier,
                             0 to 1): its calibration is computed (repeatable)
  --grade-champion COL       rating grade column of the champion (calibration by grade)
  --grade-challenger COL     rating grade column of the challenger
  --period COL               month or vintage column: Gini, KS and ΔGini by period
  --reference FILE           the development sample (the same score columns, no outcome needed):
                             PSI of each model's score against the holdout
  --reference-period V       or: the accounts of period V are the PSI's reference
  --weight COL               sampling weight column: a positive number per row, each row
                             standing for that many applicants
  --keep-unknown             keep applicants without an outcome (e.g. declined, never booked):
                             a blank outcome marks the row unknown instead of being an error
  --unknown-value V          an outcome value that also means "no outcome" (repeatable; e.g. R)
  --inferred-bad COL         each unknown applicant's probability of bad, 0 to 1 (e.g. from the
                             bureau), required on every unknown row; for --reject-inference column

Analysis
  --bootstrap B              bootstrap replicates, 0 to skip (default: 2000)
  --seed N                   random seed of the bootstrap (default: 1)
  --confidence C             confidence level of every interval (default: 0.95)
  --cutoff-champion X        champion's cut-off (accounts on the safe side, X included, are
  --cutoff-challenger Y      accepted); give both, or neither to match an approval rate
  --approval-rate R          approval rate for matched cut-offs (default: 0.7)
  --reject-inference known-only|parcel|column
                             how the unknown applicants' bad rate is stated in the swap sets
                             (default known-only: known outcomes, with the bounds beside them)
  --parcel-factor K          parcelling: an unknown applicant in champion band b counts
                             min(1, K × the band's known bad rate) bads (default 1)

Output
  --json                     the report as JSON on stdout, nothing else
  --help                     this text

Exit status: 0 done, 2 bad input (a one-line message on stderr naming the row and column),
1 unexpected failure. Use "npm run -s compare" (or node dist/server/cli/compare.js): plain
"npm run compare" prints npm's own banner on stdout before the report.

The verdict follows the default adoption policy. Statistical significance is not business
approval: a new model changes who is approved and declined, so fair-lending and adverse-action
duties apply; defer to your institution's model risk policy, local regulation and licensed advice.
`;

/** Bad command-line input: exit 2 with this message. */
class UsageError extends Error {}

const options = {
  sheet: { type: 'string' },
  outcome: { type: 'string' },
  'bad-value': { type: 'string' },
  champion: { type: 'string' },
  challenger: { type: 'string', multiple: true },
  'challenger-name': { type: 'string', multiple: true },
  'champion-name': { type: 'string' },
  'higher-is': { type: 'string' },
  'champion-higher-is': { type: 'string' },
  'challenger-higher-is': { type: 'string', multiple: true },
  bootstrap: { type: 'string' },
  seed: { type: 'string' },
  confidence: { type: 'string' },
  'cutoff-champion': { type: 'string' },
  'cutoff-challenger': { type: 'string' },
  'approval-rate': { type: 'string' },
  segment: { type: 'string', multiple: true },
  exposure: { type: 'string' },
  id: { type: 'string' },
  'drop-missing': { type: 'boolean' },
  pd: { type: 'string', multiple: true },
  'grade-champion': { type: 'string' },
  'grade-challenger': { type: 'string' },
  period: { type: 'string' },
  reference: { type: 'string' },
  'reference-period': { type: 'string' },
  weight: { type: 'string' },
  'keep-unknown': { type: 'boolean' },
  'unknown-value': { type: 'string', multiple: true },
  'inferred-bad': { type: 'string' },
  'reject-inference': { type: 'string' },
  'parcel-factor': { type: 'string' },
  json: { type: 'boolean' },
  help: { type: 'boolean', short: 'h' },
} as const;

export interface CompareCommand {
  help: boolean;
  file: string;
  json: boolean;
  dropMissing: boolean;
  mapping: ColumnMapping;
  settings: Partial<AnalysisSettings>;
  /** The development sample's file, for the PSI; null without one. */
  reference: string | null;
  /** The worksheet of an .xlsx holdout (and reference) to read; null: the first. */
  sheet: string | null;
}

function orientation(value: string | undefined, fallback: HigherIs, flag: string): HigherIs {
  if (value === undefined) return fallback;
  if (value === 'safer' || value === 'riskier') return value;
  throw new UsageError(`${flag} must be "safer" or "riskier", got "${value}"`);
}

function number(value: string | undefined, flag: string, check: (v: number) => boolean, rule: string): number | undefined {
  if (value === undefined) return undefined;
  const parsed = value.trim() === '' ? NaN : Number(value);
  if (!Number.isFinite(parsed) || !check(parsed)) throw new UsageError(`${flag} must be ${rule}, got "${value}"`);
  return parsed;
}

/** `--cutoff-champion -1.5` → `--cutoff-champion=-1.5`: parseArgs would read -1.5 as an option. */
function joinNegativeValues(argv: string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const name = argv[i].startsWith('--') ? argv[i].slice(2) : '';
    const spec = (options as Record<string, { type: string }>)[name];
    if (spec?.type === 'string' && i + 1 < argv.length && /^-\d|^-\.\d/.test(argv[i + 1])) {
      out.push(`${argv[i]}=${argv[i + 1]}`);
      i++;
    } else out.push(argv[i]);
  }
  return out;
}

export function parseCommand(argv: string[]): CompareCommand {
  let parsed;
  try {
    parsed = parseArgs({ args: joinNegativeValues(argv), options, allowPositionals: true, strict: true });
  } catch (error) {
    throw new UsageError((error as Error).message.split('\n')[0]);
  }
  const { values, positionals } = parsed;
  if (values.help) {
    return { help: true, file: '', json: false, dropMissing: false, mapping: {} as ColumnMapping, settings: {}, reference: null, sheet: null };
  }
  if (positionals.length !== 1) {
    throw new UsageError(positionals.length === 0 ? 'give the holdout CSV file (see --help)' : `give one holdout file, got ${positionals.length}: ${positionals.join(', ')}`);
  }
  const both = orientation(values['higher-is'], 'safer', '--higher-is');
  // Several challengers: --challenger repeated (the first is the primary), each orientation and
  // name in the same order.
  const challengers = values.challenger ?? ['challenger'];
  const orientations = values['challenger-higher-is'] ?? [];
  const names = values['challenger-name'] ?? [];
  if (challengers.length > MAX_CHALLENGERS) throw new UsageError(`give at most ${MAX_CHALLENGERS} --challenger columns, got ${challengers.length}`);
  if (orientations.length > 0 && orientations.length !== challengers.length) {
    throw new UsageError(`give --challenger-higher-is once per --challenger, in the same order (${challengers.length} challengers, ${orientations.length} orientations)`);
  }
  if (names.length > 0 && names.length !== challengers.length) {
    throw new UsageError(`give --challenger-name once per --challenger, in the same order (${challengers.length} challengers, ${names.length} names)`);
  }
  const higherOf = (k: number) => orientation(orientations[k], both, '--challenger-higher-is');
  const mapping: ColumnMapping = {
    outcome: values.outcome ?? 'bad',
    badValue: values['bad-value'] ?? '1',
    champion: values.champion ?? 'champion',
    challenger: challengers[0],
    higherIs: {
      champion: orientation(values['champion-higher-is'], both, '--champion-higher-is'),
      challenger: higherOf(0),
    },
    id: values.id ?? null,
    segments: values.segment ?? [],
    exposure: values.exposure ?? null,
  };
  for (const [flag, name] of [['--champion-name', values['champion-name']], ...names.map((name) => ['--challenger-name', name] as const)] as const) {
    if (name !== undefined && !modelNameSchema.safeParse(name).success) throw new UsageError(`${flag} must be one line of 1 to 80 characters, got "${name}"`);
  }
  if (values['champion-name'] !== undefined) mapping.championName = values['champion-name'].trim();
  if (names.length > 0) mapping.challengerName = names[0].trim();
  if (challengers.length > 1) {
    mapping.moreChallengers = challengers.slice(1).map((column, k) => ({ column, higherIs: higherOf(k + 1), ...(names.length > 0 ? { name: names[k + 1].trim() } : {}) }));
  }
  // Calibration and stability columns, only when given (the mapping stays the CLI's earlier form otherwise).
  const pdModels = values.pd ?? [];
  for (const model of pdModels) {
    if (model !== 'champion' && model !== 'challenger') throw new UsageError(`--pd must be "champion" or "challenger", got "${model}"`);
  }
  if (pdModels.length > 0) mapping.probabilityOfDefault = { champion: pdModels.includes('champion'), challenger: pdModels.includes('challenger') };
  if (values['grade-champion'] !== undefined || values['grade-challenger'] !== undefined) {
    mapping.grades = { champion: values['grade-champion'] ?? null, challenger: values['grade-challenger'] ?? null };
  }
  if (values.period !== undefined) mapping.period = values.period;
  if (values.reference !== undefined && values['reference-period'] !== undefined) throw new UsageError('give --reference or --reference-period, not both');
  if (values['reference-period'] !== undefined && values.period === undefined) throw new UsageError('--reference-period needs --period');
  if (values.weight !== undefined) mapping.weight = values.weight;
  if (values['keep-unknown']) mapping.keepUnknown = true;
  if (values['unknown-value'] !== undefined) {
    if (!values['keep-unknown']) throw new UsageError('--unknown-value needs --keep-unknown');
    mapping.unknownValues = values['unknown-value'];
  }
  if (values['inferred-bad'] !== undefined) {
    if (!values['keep-unknown']) throw new UsageError('--inferred-bad needs --keep-unknown');
    mapping.inferredBad = values['inferred-bad'];
  }
  for (const [flag, value] of [['--outcome', mapping.outcome], ['--bad-value', mapping.badValue], ['--champion', mapping.champion], ...challengers.map((column) => ['--challenger', column])]) {
    if (value.trim() === '') throw new UsageError(`${flag} must not be empty`);
  }
  const settings: Partial<AnalysisSettings> = {};
  const replicates = number(values.bootstrap, '--bootstrap', (v) => Number.isInteger(v) && v >= 0 && v <= 20000, 'a whole number from 0 to 20000');
  if (replicates !== undefined) settings.bootstrap = replicates;
  const seed = number(values.seed, '--seed', (v) => Number.isInteger(v) && v >= 0 && v <= 2 ** 31 - 1, 'a whole number from 0 to 2147483647');
  if (seed !== undefined) settings.seed = seed;
  const confidence = number(values.confidence, '--confidence', (v) => v > 0.5 && v < 1, 'between 0.5 and 1 (e.g. 0.95)');
  if (confidence !== undefined) settings.confidence = confidence;
  const approvalRate = number(values['approval-rate'], '--approval-rate', (v) => v > 0 && v < 1, 'between 0 and 1 (e.g. 0.7)');
  if (approvalRate !== undefined) settings.approvalRate = approvalRate;
  const cutoffChampion = number(values['cutoff-champion'], '--cutoff-champion', () => true, 'a number');
  const cutoffChallenger = number(values['cutoff-challenger'], '--cutoff-challenger', () => true, 'a number');
  if ((cutoffChampion === undefined) !== (cutoffChallenger === undefined)) {
    throw new UsageError('give both --cutoff-champion and --cutoff-challenger, or neither (then --approval-rate matches them)');
  }
  if (cutoffChampion !== undefined && cutoffChallenger !== undefined) {
    if (approvalRate !== undefined) throw new UsageError('give cut-offs or --approval-rate, not both');
    settings.cutoffs = { champion: cutoffChampion, challenger: cutoffChallenger };
  }
  settings.dropMissing = values['drop-missing'] ?? false;
  if (values['reference-period'] !== undefined) settings.referencePeriod = values['reference-period'];
  const method = values['reject-inference'];
  const parcelFactor = number(values['parcel-factor'], '--parcel-factor', (v) => v > 0 && v <= 20, 'a number above 0 and at most 20');
  if (method !== undefined || parcelFactor !== undefined) {
    if (method !== undefined && !rejectInferenceMethods.includes(method as RejectInference['method'])) {
      throw new UsageError(`--reject-inference must be known-only, parcel or column, got "${method}"`);
    }
    const chosen = (method ?? 'known-only') as RejectInference['method'];
    if (parcelFactor !== undefined && chosen !== 'parcel') throw new UsageError('--parcel-factor goes with --reject-inference parcel');
    if (chosen === 'column' && mapping.inferredBad === undefined) throw new UsageError('--reject-inference column needs --inferred-bad COL');
    settings.rejectInference = { method: chosen, parcelFactor: parcelFactor ?? 1 };
  }
  return { help: false, file: positionals[0], json: values.json ?? false, dropMissing: settings.dropMissing, mapping, settings, reference: values.reference ?? null, sheet: values.sheet ?? null };
}

// --- the readable summary ------------------------------------------------------------------
// Numbers as everywhere else (shared/format.ts): Gini and KS in points, rates as percentages,
// differences signed with a real minus, p-values with three significant digits.
const pct = (value: number | null, digits = 1) => formatPercent(value, digits);
const points = (value: number) => formatGini(value);
const signed = (value: number, digits = 1) => formatSignedNumber(value * 100, digits);
const range = (ci: [number, number] | null, format: (v: number) => string) => (ci === null ? MISSING : `[${format(ci[0])}, ${format(ci[1])}]`);
const int = (value: number) => formatCount(value);
const pStatement = (p: number | null) => formatPStatement(p);
const pad = (text: string, width: number) => text.padEnd(width);

export function summary(report: Report): string {
  const level = `${Math.round(report.settings.confidence * 1000) / 10}%`;
  const lines: string[] = [];
  const { champion, challenger, difference, swap } = report;
  lines.push(`Scorecourt comparison of ${fileWithSheet(report.input)}`);
  lines.push(`  ${int(report.rows)} accounts, ${int(report.bads)} bads (bad rate ${pct(report.badRate, 2)}); SHA-256 ${report.input.sha256}`);
  if (report.population) {
    const p = populationOf(report);
    lines.push(
      `  ${int(p.rows)} rows standing for ${int(Math.round(p.accounts))} applicants: ${int(Math.round(p.known.accounts))} with an outcome, ${int(Math.round(p.unknown.accounts))} without (${int(p.unknown.rows)} rows); AUC, KS and bad rates use those with an outcome`,
    );
    const inference = inferenceOf(report.settings);
    lines.push(`  reject inference: ${inference.method === 'parcel' ? `parcel, factor ${inference.parcelFactor}` : inference.method}`);
  }
  lines.push(`  engine ${report.engineVersion}; orientation: champion higher = ${champion.higherIs}, challenger higher = ${challenger.higherIs}`);
  lines.push('');
  lines.push(`${pad('', 12)}${pad('Gini', 8)}${pad(`${level} CI (DeLong)`, 22)}${pad('AUC', 9)}${pad('KS', 7)}${pad(`KS ${level} CI`, 18)}KS at score`);
  for (const [name, model] of [
    ['Champion', champion],
    ['Challenger', challenger],
  ] as const) {
    lines.push(
      `${pad(name, 12)}${pad(points(model.gini), 8)}${pad(range(model.giniCi, (v) => points(v)), 22)}${pad(formatFixed(model.auc, 4), 9)}${pad(points(model.ks), 7)}${pad(range(model.ksCi, (v) => points(v)), 18)}${model.ksScore}`,
    );
  }
  lines.push('');
  lines.push('Difference, challenger − champion (Gini and KS in points)');
  lines.push(
    `  ΔGini ${signed(difference.gini, 2)}, ${level} CI ${range(difference.giniCi, (v) => signed(v, 2))} (DeLong)` +
      (difference.giniBootstrapCi ? `, ${range(difference.giniBootstrapCi, (v) => signed(v, 2))} (bootstrap, ${int(report.bootstrap.replicates)} replicates, seed ${report.bootstrap.seed})` : ', bootstrap skipped'),
  );
  if (difference.inference) lines.push(`  No DeLong test or interval: ${difference.inference}`);
  lines.push(`  DeLong z = ${difference.z === null ? MISSING : formatFixed(difference.z, 3)}, one-sided ${pStatement(difference.pOneSided)} (challenger better), two-sided ${pStatement(difference.pTwoSided)}`);
  lines.push(`  ΔKS ${signed(difference.ks, 2)}${difference.ksCi ? `, ${level} CI ${range(difference.ksCi, (v) => signed(v, 2))} (bootstrap)` : ''}`);
  lines.push('');
  const basis =
    swap.basis === 'approval-rate'
      ? `matched approval rate ${pct(swap.requestedApprovalRate)} (achieved: champion ${pct(swap.champion.approvalRate)}, challenger ${pct(swap.challenger.approvalRate)})`
      : `given cut-offs (approval rate: champion ${pct(swap.champion.approvalRate)}, challenger ${pct(swap.challenger.approvalRate)})`;
  lines.push(`Swap sets at ${basis}; cut-offs champion ${swap.champion.cutoff}, challenger ${swap.challenger.cutoff}`);
  for (const [label, cell] of [
    ['both accept', swap.bothAccept],
    ['swap-in', swap.swapIn],
    ['swap-out', swap.swapOut],
    ['both reject', swap.bothReject],
  ] as const) {
    const amount = cell.amount === null ? '' : `, amount ${int(Math.round(cell.amount))}`;
    if (cell.accounts === undefined) {
      lines.push(`  ${pad(label, 12)}${pad(int(cell.count), 10)}${pad(pct(cell.share), 8)}bad rate ${pct(cell.badRate, 2)} ${range(cell.badRateCi, (v) => pct(v, 2))}${amount}`);
    } else {
      const full = fullSwapCell(cell);
      const inferred = full.inferred === null ? '' : `, inferred (${full.inferred.method}) ${pct(full.inferred.badRate, 2)}`;
      lines.push(
        `  ${pad(label, 12)}${pad(int(Math.round(full.accounts)), 10)}${pad(pct(cell.share), 8)}${int(Math.round(full.unknown))} without outcome; known bad rate ${pct(cell.badRate, 2)} ${range(cell.badRateCi, (v) => pct(v, 2))}, bounds ${range(full.badRateBounds, (v) => pct(v, 2))}${inferred}${amount}`,
      );
    }
  }
  const test = swap.test;
  lines.push(`  swap-in vs swap-out bad rate: ${test.method}${test.z === null ? '' : `, z = ${formatFixed(test.z, 3)}`}, ${test.p === null ? `p — (${test.reason})` : pStatement(test.p)}`);
  lines.push(`  ${equalApprovalSentence(report.strategyCurve.atApprovalRate)}`);
  const segmentLabel = (row: { column: string; value: string }) => `${row.column} = ${row.value}`;
  const labelWidth = (rows: { column: string; value: string }[]) => Math.max(30, ...rows.map((row) => segmentLabel(row).length + 2));
  if (swap.bySegment.length > 0) {
    lines.push('');
    lines.push(
      `Swap sets by segment at cut-offs champion ${swap.champion.cutoff}, challenger ${swap.challenger.cutoff} (approval rate and bad rate of the approved book, champion → challenger)`,
    );
    const width = labelWidth(swap.bySegment);
    for (const row of swap.bySegment) {
      const approvals = `approves ${pct(row.champion.approvalRate)} → ${pct(row.challenger.approvalRate)}`;
      const badRates = `bad rate ${pct(row.champion.approvedBadRate, 2)} → ${pct(row.challenger.approvedBadRate, 2)}`;
      // The rate the run states: inferred (and named so) for cells with applicants without an outcome.
      const rate = (cell: typeof row.swapIn) => ((cell.unknown ?? 0) > 0 && cell.inferred ? `${pct(cell.inferred.badRate, 2)} inferred` : pct(cell.badRate, 2));
      const swaps = `swap-in ${int(Math.round(row.swapIn.accounts ?? row.swapIn.count))} (${rate(row.swapIn)}), swap-out ${int(Math.round(row.swapOut.accounts ?? row.swapOut.count))} (${rate(row.swapOut)})`;
      lines.push(`  ${pad(segmentLabel(row), width)}${pad(approvals, 26)}${pad(badRates, 28)}${swaps}${swapInRiskier(row) ? '  (swap-in riskier)' : ''}`);
    }
    lines.push("  (swap-in riskier): its bad rate is above the swap-out's. Point estimates: a small value moves a lot with a few accounts (intervals in --json)");
  }
  // Every challenger's segments in the table the pack and the printable report print (shared/segments-words.ts).
  for (let k = 0; k < Math.max(1, report.challengers?.length ?? 0); k++) {
    const table = segmentsTable(report, k);
    if (!table) continue;
    lines.push('');
    lines.push(`${(report.challengers?.length ?? 0) >= 2 ? `Segments: ${report.challengers![k]!.name} against the champion` : 'Segments'} (ΔGini in points)`);
    lines.push(...textTable(table).map((line) => `  ${line}`));
    lines.push(`  ${table.note}`);
  }
  lines.push(...severalChallengerLines(report, level));
  lines.push(...calibrationStabilityLines(report.calibration, report.stability));
  if (report.dataQuality.warnings.length > 0) {
    lines.push('');
    lines.push('Data quality');
    for (const warning of report.dataQuality.warnings) lines.push(`  ! ${warning}`);
  }
  lines.push('');
  lines.push(`Verdict under adoption policy v${report.verdict.policyVersion}: ${report.verdict.outcome.toUpperCase()}`);
  lines.push(`  ${report.verdict.summary}`);
  for (const criterion of report.verdict.criteria) lines.push(`  [${criterion.met ? 'met' : 'not met'}] ${criterion.label}: ${criterion.detail}`);
  lines.push('');
  lines.push('The verdict advises; the committee decides. Statistical significance is not business approval: a new');
  lines.push("model changes who is approved and declined, so fair-lending and adverse-action duties apply. Defer to the");
  lines.push("institution's model risk policy, local regulation and licensed advice.");
  return lines.join('\n') + '\n';
}

/** A worded table as text: columns padded to their widest cell, figures right-aligned. */
export function textTable(table: WordedTable): string[] {
  const widths = table.head.map((_, column) => Math.max(...[table.head, ...table.rows].map((row) => (row[column] ?? '').length)));
  const line = (row: string[]) =>
    row
      .map((cell, column) => (table.numeric.includes(column) ? cell.padStart(widths[column]!) : cell.padEnd(widths[column]!)))
      .join('  ')
      .trimEnd();
  return [line(table.head), ...table.rows.map(line)];
}

/** Several challengers (two or more): each against the champion, the joint test, every pair, the recommended one. None for one challenger. */
function severalChallengerLines(report: Report, level: string): string[] {
  const challengers = report.challengers ?? [];
  if (challengers.length < 2) return [];
  const lines = ['', `Challengers against the champion (ΔGini in points, ${level} CI by DeLong; p ${report.policy.sided}, Holm-adjusted across ${challengers.length})`];
  const width = Math.max(24, ...challengers.map((challenger) => challenger.name.length + 2));
  challengers.forEach((challenger, index) => {
    const { difference } = challenger;
    const p = report.policy.sided === 'one-sided' ? challenger.pOneSidedHolm : challenger.pTwoSidedHolm;
    lines.push(
      `  ${pad(challenger.name, width)}Gini ${pad(points(challenger.metrics.gini), 7)}ΔGini ${pad(signed(difference.gini, 2), 8)}${pad(range(difference.giniCi, (v) => signed(v, 2)), 20)}Holm ${pad(pStatement(p), 24)}${challenger.verdict.outcome}`,
    );
    // Its flagged segment values (the rows its segment rule was judged on; the first's are under Segments too).
    const flagged = flaggedSegmentsOf(report, index);
    if (flagged.length > 0) lines.push(`  ${pad('', width)}worse than the champion in ${flagged.map((row) => `${row.column} = ${row.value} (${segmentFlagsText(row.flags).toLowerCase()})`).join(', ')}`);
  });
  const joint = report.joint;
  lines.push(joint ? `  Joint test that every challenger equals the champion: χ² = ${formatFixed(joint.chi2, 3)}, df ${joint.df}, ${pStatement(joint.p)}` : '  Joint test: none (no variance)');
  for (const pair of report.pairwise ?? []) {
    lines.push(`  ${challengers[pair.b].name} − ${challengers[pair.a].name}: ΔGini ${signed(pair.deltaGini, 2)}, two-sided ${pStatement(pair.pTwoSided)}`);
  }
  if (report.choice) lines.push(`  ${report.choice.summary}`);
  return lines;
}

// --- running -------------------------------------------------------------------------------
export interface CompareIo {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  /** Show progress on stderr (a terminal). */
  progress: boolean;
}

/** Runs the command; returns the exit status. */
export async function runCompare(argv: string[], io: CompareIo): Promise<number> {
  let command: CompareCommand;
  try {
    command = parseCommand(argv);
  } catch (error) {
    io.stderr(`compare: ${(error as Error).message}\n`);
    return 2;
  }
  if (command.help) {
    io.stdout(usage);
    return 0;
  }
  const { file } = command;
  try {
    const loaded = await loadHoldout({ path: file, sheet: command.sheet }, command.mapping, { dropMissing: command.dropMissing });
    const reference = command.reference === null ? null : await loadReference({ path: command.reference }, command.mapping, { dropMissing: command.dropMissing });
    let shown = -1;
    const report = await buildReport({
      holdout: loaded.holdout,
      input: loaded.input,
      mapping: command.mapping,
      settings: command.settings,
      read: loaded.read,
      reference,
      onProgress: io.progress
        ? ({ fraction, stage }) => {
            const percent = Math.floor(fraction * 100);
            if (percent !== shown) {
              shown = percent;
              io.stderr(`\r${String(percent).padStart(3)}% ${stage.padEnd(40)}`);
            }
          }
        : undefined,
    });
    if (io.progress) io.stderr('\r'.padEnd(50) + '\r');
    io.stdout(command.json ? `${JSON.stringify(report)}\n` : summary(report));
    return 0;
  } catch (error) {
    if (error instanceof HoldoutInputError || error instanceof StatisticError) {
      io.stderr(`compare: ${file}: ${error.message}\n`);
      return 2;
    }
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT' || code === 'EISDIR' || code === 'EACCES') {
      io.stderr(`compare: cannot read ${file}: ${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : 'permission denied'}\n`);
      return 2;
    }
    io.stderr(`compare: unexpected failure: ${(error as Error).message ?? String(error)}\n`);
    return 1;
  }
}

const isMain = process.argv[1] !== undefined && /compare\.(js|ts)$/.test(process.argv[1]);
if (isMain) {
  // A reader that stops early (`| head`) is not an error of ours: end quietly, no stack trace.
  process.stdout.on('error', (error: NodeJS.ErrnoException) => {
    if (error.code === 'EPIPE') process.exit(process.exitCode ?? 0);
    process.stderr.write(`compare: cannot write the output: ${error.message}\n`);
    process.exit(1);
  });
  const write = (stream: NodeJS.WriteStream) => (text: string) => {
    stream.write(text);
  };
  runCompare(process.argv.slice(2), { stdout: write(process.stdout), stderr: write(process.stderr), progress: process.stderr.isTTY === true })
    .then((status) => {
      process.exitCode = status;
    })
    .catch((error: unknown) => {
      process.stderr.write(`compare: unexpected failure: ${(error as Error)?.message ?? String(error)}\n`);
      process.exitCode = 1;
    });
}

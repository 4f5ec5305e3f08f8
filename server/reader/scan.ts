import { type MappingGuess, maxSegmentColumns } from '@shared/comparisons';
import type { ColumnMapping, HigherIs } from '@shared/report';
import { auc } from '@server/stats/auc';
import { scoreBlocks } from '@server/stats/order';
import { type HoldoutSource, sourceInfo } from './byte-source';
import { type CsvLayout } from './csv-records';
import { inSheetOf, readRecords } from './records';
import { columnName, HoldoutInputError, raggedRowMessage } from './errors';
import { boundPreview, PREVIEW_CELL_CHARS } from './preview-bounds';
import { INVALID, MISSING, parseNumber } from './values';
import { formatAuc, formatCount } from '@shared/format';

/**
 * A first look at a holdout file, before any mapping: its columns (what their values look like),
 * the row count, the first 20 rows, the file's SHA-256, and a guess at the mapping — from the
 * column names and from the data. The score orientation is guessed from the data: the AUC of the
 * score against the guessed outcome, taken as "higher = safer", computed on the first
 * ORIENTATION_SAMPLE rows; above ½ means safer, below ½ riskier (a name such as "pd" decides when
 * the AUC is within 0.01 of ½). Everything is a proposal that the person confirms.
 */

export const PREVIEW_ROWS = 20;
/** Distinct values tracked per column; above this a column counts as having "many". */
export const DISTINCT_CAP = 10_000;
/** At most this many distinct text values make a column categorical (a segment candidate). */
export const CATEGORICAL_MAX = 50;
export const ORIENTATION_SAMPLE = 200_000;
export const MAX_PROBLEMS = 20;

export interface ScannedColumn {
  name: string;
  /** numeric: every non-empty value a number; categorical: text with few distinct values; text. */
  kind: 'numeric' | 'categorical' | 'text';
  /** Distinct non-empty values, counted up to DISTINCT_CAP (DISTINCT_CAP + 1 means "more"). */
  distinct: number;
  missing: number;
}

export interface HoldoutScan {
  fileName: string;
  sha256: string;
  bytes: number;
  delimiter: CsvLayout['delimiter'];
  rowCount: number;
  columns: ScannedColumn[];
  /** The first 20 data rows, as text, in column order, within the bounds of preview-bounds.ts (cells cut to 200 characters, 64 KB in all). */
  preview: string[][];
  guess: MappingGuess;
  /** Rows whose field count differs from the header's (the first MAX_PROBLEMS); they are left
   * out of the column statistics and the preview. Loading with a mapping reports them again. */
  problems: { row: number; column: string | null; message: string }[];
  /** The worksheet read, for an .xlsx workbook; null for CSV. */
  sheet: string | null;
}

interface ColumnStats {
  numeric: number;
  missing: number;
  distinct: Set<string>;
  capped: boolean;
  /** The first rows' values as numbers (NaN when missing or text), for the orientation guess. */
  sample: Float64Array;
  /** The first rows' values as text, kept only while the column has few distinct values. */
  sampleText: string[] | null;
}

const OUTCOME_NAMES = /^(bad|bads|is_?bad|bad_?flag|default(ed)?|is_?default|target|outcome|label|y|event|flag|delinquent|dpd\d*|bad_?\w*|\w*_bad|\w*default\w*|charge_?off\w*)$/i;
/** Outcome codes that mean "no outcome" (declined, never booked) in a through-the-door sample. */
const UNKNOWN_CODES = /^(r|rej|reject(ed)?|decline(d)?|-1|n\/?a|\?|unknown|no[ _-]?outcome|not[ _-]?booked)$/i;
const CHAMPION_NAMES = /champ|incumbent|current|production|prod_|baseline|old/i;
const CHALLENGER_NAMES = /chall|candidate|new|proposed|alternative|alt_/i;
const SCORE_NAMES = /score|points|pd|prob|risk|rating|grade|model/i;
const RISKIER_NAMES = /(^|_|\b)pd($|_|\b)|prob|risk|default|bad_rate/i;
const ID_NAMES = /^(id|.*_id|.*id_.*|account.*|acct.*|loan_?(no|number|ref)|customer.*|application_?(no|number|ref)|ref(erence)?)$/i;
const EXPOSURE_NAMES = /exposure|amount|balance|limit|ead|principal|amt|loan_?size/i;

/** The value that means bad, for a two-valued outcome column. */
function badValueOf(values: string[], counts: Map<string, number>): string {
  const lower = values.map((value) => value.toLowerCase());
  for (const candidate of ['1', 'bad', 'b', 'yes', 'y', 'true', 't', 'default', 'd']) {
    const at = lower.indexOf(candidate);
    if (at !== -1 && !(candidate === 'd' && lower.includes('nd'))) return values[at];
  }
  // Otherwise the rarer value: the event is usually the smaller class.
  return [...values].sort((a, b) => (counts.get(a) ?? 0) - (counts.get(b) ?? 0))[0];
}

export async function scanHoldout(source: HoldoutSource, options: { onProgress?: (fraction: number) => void } = {}): Promise<HoldoutScan> {
  const info = sourceInfo(source);
  let header: string[] = [];
  let stats: ColumnStats[] = [];
  let rowCount = 0;
  let statRows = 0;
  const problems: HoldoutScan['problems'] = [];
  let sampleRows = 0;
  let sampleLimit = 0;
  let decimalComma = false;
  let newline: CsvLayout['newline'] = '\n';
  const preview: string[][] = [];

  const layout = await inSheetOf(info, () => readRecords(source, info, {
    onBytes: options.onProgress ? (read) => options.onProgress!(info.bytes > 0 ? Math.min(1, read / info.bytes) : 0) : undefined,
    onHeader(found) {
      header = found.header;
      decimalComma = found.delimiter === ';';
      newline = found.newline;
      const seen = new Set<string>();
      for (const name of header) {
        if (seen.has(name)) throw new HoldoutInputError('duplicate_column', `column ${columnName(name)} appears more than once in the header`, 1, name);
        seen.add(name);
      }
      // Keep the sample within about 20 million values whatever the width.
      sampleLimit = Math.min(ORIENTATION_SAMPLE, Math.floor(20_000_000 / Math.max(1, header.length)));
      stats = header.map(() => ({
        numeric: 0,
        missing: 0,
        distinct: new Set<string>(),
        capped: false,
        sample: new Float64Array(sampleLimit),
        sampleText: [],
      }));
    },
    onRows(rows, lines) {
      for (let r = 0; r < rows.length; r++) {
        const row = rows[r];
        if (row.length !== header.length) {
          if (row.length === 1 && row[0].trim() === '') continue;
          // Counted and reported, not fatal: the validation report lists it with the rest.
          rowCount++;
          if (problems.length < MAX_PROBLEMS) {
            problems.push({ row: lines[r], column: null, message: raggedRowMessage(lines[r], row, header.length, newline) });
          }
          continue;
        }
        statRows++;
        // A long cell is copied cut (through a Buffer: a plain slice would keep the whole field alive).
        if (preview.length < PREVIEW_ROWS) preview.push(row.map((cell) => (cell.length > PREVIEW_CELL_CHARS ? Buffer.from(cell.slice(0, PREVIEW_CELL_CHARS + 1)).toString() : cell)));
        const sampled = sampleRows < sampleLimit;
        for (let c = 0; c < row.length; c++) {
          const cell = row[c];
          const column = stats[c];
          const value = parseNumber(cell, decimalComma);
          if (value === MISSING) {
            column.missing++;
            if (sampled) {
              column.sample[sampleRows] = NaN;
              column.sampleText?.push('');
            }
            continue;
          }
          if (value !== INVALID) column.numeric++;
          if (!column.capped) {
            const text = cell.trim();
            column.distinct.add(text);
            if (column.distinct.size > DISTINCT_CAP) column.capped = true;
          }
          if (sampled) {
            column.sample[sampleRows] = value === INVALID ? NaN : value;
            if (column.sampleText !== null) {
              if (column.distinct.size > CATEGORICAL_MAX) column.sampleText = null;
              else column.sampleText.push(cell.trim());
            }
          }
        }
        if (sampled) sampleRows++;
        rowCount++;
      }
    },
  }));
  if (rowCount === 0) {
    const empty = new HoldoutInputError('no_rows', 'the file has a header but no data rows');
    throw info.sheet === undefined ? empty : empty.inSheet(info.sheet);
  }

  const columns: ScannedColumn[] = header.map((name, c) => {
    const column = stats[c];
    const filled = statRows - column.missing;
    const distinct = column.capped ? DISTINCT_CAP + 1 : column.distinct.size;
    const kind = filled > 0 && column.numeric === filled ? 'numeric' : distinct <= CATEGORICAL_MAX ? 'categorical' : 'text';
    return { name, kind, distinct, missing: column.missing };
  });
  // A score column with a stray bad cell (a spreadsheet's #VALUE!) is still proposed as a score,
  // so the validation step can name the row; "numeric" columns stay strictly numeric.
  const mostlyNumeric = columns.map(
    (column, c) => column.kind === 'numeric' || (statRows - stats[c].missing > 0 && stats[c].numeric / (statRows - stats[c].missing) >= 0.99),
  );
  const guess = guessMapping(header, columns, stats, sampleRows, mostlyNumeric);
  return {
    fileName: info.fileName,
    sha256: info.sha256,
    bytes: info.bytes,
    delimiter: layout.delimiter,
    rowCount,
    columns,
    preview: boundPreview(preview),
    guess,
    problems: info.sheet === undefined ? problems : problems.map((problem) => ({ ...problem, message: new HoldoutInputError('ragged_row', problem.message, problem.row).inSheet(info.sheet!).message })),
    sheet: info.sheet ?? null,
  };
}

function guessMapping(
  header: string[],
  columns: ScannedColumn[],
  stats: ColumnStats[],
  sampleRows: number,
  mostlyNumeric: boolean[],
): MappingGuess {
  const used = new Set<number>();
  const pick = (index: number | undefined): string | null => {
    if (index === undefined || index < 0) return null;
    used.add(index);
    return header[index];
  };
  const indices = header.map((_, c) => c);

  // Outcome: a two-valued column, by name first; or a column named like an outcome whose two
  // most frequent values cover 99% of it (a stray value is then a data error to report later).
  const frequencies = (c: number): [string, number][] => {
    const counts = new Map<string, number>();
    for (const text of stats[c].sampleText ?? []) if (text !== '') counts.set(text, (counts.get(text) ?? 0) + 1);
    return [...counts.entries()].sort((a, b) => b[1] - a[1]);
  };
  const mostlyTwo = (c: number): boolean => {
    const top = frequencies(c);
    const total = top.reduce((sum, [, count]) => sum + count, 0);
    return top.length >= 2 && (top[0][1] + top[1][1]) / total >= 0.99;
  };
  // A through-the-door sample: an outcome-named column whose values are the two outcomes plus a
  // code for "no outcome" (R, reject, -1…) on the declined applicants; the codes are proposed as
  // applicants without an outcome.
  const coded = (c: number): string[] => frequencies(c).map(([value]) => value).filter((value) => UNKNOWN_CODES.test(value));
  const twoWithCodes = (c: number): boolean => {
    const codes = coded(c);
    if (codes.length === 0) return false;
    const rest = frequencies(c).filter(([value]) => !codes.includes(value));
    return rest.length === 2;
  };
  const twoValued = indices.filter((c) => columns[c].distinct === 2);
  const outcomeAt =
    twoValued.find((c) => OUTCOME_NAMES.test(header[c])) ??
    indices.find((c) => OUTCOME_NAMES.test(header[c]) && columns[c].distinct <= 5 && mostlyTwo(c)) ??
    indices.find((c) => OUTCOME_NAMES.test(header[c]) && columns[c].distinct <= 5 && twoWithCodes(c)) ??
    twoValued.find((c) => columns[c].kind === 'numeric') ??
    twoValued[0];
  const outcome = pick(outcomeAt);
  let badValue: string | null = null;
  let badSample: Uint8Array | null = null;
  const unknownValues = outcomeAt !== undefined && !mostlyTwo(outcomeAt) && twoWithCodes(outcomeAt) ? coded(outcomeAt) : [];
  if (outcomeAt !== undefined) {
    const column = stats[outcomeAt];
    const top = frequencies(outcomeAt)
      .filter(([value]) => !unknownValues.includes(value))
      .slice(0, 2);
    const values = top.length === 2 ? top.map(([value]) => value) : [...column.distinct].slice(0, 2);
    badValue = badValueOf(values, new Map(top));
    const goodValue = values.find((value) => value !== badValue);
    if (column.sampleText !== null && column.sampleText.length === sampleRows) {
      badSample = Uint8Array.from(column.sampleText, (text) => (text === badValue ? 1 : text === goodValue ? 0 : 2));
    }
  }

  const idAt = indices.find((c) => !used.has(c) && ID_NAMES.test(header[c]) && columns[c].distinct > CATEGORICAL_MAX);
  const id = pick(idAt);

  // Scores: numeric columns with many values, by name where possible.
  const numeric = indices.filter((c) => !used.has(c) && mostlyNumeric[c] && columns[c].distinct > 2);
  const scoreLike = numeric.filter((c) => !EXPOSURE_NAMES.test(header[c]) || SCORE_NAMES.test(header[c]));
  let championAt = scoreLike.find((c) => CHAMPION_NAMES.test(header[c]));
  let challengerAt = scoreLike.find((c) => c !== championAt && CHALLENGER_NAMES.test(header[c]));
  const rest = scoreLike.filter((c) => c !== championAt && c !== challengerAt);
  const ranked = [...rest.filter((c) => SCORE_NAMES.test(header[c])), ...rest.filter((c) => !SCORE_NAMES.test(header[c]))];
  if (championAt === undefined) championAt = ranked.shift();
  if (challengerAt === undefined) challengerAt = ranked.shift();
  const champion = pick(championAt);
  const challenger = pick(challengerAt);

  const exposureAt = indices.find((c) => !used.has(c) && columns[c].kind === 'numeric' && EXPOSURE_NAMES.test(header[c]));
  const exposure = pick(exposureAt);

  const segments = indices
    .filter((c) => !used.has(c) && columns[c].kind === 'categorical' && columns[c].distinct >= 2)
    .map((c) => header[c])
    .slice(0, maxSegmentColumns);

  const orientation = (at: number | undefined): { higherIs: HigherIs | null; hint: string | null } => {
    if (at === undefined) return { higherIs: null, hint: null };
    const byName: HigherIs = RISKIER_NAMES.test(header[at]) ? 'riskier' : 'safer';
    if (badSample === null) {
      return { higherIs: byName, hint: byName === 'riskier' ? 'the name reads like a probability of default' : 'the usual convention for points' };
    }
    const sample = stats[at].sample;
    const rows: number[] = [];
    for (let i = 0; i < sampleRows; i++) if (badSample[i] !== 2 && !Number.isNaN(sample[i])) rows.push(i);
    const scores = Float64Array.from(rows, (i) => sample[i]);
    const bad = Uint8Array.from(rows, (i) => badSample![i]);
    let value: number;
    try {
      value = auc(scoreBlocks(scores, bad));
    } catch {
      return { higherIs: byName, hint: 'only one outcome in the first rows; guessed from the name' };
    }
    const shown = formatAuc(Math.max(value, 1 - value));
    const base = `on the first ${formatCount(rows.length)} rows`;
    if (value > 0.51) return { higherIs: 'safer', hint: `bads have lower scores: AUC ${shown} taking higher = safer, ${base}` };
    if (value < 0.49) return { higherIs: 'riskier', hint: `bads have higher scores: AUC ${shown} taking higher = riskier, ${base}` };
    return { higherIs: byName, hint: `the data barely separate (AUC ${formatAuc(value)}); guessed from the name` };
  };
  const championOrientation = orientation(championAt);
  const challengerOrientation = orientation(challengerAt);
  return {
    outcome,
    badValue,
    champion,
    challenger,
    higherIs: { champion: championOrientation.higherIs, challenger: challengerOrientation.higherIs },
    orientationHints: { champion: championOrientation.hint, challenger: challengerOrientation.hint },
    id,
    segments,
    exposure,
    ...(unknownValues.length > 0 ? { unknownValues } : {}),
  };
}

/** The guess as a complete mapping, or null while a required part is missing. */
export function mappingFromGuess(guess: MappingGuess): ColumnMapping | null {
  const { outcome, badValue, champion, challenger, higherIs } = guess;
  if (!outcome || !badValue || !champion || !challenger || !higherIs.champion || !higherIs.challenger) return null;
  return {
    outcome,
    badValue,
    champion,
    challenger,
    higherIs: { champion: higherIs.champion, challenger: higherIs.challenger },
    id: guess.id,
    segments: guess.segments,
    exposure: guess.exposure,
    ...(guess.unknownValues && guess.unknownValues.length > 0 ? { keepUnknown: true, unknownValues: guess.unknownValues } : {}),
  };
}


import type { ValidationReport } from '@shared/comparisons';
import { challengersOf, type ColumnMapping, mappingModelProblems, maxAmountMagnitude } from '@shared/report';
import type { Holdout, SegmentColumn } from '@server/stats/holdout';
import { type HoldoutSource, type SourceInfo, sourceInfo } from './byte-source';
import { type CsvLayout, type Delimiter, splitLine } from './csv-records';
import { inSheetOf, namedIn, readRecords } from './records';
import { columnName, HoldoutInputError, quoteCell, raggedRowMessage, where } from './errors';
import { asciiString, detach, INVALID, isMissing, MISSING, parseNumber, plainDecimal, plainDecimalBytes, trimCell } from './values';
import { formatCount } from '@shared/format';

/**
 * Loads a holdout file with a column mapping into the engine's column form (typed arrays), in
 * one streaming pass. Every problem is a HoldoutInputError naming the row (line number) and
 * column; `validateHoldout` runs the same pass collecting the first 50 problems instead.
 *
 * Rows with an empty score are an error, or, with `dropMissing`, left out and counted. Blank
 * lines are skipped. Outcome values are compared as text, and numerically when both are numbers
 * (`1.0` is the bad value `1`); the good value is the other value found in the column.
 *
 * Applicants without an outcome (mapping.keepUnknown): an empty outcome, or one of the coded
 * `unknownValues` (compared as text, trimmed, and numerically when both are numbers), marks the
 * row unknown instead of being an error; its `bad` is 0 and `known` 0. Without the option an empty
 * outcome stays an error naming row and column. A weight column (mapping.weight) must hold a
 * positive finite number on every row. An inferred-bad column (mapping.inferredBad) holds a
 * probability 0 to 1; it is read on unknown rows only, where it is required with
 * `requireInferred` (reject inference by column).
 */

export interface LoadOptions {
  dropMissing?: boolean;
  /**
   * false: every row through the general path (cells cut out, then checked), the reference the
   * tests hold the plain rows to; default true (lines without quotes read straight from the text).
   */
  plainRows?: boolean;
  /** Every unknown row must carry the mapped inferred-bad column (default true: mapping it is using it). */
  requireInferred?: boolean;
  /** Fraction of the file's bytes read so far, 0 to 1. */
  onProgress?: (fraction: number) => void;
}

export interface ReadSummary {
  /** Data rows in the file (blank lines not counted). */
  rowsRead: number;
  rowsUsed: number;
  rowsDroppedMissingScore: number;
  /** Empty cells per mapped column, dropped rows included. */
  missingByColumn: Record<string, number>;
  badValue: string;
  /** The other value of the outcome column; null when only bads were found. */
  goodValue: string | null;
  goods: number;
  bads: number;
  /** Rows used that have no outcome (keep-unknown); 0 otherwise. */
  unknown: number;
  /** Sum of the weights of the rows used; null without a weight column. */
  weightTotal: number | null;
  delimiter: CsvLayout['delimiter'];
}

export interface LoadedHoldout {
  holdout: Holdout;
  /** `sheet`: the worksheet read, for a workbook. */
  input: { fileName: string; sha256: string; bytes: number; sheet?: string };
  read: ReadSummary;
}

/**
 * Columns that grow by doubling, or at once to the size the reader expects once it has seen some
 * rows (reserve). finish() hands over the array itself when it is full or nearly so (a view of
 * its first `length` values), else a copy of that length. "Nearly": at most a quarter unused — a
 * reserve made from the first lines' length may be that much too large when lines grow longer
 * (ids A1 … A9999999); the unused end was never written, so it holds no memory (the pages of a
 * large array are mapped on first touch), while a copy of a 10M-row column costs a fresh 80 MB.
 * Three classes, so that each push site sees one kind of array.
 */
const unusedAtMost = (capacity: number) => capacity >> 2;

class Float64Column {
  data = new Float64Array(1 << 16);
  length = 0;
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const next = new Float64Array(capacity);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  push(value: number): void {
    if (this.length === this.data.length) this.reserve(this.data.length * 2);
    this.data[this.length++] = value;
  }
  finish(): Float64Array {
    return this.data.length - this.length <= unusedAtMost(this.data.length) ? this.data.subarray(0, this.length) : this.data.slice(0, this.length);
  }
}

class Uint32Column {
  data = new Uint32Array(1 << 16);
  length = 0;
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const next = new Uint32Array(capacity);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  push(value: number): void {
    if (this.length === this.data.length) this.reserve(this.data.length * 2);
    this.data[this.length++] = value;
  }
  finish(): Uint32Array {
    return this.data.length - this.length <= unusedAtMost(this.data.length) ? this.data.subarray(0, this.length) : this.data.slice(0, this.length);
  }
}

class Uint8Column {
  data = new Uint8Array(1 << 16);
  length = 0;
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const next = new Uint8Array(capacity);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  push(value: number): void {
    if (this.length === this.data.length) this.reserve(this.data.length * 2);
    this.data[this.length++] = value;
  }
  finish(): Uint8Array {
    return this.data.length - this.length <= unusedAtMost(this.data.length) ? this.data.subarray(0, this.length) : this.data.slice(0, this.length);
  }
}

/** The plain rows of a load (passOver's plainRows). */
interface PlainRows {
  take(text: string, from: number, to: number): boolean;
  takeBytes(bytes: Uint8Array, from: number, to: number): boolean;
}

/**
 * The ids: an array sized once like the other columns (reserve), then filled in place, instead of
 * grown by push — on 10M rows a third of the time of building the ids went into growing the
 * array (each larger copy a fresh allocation of the collector's). finish() gives it its length.
 * Beyond MAX_SIZED ids V8 would make a preallocated array a slow dictionary; it then grows by
 * push as before.
 */
class IdColumn {
  static readonly MAX_SIZED = 30_000_000;
  private data: string[] = [];
  length = 0;
  reserve(capacity: number): void {
    if (capacity <= this.data.length || capacity > IdColumn.MAX_SIZED) return;
    const next = new Array<string>(capacity);
    for (let i = 0; i < this.length; i++) next[i] = this.data[i];
    this.data = next;
  }
  push(id: string): void {
    if (this.length < this.data.length) this.data[this.length++] = id;
    else this.length = this.data.push(id);
  }
  finish(): string[] {
    this.data.length = this.length;
    return this.data;
  }
}

class ErrorSink {
  readonly errors: HoldoutInputError[] = [];
  constructor(private readonly limit: number | null) {}
  /** Throws in load mode; in validation mode records and tells the caller to skip the row. */
  report(error: HoldoutInputError): void {
    if (this.limit === null) throw error;
    if (this.errors.length < this.limit) this.errors.push(error);
  }
  get full(): boolean {
    return this.limit !== null && this.errors.length >= this.limit;
  }
}

interface PassResult {
  loaded: LoadedHoldout | null;
  errors: HoldoutInputError[];
}

/** One reading of the file with the mapping; a workbook's problems name their sheet (records.ts). */
async function pass(source: HoldoutSource, mapping: ColumnMapping, options: LoadOptions, errorLimit: number | null): Promise<PassResult> {
  const info = sourceInfo(source);
  const result = await inSheetOf(info, () => passOver(source, info, mapping, options, errorLimit));
  return { loaded: result.loaded, errors: namedIn(info, result.errors) };
}

async function passOver(source: HoldoutSource, info: SourceInfo, mapping: ColumnMapping, options: LoadOptions, errorLimit: number | null): Promise<PassResult> {
  const sink = new ErrorSink(errorLimit);
  for (const [role, name] of [
    ['champion', mapping.champion],
    ['challenger', mapping.challenger],
  ] as const) {
    if (name === mapping.outcome) {
      throw new HoldoutInputError('same_column', `column ${columnName(name)} is mapped as both the outcome and the ${role}'s score`, null, name);
    }
  }
  // Several challengers: distinct score columns and names (shared/report.ts), before any reading.
  const problems = mappingModelProblems(mapping);
  if (problems.length > 0) throw new HoldoutInputError('same_column', problems[0], null, null);
  const extras = challengersOf(mapping).slice(1);
  const pdModels = (['champion', 'challenger'] as const).filter((model) => mapping.probabilityOfDefault?.[model] === true);
  for (const model of pdModels) {
    if (mapping.higherIs[model] !== 'riskier') {
      throw new HoldoutInputError(
        'pd_orientation',
        `column ${columnName(mapping[model])}: a probability of default is higher = riskier; set the ${model}'s orientation to riskier or do not mark it as a probability of default`,
        null,
        mapping[model],
      );
    }
  }
  const dropMissing = options.dropMissing ?? false;
  // Grade and period columns are read like segment columns and split off at the end.
  const gradeChampion = mapping.grades?.champion ?? null;
  const gradeChallenger = mapping.grades?.challenger ?? null;
  const periodName = mapping.period ?? null;
  const extraNames = [gradeChampion, gradeChallenger, periodName].filter((name): name is string => name !== null);
  const segmentNames = [...(mapping.segments ?? []), ...extraNames.filter((name) => !(mapping.segments ?? []).includes(name))];
  const idName = mapping.id ?? null;
  const exposureName = mapping.exposure ?? null;
  const weightName = mapping.weight ?? null;
  const keepUnknown = mapping.keepUnknown ?? false;
  const inferredName = mapping.inferredBad ?? null;
  const requireInferred = options.requireInferred ?? true;
  if (inferredName !== null && !keepUnknown) {
    throw new HoldoutInputError('same_column', `column ${columnName(inferredName)} is mapped as the inferred probability of bad, which needs the option to keep applicants without an outcome`, null, inferredName);
  }
  for (const [role, name] of [
    ['weight', weightName],
    ['inferred probability of bad', inferredName],
  ] as const) {
    if (name !== null && [mapping.outcome, mapping.champion, mapping.challenger, ...extras.map((extra) => extra.column)].includes(name)) {
      throw new HoldoutInputError('same_column', `column ${columnName(name)} is mapped both as the ${role} and as the outcome or a score`, null, name);
    }
  }
  // Coded "no outcome" values: as text and, when numeric, as numbers.
  const unknownTexts = new Set((keepUnknown ? (mapping.unknownValues ?? []) : []).map((value) => value.trim()));
  const unknownNumbers = new Set([...unknownTexts].filter((value) => Number.isFinite(+value)).map((value) => +value));
  if (unknownTexts.has(mapping.badValue.trim())) {
    throw new HoldoutInputError('bad_outcome', `column ${columnName(mapping.outcome)}: ${quoteCell(mapping.badValue.trim())} is both the bad value and a value meaning no outcome`, null, mapping.outcome);
  }

  let width = 0;
  let outcomeAt = -1;
  let championAt = -1;
  let challengerAt = -1;
  let extraAt: number[] = [];
  let idAt = -1;
  let exposureAt = -1;
  let weightAt = -1;
  let inferredAt = -1;
  let segmentAt: number[] = [];
  let decimalComma = false;
  let newline: CsvLayout['newline'] = '\n';
  let delimiter: Delimiter = ',';
  let wanted: boolean[] = [];
  let plain: PlainRows | null = null;

  const bad = new Uint8Column();
  const champion = new Float64Column();
  const challenger = new Float64Column();
  const extraScores = extras.map(() => new Float64Column());
  const exposure = exposureName === null ? null : new Float64Column();
  const weight = weightName === null ? null : new Float64Column();
  const known = keepUnknown ? new Uint8Column() : null;
  const inferred = inferredName === null ? null : new Float64Column();
  let unknownRows = 0;
  let weightTotal = 0;
  const ids = idName === null ? null : new IdColumn();
  const segmentLevels = segmentNames.map(() => new Map<string, number>());
  // Each segment column's levels by code (the keys of segmentLevels, for the plain rows).
  const levelNames = segmentNames.map((): string[] => []);
  const segmentCodes = segmentNames.map(() => new Uint32Column());
  const missingByColumn: Record<string, number> = {};
  for (const name of [mapping.outcome, mapping.champion, mapping.challenger, ...extras.map((extra) => extra.column), idName, exposureName, weightName, inferredName, ...segmentNames]) {
    if (name !== null) missingByColumn[name] = 0;
  }

  const badValue = mapping.badValue.trim();
  const badNumber = badValue.length > 0 && Number.isFinite(+badValue) ? +badValue : null;
  let goodValue: string | null = null;
  let goodNumber: number | null = null;
  let rowsRead = 0;
  let dropped = 0;
  let bads = 0;

  const resolve = (header: string[], name: string): number => {
    const at = header.indexOf(name);
    if (at === -1) {
      const shown = header.slice(0, 12).map(columnName).join(', ');
      throw new HoldoutInputError(
        'missing_column',
        `column ${columnName(name)} is not in the file (its columns: ${shown}${header.length > 12 ? ', …' : ''})`,
        1,
        name,
      );
    }
    if (header.indexOf(name, at + 1) !== -1) {
      throw new HoldoutInputError('duplicate_column', `column ${columnName(name)} appears more than once in the header`, 1, name);
    }
    return at;
  };

  /** 1 bad, 0 good, UNKNOWN without an outcome (keep-unknown), −1 a problem (reported). */
  const UNKNOWN = 2;
  const outcomeOf = (cell: string, line: number): number => {
    if (cell === badValue) return 1;
    if (cell === goodValue) return 0;
    const value = trimCell(cell);
    if (value === badValue) return 1;
    if (value.length === 0 || isMissing(value)) {
      if (keepUnknown) return UNKNOWN;
      sink.report(
        new HoldoutInputError(
          'missing_outcome',
          `${where(line, mapping.outcome)}: the outcome is empty; applicants without an outcome can be kept with the keep-unknown option`,
          line,
          mapping.outcome,
        ),
      );
      return -1;
    }
    if (goodValue !== null && value === goodValue) return 0;
    const number = +value;
    const numeric = Number.isFinite(number);
    if (numeric && badNumber !== null && number === badNumber) return 1;
    if (unknownTexts.size > 0 && (unknownTexts.has(value) || (numeric && unknownNumbers.has(number)))) return UNKNOWN;
    if (goodValue === null) {
      goodValue = value;
      goodNumber = numeric ? number : null;
      return 0;
    }
    if (numeric && goodNumber !== null && number === goodNumber) return 0;
    sink.report(
      new HoldoutInputError(
        'bad_outcome',
        `${where(line, mapping.outcome)}: ${quoteCell(value)} is neither the bad value ${quoteCell(badValue)} nor the good value ${quoteCell(goodValue)}`,
        line,
        mapping.outcome,
      ),
    );
    return -1;
  };

  /** Records a missing or invalid score; true when the row may still be used (dropped later). */
  const scoreProblem = (value: typeof MISSING | typeof INVALID, name: string, cell: string, line: number): boolean => {
    if (value === MISSING) {
      missingByColumn[name]++;
      if (dropMissing) return true;
      const shown = cell.trim().length > 0 ? `missing (${quoteCell(cell.trim())})` : 'empty';
      sink.report(
        new HoldoutInputError(
          'missing_score',
          `${where(line, name)}: the score is ${shown}; rows with a missing score can be left out with the drop-missing option`,
          line,
          name,
        ),
      );
      return false;
    }
    sink.report(new HoldoutInputError('not_a_number', `${where(line, name)}: ${quoteCell(cell.trim())} is not a number`, line, name));
    return false;
  };

  /**
   * The common row read straight from the text of a line without quotes, no cell cut out: the
   * outcome the bad value or the good value already met, every score, weight and exposure a plain
   * decimal (values.ts plainDecimal: Number()'s value, bit for bit), the id without surrounding
   * spaces, each segment a level already met. take() is false for any other row, which then goes
   * through readRow: both give the same holdout and the same errors, in file order. Not used with
   * an inferred-bad column (read on unknown rows only). takeBytes() is take() on a line of ASCII
   * held as bytes (csv-records.ts onPlainBytes), the same rules on the same characters.
   */
  function plainRows(): PlainRows {
    const starts = new Int32Array(width + 1);
    const separator = delimiter.charCodeAt(0);
    const scoreAt = [championAt, challengerAt, ...extraAt];
    const probability = scoreAt.map((_, k) => (k === 0 && pdModels.includes('champion')) || (k === 1 && pdModels.includes('challenger')));
    const scores = new Float64Array(scoreAt.length);
    const codes = new Uint32Array(segmentAt.length);
    const same = (text: string, from: number, to: number, value: string) => {
      if (to - from !== value.length) return false;
      for (let i = 0; i < value.length; i++) if (text.charCodeAt(from + i) !== value.charCodeAt(i)) return false;
      return true;
    };
    const sameBytes = (bytes: Uint8Array, from: number, to: number, value: string) => {
      if (to - from !== value.length) return false;
      for (let i = 0; i < value.length; i++) if (bytes[from + i] !== value.charCodeAt(i)) return false;
      return true;
    };
    /** The code of a level already met, or -1. */
    const levelCode = (s: number, text: string, from: number, to: number): number => {
      if (from === to || text.charCodeAt(from) <= 32 || text.charCodeAt(to - 1) <= 32) return -1;
      const names = levelNames[s];
      const last = codes[s];
      if (last < names.length && same(text, from, to, names[last])) return last;
      if (names.length > 64) return segmentLevels[s].get(text.substring(from, to)) ?? -1;
      for (let code = 0; code < names.length; code++) if (same(text, from, to, names[code])) return code;
      return -1;
    };
    const levelCodeBytes = (s: number, bytes: Uint8Array, from: number, to: number): number => {
      if (from === to || bytes[from] <= 32 || bytes[to - 1] <= 32) return -1;
      const names = levelNames[s];
      const last = codes[s];
      if (last < names.length && sameBytes(bytes, from, to, names[last])) return last;
      if (names.length > 64) return segmentLevels[s].get(asciiString(bytes, from, to)) ?? -1;
      for (let code = 0; code < names.length; code++) if (sameBytes(bytes, from, to, names[code])) return code;
      return -1;
    };
    /** Stored as readRow stores a row without problems. */
    const store = (outcome: number, rowWeight: number, amount: number, id: string | null) => {
      rowsRead++;
      bad.push(outcome);
      bads += outcome;
      if (known !== null) known.push(1);
      if (weight !== null) {
        weight.push(rowWeight);
        weightTotal += rowWeight;
      }
      champion.push(scores[0]);
      challenger.push(scores[1]);
      for (let k = 2; k < scores.length; k++) extraScores[k - 2].push(scores[k]);
      if (exposure !== null) exposure.push(amount);
      if (ids !== null) ids.push(id!);
      for (let s = 0; s < segmentAt.length; s++) segmentCodes[s].push(codes[s]);
      return true;
    };
    const take = (text: string, from: number, to: number): boolean => {
      let field = 0;
      starts[0] = from;
      for (let at = from; at < to; at++) {
        if (text.charCodeAt(at) === separator) {
          if (++field === width) return false;
          starts[field] = at + 1;
        }
      }
      if (field !== width - 1) return false;
      starts[width] = to + 1;
      const outcomeFrom = starts[outcomeAt];
      const outcomeTo = starts[outcomeAt + 1] - 1;
      let outcome: number;
      if (same(text, outcomeFrom, outcomeTo, badValue)) outcome = 1;
      else if (goodValue !== null && same(text, outcomeFrom, outcomeTo, goodValue)) outcome = 0;
      else return false;
      for (let k = 0; k < scoreAt.length; k++) {
        const value = plainDecimal(text, starts[scoreAt[k]], starts[scoreAt[k] + 1] - 1);
        if (value !== value || (probability[k] && !(value >= 0 && value <= 1))) return false;
        scores[k] = value;
      }
      let rowWeight = 1;
      if (weightAt >= 0) {
        rowWeight = plainDecimal(text, starts[weightAt], starts[weightAt + 1] - 1);
        if (!(rowWeight > 0)) return false;
      }
      let amount = 0;
      if (exposureAt >= 0) {
        amount = plainDecimal(text, starts[exposureAt], starts[exposureAt + 1] - 1);
        if (amount !== amount) return false;
      }
      const idFrom = idAt >= 0 ? starts[idAt] : 0;
      const idTo = idAt >= 0 ? starts[idAt + 1] - 1 : 0;
      if (idAt >= 0 && (idFrom === idTo || text.charCodeAt(idFrom) <= 32 || text.charCodeAt(idTo - 1) <= 32)) return false;
      for (let s = 0; s < segmentAt.length; s++) {
        const code = levelCode(s, text, starts[segmentAt[s]], starts[segmentAt[s] + 1] - 1);
        if (code < 0) return false;
        codes[s] = code;
      }
      return store(outcome, rowWeight, amount, ids === null ? null : detach(text.substring(idFrom, idTo)));
    };
    const takeBytes = (bytes: Uint8Array, from: number, to: number): boolean => {
      let field = 0;
      starts[0] = from;
      for (let at = from; at < to; at++) {
        if (bytes[at] === separator) {
          if (++field === width) return false;
          starts[field] = at + 1;
        }
      }
      if (field !== width - 1) return false;
      starts[width] = to + 1;
      const outcomeFrom = starts[outcomeAt];
      const outcomeTo = starts[outcomeAt + 1] - 1;
      let outcome: number;
      if (sameBytes(bytes, outcomeFrom, outcomeTo, badValue)) outcome = 1;
      else if (goodValue !== null && sameBytes(bytes, outcomeFrom, outcomeTo, goodValue)) outcome = 0;
      else return false;
      for (let k = 0; k < scoreAt.length; k++) {
        const value = plainDecimalBytes(bytes, starts[scoreAt[k]], starts[scoreAt[k] + 1] - 1);
        if (value !== value || (probability[k] && !(value >= 0 && value <= 1))) return false;
        scores[k] = value;
      }
      let rowWeight = 1;
      if (weightAt >= 0) {
        rowWeight = plainDecimalBytes(bytes, starts[weightAt], starts[weightAt + 1] - 1);
        if (!(rowWeight > 0)) return false;
      }
      let amount = 0;
      if (exposureAt >= 0) {
        amount = plainDecimalBytes(bytes, starts[exposureAt], starts[exposureAt + 1] - 1);
        if (amount !== amount) return false;
      }
      const idFrom = idAt >= 0 ? starts[idAt] : 0;
      const idTo = idAt >= 0 ? starts[idAt + 1] - 1 : 0;
      if (idAt >= 0 && (idFrom === idTo || bytes[idFrom] <= 32 || bytes[idTo - 1] <= 32)) return false;
      for (let s = 0; s < segmentAt.length; s++) {
        const code = levelCodeBytes(s, bytes, starts[segmentAt[s]], starts[segmentAt[s] + 1] - 1);
        if (code < 0) return false;
        codes[s] = code;
      }
      return store(outcome, rowWeight, amount, ids === null ? null : asciiString(bytes, idFrom, idTo));
    };
    return { take, takeBytes };
  }

  // In validation mode a problem that stops the reader (a row too long, a quote never closed) is
  // listed after the problems found before it, in file order, like every other.
  const read = readRecords(source, info, {
    onBytes: options.onProgress ? (read) => options.onProgress!(info.bytes > 0 ? Math.min(1, read / info.bytes) : 0) : undefined,
    onHeader(found) {
      const header = found.header;
      width = header.length;
      decimalComma = found.delimiter === ';';
      newline = found.newline;
      delimiter = found.delimiter;
      outcomeAt = resolve(header, mapping.outcome);
      championAt = resolve(header, mapping.champion);
      challengerAt = resolve(header, mapping.challenger);
      extraAt = extras.map((extra) => resolve(header, extra.column));
      if (idName !== null) idAt = resolve(header, idName);
      if (exposureName !== null) exposureAt = resolve(header, exposureName);
      if (weightName !== null) weightAt = resolve(header, weightName);
      if (inferredName !== null) inferredAt = resolve(header, inferredName);
      segmentAt = segmentNames.map((name) => resolve(header, name));
      // Only these columns' cells are read (the reader need not cut out the others).
      wanted = header.map(() => false);
      for (const at of [outcomeAt, championAt, challengerAt, ...extraAt, idAt, exposureAt, weightAt, inferredAt, ...segmentAt]) if (at >= 0) wanted[at] = true;
      plain = inferredName === null && options.plainRows !== false ? plainRows() : null;
      return wanted;
    },
    onRows(rows, lines) {
      for (let r = 0; r < rows.length; r++) if (!readRow(rows[r], lines[r])) return;
    },
    onPlainLines:
      options.plainRows === false
        ? undefined
        : (text, bounds, count, firstLine) => {
            if (!reserved && count >= 1000) reserve(count, bounds[2 * count - 1] - bounds[0]);
            for (let i = 0; i < count; i++) {
              const from = bounds[2 * i];
              const to = bounds[2 * i + 1];
              if (plain !== null && !sink.full && plain.take(text, from, to)) continue;
              if (!readRow(splitLine(text, from, to, delimiter, wanted), firstLine + i)) return;
            }
          },
    onPlainBytes:
      options.plainRows === false
        ? undefined
        : (bytes, bounds, count, firstLine) => {
            if (!reserved && count >= 1000) reserve(count, bounds[2 * count - 1] - bounds[0]);
            for (let i = 0; i < count; i++) {
              const from = bounds[2 * i];
              const to = bounds[2 * i + 1];
              if (plain !== null && !sink.full && plain.takeBytes(bytes, from, to)) continue;
              // Any other line as text (ASCII: each byte its character), as onPlainLines reads it.
              const line = asciiString(bytes, from, to);
              if (!readRow(splitLine(line, 0, line.length, delimiter, wanted), firstLine + i)) return;
            }
          },
  });

  /**
   * Every column sized once for the rows the file should hold, from the length of the lines seen
   * so far (a little over: the unused end is at most 1/32 of a column, else finish() copies).
   */
  let reserved = false;
  function reserve(lines: number, characters: number): void {
    reserved = true;
    const rows = Math.ceil(((info.bytes / Math.max(1, characters)) * lines * 1.015) + 64);
    if (!(rows > bad.length) || rows > 1e9) return;
    for (const column of [bad, known, ...segmentCodes]) column?.reserve(rows);
    ids?.reserve(rows);
    for (const column of [champion, challenger, ...extraScores, exposure, weight, inferred]) column?.reserve(rows);
  }

  /** One record as cut by the reader; false once the validation has all the problems it keeps. */
  function readRow(row: string[], line: number): boolean {
    if (row.length !== width) {
      if (row.length === 1 && row[0].trim() === '') return true; // a blank line
      rowsRead++;
      sink.report(new HoldoutInputError('ragged_row', raggedRowMessage(line, row, width, newline), line));
      return !sink.full;
    }
    rowsRead++;
    let ok = true;

    const outcome = outcomeOf(row[outcomeAt], line);
    if (outcome < 0) ok = false;

    const a = parseNumber(row[championAt], decimalComma);
    const b = parseNumber(row[challengerAt], decimalComma);
    let missingScore = false;
    if (typeof a !== 'number') {
      if (a === MISSING) missingScore = true;
      if (!scoreProblem(a, mapping.champion, row[championAt], line)) ok = false;
    }
    if (typeof b !== 'number') {
      if (b === MISSING) missingScore = true;
      if (!scoreProblem(b, mapping.challenger, row[challengerAt], line)) ok = false;
    }
    const extraValues = extraAt.map((at, k) => {
      const value = parseNumber(row[at], decimalComma);
      if (typeof value !== 'number') {
        if (value === MISSING) missingScore = true;
        if (!scoreProblem(value, extras[k].column, row[at], line)) ok = false;
      }
      return value;
    });
    for (const model of pdModels) {
      const value = model === 'champion' ? a : b;
      if (typeof value === 'number' && !(value >= 0 && value <= 1)) {
        sink.report(
          new HoldoutInputError(
            'not_a_probability',
            `${where(line, mapping[model])}: ${quoteCell(String(value))} is not a probability of default (0 to 1), and the ${model}'s score is marked as one`,
            line,
            mapping[model],
          ),
        );
        ok = false;
      }
    }
    if ((outcome < 0 || outcome === UNKNOWN) && isMissing(row[outcomeAt])) missingByColumn[mapping.outcome]++;

    let rowWeight = 1;
    if (weight !== null) {
      const cell = row[weightAt];
      const value = parseNumber(cell, decimalComma);
      if (value === MISSING) {
        missingByColumn[weightName!]++;
        sink.report(new HoldoutInputError('bad_weight', `${where(line, weightName!)}: the weight is empty; every row needs a positive weight`, line, weightName!));
        ok = false;
      } else if (value === INVALID) {
        sink.report(new HoldoutInputError('bad_weight', `${where(line, weightName!)}: ${quoteCell(cell.trim())} is not a number; a weight is a positive number`, line, weightName!));
        ok = false;
      } else if (!(value > 0) || !Number.isFinite(value) || value > maxAmountMagnitude) {
        sink.report(new HoldoutInputError('bad_weight', `${where(line, weightName!)}: the weight is ${cell.trim()}; a weight must be a positive number, at most 10¹⁵`, line, weightName!));
        ok = false;
      } else rowWeight = value;
    }

    let probability = NaN;
    if (inferred !== null) {
      const cell = row[inferredAt];
      const value = parseNumber(cell, decimalComma);
      if (value === MISSING) {
        missingByColumn[inferredName!]++;
        if (outcome === UNKNOWN && requireInferred) {
          sink.report(
            new HoldoutInputError(
              'bad_probability',
              `${where(line, inferredName!)}: the probability of bad is empty on a row without an outcome; reject inference by column needs it on every such row`,
              line,
              inferredName!,
            ),
          );
          ok = false;
        }
      } else if (outcome === UNKNOWN) {
        if (value === INVALID) {
          sink.report(new HoldoutInputError('bad_probability', `${where(line, inferredName!)}: ${quoteCell(cell.trim())} is not a number; a probability of bad is 0 to 1`, line, inferredName!));
          ok = false;
        } else if (!(value >= 0 && value <= 1)) {
          sink.report(new HoldoutInputError('bad_probability', `${where(line, inferredName!)}: ${cell.trim()} is not a probability of bad (0 to 1)`, line, inferredName!));
          ok = false;
        } else probability = value;
      }
    }

    let amount = 0;
    if (exposure !== null) {
      const cell = row[exposureAt];
      const value = parseNumber(cell, decimalComma);
      if (value === MISSING) {
        missingByColumn[exposureName!]++;
        sink.report(new HoldoutInputError('missing_value', `${where(line, exposureName!)}: the exposure is empty`, line, exposureName!));
        ok = false;
      } else if (value === INVALID) {
        sink.report(new HoldoutInputError('not_a_number', `${where(line, exposureName!)}: ${quoteCell(cell.trim())} is not a number`, line, exposureName!));
        ok = false;
      } else if (Math.abs(value) > maxAmountMagnitude) {
        sink.report(new HoldoutInputError('amount_too_large', `${where(line, exposureName!)}: ${quoteCell(cell.trim())} is too large for an amount (at most 10¹⁵ either way)`, line, exposureName!));
        ok = false;
      } else amount = value;
    }
    if (sink.full) return false;
    if (!ok) return true;
    if (missingScore) {
      // Only reached with dropMissing: the row is left out, the other columns still counted.
      dropped++;
      if (idAt >= 0 && isMissing(row[idAt])) missingByColumn[idName!]++;
      for (let s = 0; s < segmentAt.length; s++) if (isMissing(row[segmentAt[s]])) missingByColumn[segmentNames[s]]++;
      return true;
    }

    if (outcome === UNKNOWN) {
      bad.push(0);
      known!.push(0);
      unknownRows++;
    } else {
      bad.push(outcome);
      bads += outcome;
      if (known !== null) known.push(1);
    }
    if (weight !== null) {
      weight.push(rowWeight);
      weightTotal += rowWeight;
    }
    if (inferred !== null) inferred.push(probability);
    champion.push(a as number);
    challenger.push(b as number);
    for (let k = 0; k < extraValues.length; k++) extraScores[k].push(extraValues[k] as number);
    if (exposure !== null) exposure.push(amount);
    if (ids !== null) {
      const id = trimCell(row[idAt]);
      if (id.length === 0) missingByColumn[idName!]++;
      ids.push(detach(id));
    }
    for (let s = 0; s < segmentAt.length; s++) {
      const levels = segmentLevels[s];
      let level = trimCell(row[segmentAt[s]]);
      // A known level is never a missing token (those are stored as "(blank)").
      let code = levels.get(level);
      if (code === undefined) {
        if (isMissing(level)) {
          missingByColumn[segmentNames[s]]++;
          level = '(blank)';
          code = levels.get(level);
        }
        if (code === undefined) {
          code = levels.size;
          level = detach(level);
          levels.set(level, code);
          levelNames[s].push(level);
        }
      }
      segmentCodes[s].push(code);
    }
    return true;
  }
  let layout: CsvLayout;
  try {
    layout = await read;
  } catch (error) {
    if (errorLimit === null || !(error instanceof HoldoutInputError)) throw error;
    sink.report(error);
    return { loaded: null, errors: sink.errors };
  }

  const n = champion.length;
  const knownRows = n - unknownRows;
  if (sink.errors.length === 0) {
    if (rowsRead === 0) throw new HoldoutInputError('no_rows', 'the file has a header but no data rows');
    if (n === 0) throw new HoldoutInputError('no_rows', `every row has a missing score (${formatCount(dropped)} rows left out)`);
    if (knownRows === 0) {
      throw new HoldoutInputError('single_class', `column ${columnName(mapping.outcome)}: no row has an outcome; a comparison needs goods and bads with a known outcome`, null, mapping.outcome);
    }
    if (bads === 0 || bads === knownRows) {
      const only = bads === 0 ? `the good value ${quoteCell(goodValue ?? '')}` : `the bad value ${quoteCell(badValue)}`;
      const hint = bads === 0 ? `; no row has the bad value ${quoteCell(badValue)} (is the bad value right?)` : '';
      throw new HoldoutInputError(
        'single_class',
        `column ${columnName(mapping.outcome)}: every row used${unknownRows > 0 ? ' with an outcome' : ''} has ${only}${hint}; a comparison needs both goods and bads`,
        null,
        mapping.outcome,
      );
    }
  }
  if (sink.errors.length > 0) return { loaded: null, errors: sink.errors };

  const badFlags = bad.finish();
  const categorical: SegmentColumn[] = segmentNames.map((column, s) => ({
    column,
    levels: [...segmentLevels[s].keys()],
    codes: segmentCodes[s].finish(),
  }));
  const segments = categorical.slice(0, (mapping.segments ?? []).length);
  const categoricalColumn = (name: string | null) => (name === null ? null : categorical[segmentNames.indexOf(name)]);
  const holdout: Holdout = {
    n,
    bad: badFlags,
    champion: champion.finish(),
    challenger: challenger.finish(),
    higherIs: { champion: mapping.higherIs.champion, challenger: mapping.higherIs.challenger },
    exposure: exposure === null ? null : exposure.finish(),
    ids: ids === null ? null : ids.finish(),
    segments,
  };
  if (extras.length > 0) holdout.moreChallengers = extras.map((extra, k) => ({ ...extra, scores: extraScores[k].finish() }));
  if (gradeChampion !== null || gradeChallenger !== null) holdout.grades = { champion: categoricalColumn(gradeChampion), challenger: categoricalColumn(gradeChallenger) };
  if (periodName !== null) holdout.period = categoricalColumn(periodName);
  if (weight !== null) holdout.weight = weight.finish();
  if (known !== null && unknownRows > 0) {
    holdout.known = known.finish();
  }
  if (inferred !== null && unknownRows > 0) holdout.inferredBad = inferred.finish();
  return {
    loaded: {
      holdout,
      input: { fileName: info.fileName, sha256: info.sha256, bytes: info.bytes, ...(info.sheet === undefined ? {} : { sheet: info.sheet }) },
      read: {
        rowsRead,
        rowsUsed: n,
        rowsDroppedMissingScore: dropped,
        missingByColumn,
        badValue,
        goodValue,
        goods: knownRows - bads,
        bads,
        unknown: unknownRows,
        weightTotal: weight === null ? null : weightTotal,
        delimiter: layout.delimiter,
      },
    },
    errors: [],
  };
}

/** Loads the holdout or throws the first HoldoutInputError. */
export async function loadHoldout(source: HoldoutSource, mapping: ColumnMapping, options: LoadOptions = {}): Promise<LoadedHoldout> {
  const { loaded } = await pass(source, mapping, options, null);
  return loaded!;
}

/** The upload wizard's validation report: the first problems (at most 50), or a summary. */
export async function validateHoldout(
  source: HoldoutSource,
  mapping: ColumnMapping,
  options: LoadOptions & { maxErrors?: number } = {},
): Promise<ValidationReport & { loaded: LoadedHoldout | null }> {
  try {
    const { loaded, errors } = await pass(source, mapping, options, options.maxErrors ?? 50);
    if (loaded === null) return { ok: false, errors: errors.map((error) => error.toRowError()), summary: null, loaded: null };
    const { read } = loaded;
    const warnings: string[] = [];
    if (read.rowsDroppedMissingScore > 0) {
      warnings.push(`${formatCount(read.rowsDroppedMissingScore)} rows with a missing score left out`);
    }
    if (read.unknown > 0) {
      warnings.push(
        `${formatCount(read.unknown)} rows have no outcome: they count in approval rates, cut-offs and swap sets, not in AUC, KS or bad rates`,
      );
    }
    return {
      ok: true,
      errors: [],
      summary: {
        rows: read.rowsRead,
        rowsUsed: read.rowsUsed,
        goods: read.goods,
        bads: read.bads,
        badRate: read.bads / (read.rowsUsed - read.unknown),
        ...(read.unknown > 0 || read.weightTotal !== null ? { unknownRows: read.unknown, accounts: read.weightTotal ?? read.rowsUsed } : {}),
        rowsDroppedMissingScore: read.rowsDroppedMissingScore,
        missingByColumn: read.missingByColumn,
        warnings,
      },
      loaded,
    };
  } catch (error) {
    if (error instanceof HoldoutInputError) return { ok: false, errors: [error.toRowError()], summary: null, loaded: null };
    throw error;
  }
}

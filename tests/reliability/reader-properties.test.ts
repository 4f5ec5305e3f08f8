import { createHash } from 'node:crypto';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { HoldoutInputError } from '@server/reader/errors';
import { type LoadedHoldout, loadHoldout, validateHoldout } from '@server/reader/load';
import { type HoldoutScan, mappingFromGuess, scanHoldout } from '@server/reader/scan';
import { buildReport } from '@server/stats/report';
import { anyInputArb, describeCase, lineCount, sampleMapping, validHoldout } from './helpers/holdouts';
import { checkProperty, dataErrorProblems, messageProblems, nonFiniteNumbers, within } from './helpers/outcomes';
import { record } from './helpers/figures';

/**
 * The engine's reader (server/reader/) under bad input, as property tests: random bytes, random
 * cells, and random mutations of valid holdouts (helpers/holdouts.ts). For every input, scanning,
 * loading with a mapping and the validation report each end — within a time bound — in a result
 * that is whole and consistent, or in the reader's own error naming what and where. Loading and
 * the validation report agree (same first problem). What loads also goes through the engine
 * (buildReport, 20 bootstrap replicates): a report without NaN or infinite numbers, or the
 * engine's own clear error.
 */

const RUNS = Number(process.env.RELIABILITY_READER_RUNS ?? 500);
/** Per step; the slowest honest case (a 9 MB field) takes well under a second. */
const STEP_MS = 10_000;

function scanProblems(scan: HoldoutScan, bytes: Buffer): string[] {
  const problems: string[] = [];
  if (scan.sha256 !== createHash('sha256').update(bytes).digest('hex')) problems.push('scan SHA-256 is not the bytes’ SHA-256');
  if (scan.bytes !== bytes.length) problems.push(`scan counted ${scan.bytes} bytes of ${bytes.length}`);
  if (!(scan.rowCount >= 1)) problems.push(`scan row count ${scan.rowCount}`);
  if (scan.columns.length < 1) problems.push('scan found no columns');
  if (scan.preview.length > 20 || scan.preview.some((row) => row.length !== scan.columns.length)) problems.push('preview rows do not match the header');
  for (const problem of scan.problems) problems.push(...messageProblems(problem.message, { row: problem.row }));
  return problems;
}

function loadedProblems(loaded: LoadedHoldout): string[] {
  const { holdout, read } = loaded;
  const problems: string[] = [];
  const n = holdout.n;
  if (!(n >= 2)) problems.push(`n = ${n}`);
  for (const [name, column] of [
    ['bad', holdout.bad],
    ['champion', holdout.champion],
    ['challenger', holdout.challenger],
  ] as const) {
    if (column.length !== n) problems.push(`${name} has ${column.length} values for n = ${n}`);
  }
  let bads = 0;
  for (let i = 0; i < n; i++) {
    bads += holdout.bad[i];
    if (holdout.bad[i] > 1) problems.push(`bad[${i}] = ${holdout.bad[i]}`);
    if (!Number.isFinite(holdout.champion[i]) || !Number.isFinite(holdout.challenger[i])) {
      problems.push(`row ${i}: a score is not finite`);
      break;
    }
  }
  if (bads === 0 || bads === n) problems.push(`one class only (${bads} bads of ${n})`);
  if (read.rowsUsed !== n || read.bads !== bads || read.goods !== n - bads) problems.push('the read summary does not match the columns');
  if (holdout.exposure && holdout.exposure.length !== n) problems.push('exposure length');
  if (holdout.ids && holdout.ids.length !== n) problems.push('ids length');
  for (const segment of holdout.segments) {
    if (segment.codes.length !== n) problems.push(`segment ${segment.column} length`);
    if (segment.codes.some((code) => code >= segment.levels.length)) problems.push(`segment ${segment.column} has a code without a level`);
  }
  return problems;
}

describe('the reader under bad input', () => {
  it(`scans, loads and validates ${RUNS} random and mutated files: a whole result or a clear error naming what and where, in bounded time`, async () => {
    const tally = { cases: 0, scanned: 0, loaded: 0, reports: 0, refused: new Map<string, number>(), slowestMs: 0 };
    await checkProperty(
      fc.asyncProperty(anyInputArb, async (input) => {
        const { bytes } = input;
        const lines = lineCount(bytes);
        const problems: string[] = [];
        const source = { bytes, fileName: 'mutated.csv' };
        tally.cases++;

        const scan = await within(STEP_MS, `scan of ${describeCase(input)}`, () => scanHoldout(source));
        if (scan.value) {
          tally.scanned++;
          problems.push(...scanProblems(scan.value, bytes));
        } else problems.push(...dataErrorProblems(scan.error, lines));

        const mappings = [sampleMapping];
        const guessed = scan.value ? mappingFromGuess(scan.value.guess) : null;
        if (guessed) mappings.push(guessed);
        for (const mapping of mappings) {
          const load = await within(STEP_MS, `load of ${describeCase(input)}`, () => loadHoldout(source, mapping));
          const validation = await within(STEP_MS, `validation of ${describeCase(input)}`, () => validateHoldout(source, mapping, { maxErrors: 50 }));
          tally.slowestMs = Math.max(tally.slowestMs, scan.elapsedMs, load.elapsedMs, validation.elapsedMs);
          if (validation.error) problems.push(`the validation report threw: ${String(validation.error)}`);
          const report = validation.value;
          if (report) {
            if (report.errors.length > 50) problems.push(`${report.errors.length} validation errors (at most 50)`);
            for (const error of report.errors) problems.push(...messageProblems(error.message, { row: error.row, column: error.column }));
            if (report.ok !== (load.value !== undefined)) problems.push(`validation says ok=${report.ok} but loading ${load.value ? 'succeeded' : `failed: ${String(load.error)}`}`);
            if (!report.ok && load.error instanceof HoldoutInputError && report.errors[0]?.message !== load.error.message) {
              problems.push(`validation's first problem ${JSON.stringify(report.errors[0]?.message)} is not loading's ${JSON.stringify(load.error.message)}`);
            }
          }
          if (load.value) {
            tally.loaded++;
            problems.push(...loadedProblems(load.value));
            const built = await within(STEP_MS * 3, `report of ${describeCase(input)}`, () =>
              buildReport({
                holdout: load.value!.holdout,
                input: load.value!.input,
                mapping,
                settings: { bootstrap: 20, seed: 3 },
                read: load.value!.read,
                threads: 1,
              }),
            );
            if (built.value) {
              tally.reports++;
              const bad = nonFiniteNumbers(built.value);
              if (bad.length > 0) problems.push(`the report holds non-finite numbers: ${bad.join(', ')}`);
              JSON.stringify(built.value);
            } else {
              problems.push(...dataErrorProblems(built.error, lines));
              const code = `engine:${(built.error as { code?: string }).code ?? 'error'}`;
              tally.refused.set(code, (tally.refused.get(code) ?? 0) + 1);
            }
          } else {
            problems.push(...dataErrorProblems(load.error, lines));
            const code = (load.error as { code?: string }).code ?? 'error';
            tally.refused.set(code, (tally.refused.get(code) ?? 0) + 1);
          }
        }
        if (problems.length > 0) throw new Error(`${describeCase(input)}:\n  ${problems.join('\n  ')}`);
      }),
      { numRuns: RUNS, endOnFailure: true },
    );
    record('reader', {
      cases: tally.cases,
      scanned: tally.scanned,
      loaded: tally.loaded,
      reports: tally.reports,
      refusals: Object.fromEntries([...tally.refused.entries()].sort((a, b) => b[1] - a[1])),
      slowestStepMs: Math.round(tally.slowestMs),
    });
    // The mix reaches both ends: some inputs load and report, most are refused for a reason.
    expect(tally.reports).toBeGreaterThan(RUNS / 20);
    expect(tally.refused.size).toBeGreaterThan(5);
    // A generous budget: on a loaded 2-core machine 500 cases take minutes; a hang still fails.
  }, 900_000);

  it('refuses a header of a million columns at once, naming the limit', async () => {
    const header = Array.from({ length: 1_000_000 }, (_, i) => `c${i}`).join(',');
    const bytes = Buffer.from(`${header}\n${Array.from({ length: 1_000_000 }, () => '1').join(',')}\n`);
    const steps: (() => Promise<unknown>)[] = [() => scanHoldout({ bytes, fileName: 'wide.csv' }), () => loadHoldout({ bytes, fileName: 'wide.csv' }, sampleMapping)];
    for (const step of steps) {
      const outcome = await within(5_000, 'a million columns', step);
      expect(outcome.error).toBeInstanceOf(HoldoutInputError);
      expect((outcome.error as HoldoutInputError).code).toBe('too_many_columns');
      expect((outcome.error as Error).message).toBe('the header has 1,000,000 columns; at most 5000 are read');
      expect((outcome.error as HoldoutInputError).row).toBe(1);
      // "At once": far from reading a million columns, with room for a busy machine.
      expect(outcome.elapsedMs).toBeLessThan(20_000);
      record('reader million columns', { bytes: bytes.length, refusedInMs: Math.round(outcome.elapsedMs) });
    }
  });

  it('reads the sample the same through every line end and BOM, and names the problem of each odd encoding', async () => {
    const text = validHoldout(300);
    const reference = await loadHoldout({ bytes: Buffer.from(text), fileName: 'a.csv' }, sampleMapping);
    for (const variant of [text.replace(/\n/g, '\r\n'), text.replace(/\n/g, '\r'), `\ufeff${text}`]) {
      const loaded = await loadHoldout({ bytes: Buffer.from(variant), fileName: 'a.csv' }, sampleMapping);
      expect(Array.from(loaded.holdout.champion)).toEqual(Array.from(reference.holdout.champion));
      expect(Array.from(loaded.holdout.bad)).toEqual(Array.from(reference.holdout.bad));
    }
    const refusals: [string, Buffer, RegExp][] = [
      ['UTF-16 LE with BOM', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]), /UTF-16/],
      ['UTF-16 BE with BOM', Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(text, 'utf16le').swap16()]), /UTF-16/],
      ['UTF-16 LE without BOM', Buffer.from(text, 'utf16le'), /UTF-16|NUL bytes/],
      ['Latin-1', Buffer.from(text.replace(/branch/g, 'agència'), 'latin1'), /not UTF-8 text \(invalid bytes within the first [\d,]+ bytes\)/],
      ['a NUL byte', Buffer.from(text.replace('\nTCC', '\n\0TCC')), /NUL bytes/],
    ];
    for (const [name, bytes, message] of refusals) {
      const error = await scanHoldout({ bytes, fileName: 'a.csv' }).then(
        () => null,
        (caught: unknown) => caught,
      );
      expect(error, name).toBeInstanceOf(HoldoutInputError);
      expect((error as Error).message, name).toMatch(message);
    }
  });

  it('names the row where a quote is left open', async () => {
    const lines = validHoldout(200).split('\n');
    lines[57] = lines[57].replace(',credit-card,', ',"credit-card,').replace(',personal-loan,', ',"personal-loan,');
    const bytes = Buffer.from(lines.join('\n'));
    const steps: (() => Promise<unknown>)[] = [() => loadHoldout({ bytes, fileName: 'a.csv' }, sampleMapping), () => scanHoldout({ bytes, fileName: 'a.csv' })];
    for (const step of steps) {
      const error = await step().then(
        () => null,
        (caught: unknown) => caught,
      );
      expect(error).toBeInstanceOf(HoldoutInputError);
      expect((error as HoldoutInputError).row).toBe(58);
      expect((error as Error).message).toMatch(/^row 58: a quote opened on this row is never closed/);
    }
  });
});

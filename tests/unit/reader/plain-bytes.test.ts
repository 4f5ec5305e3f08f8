import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { ColumnMapping } from '@shared/report';
import { lastLineEnd, plainByteLines, plainLines, readCsv } from '@server/reader/csv-records';
import { sourceInfo } from '@server/reader/byte-source';
import { HoldoutInputError } from '@server/reader/errors';
import { loadHoldout, type LoadOptions, validateHoldout } from '@server/reader/load';
import { asciiString, plainDecimal, plainDecimalBytes } from '@server/reader/values';

/**
 * The byte path (issue 20): while a file is ASCII, chunks without quotes are cut into lines and
 * read as bytes (csv-records.ts plainByteLines, load.ts takeBytes), never made into strings. Its
 * pieces against their text twins, and whole files — switching between bytes and text at quotes
 * and at the first byte above 127 — against the general path (`plainRows: false`).
 */

const bytesOf = (text: string) => Buffer.from(text, 'latin1');
const newlines = ['\n', '\r\n', '\r'] as const;

describe('the pieces of the byte path', () => {
  it('cuts the same lines as plainLines, and finds the same last line end', () => {
    const text = fc.stringMatching(/^[a-z0-9,;\r\n]{0,40}$/);
    fc.assert(
      fc.property(text, fc.constantFrom(...newlines), fc.boolean(), (input, newline, last) => {
        const bytes = bytesOf(input);
        expect(lastLineEnd(bytes, newline)).toBe(input.lastIndexOf(newline));
        const end = last ? input.length : input.lastIndexOf(newline);
        if (end === -1 || input.length === 0) return;
        const a = plainLines(input, end, newline);
        const b = plainByteLines(bytes, end, newline);
        expect(b.count).toBe(a.count);
        expect([...b.bounds.subarray(0, 2 * b.count)]).toEqual([...a.bounds.subarray(0, 2 * a.count)]);
      }),
      { numRuns: 5000 },
    );
  });

  it('reads the same decimals as plainDecimal, to the bit', () => {
    const cell = fc.stringMatching(/^-?[0-9]{0,17}(\.[0-9]{0,17})?$|^[-+.0-9eE ]{0,8}$/);
    fc.assert(
      fc.property(cell, (text) => {
        const a = plainDecimal(text, 0, text.length);
        const b = plainDecimalBytes(bytesOf(text), 0, text.length);
        expect(Object.is(a, b) || (Number.isNaN(a) && Number.isNaN(b)), text).toBe(true);
      }),
      { numRuns: 20_000 },
    );
    const line = bytesOf('x,12.5,-3,y');
    expect(plainDecimalBytes(line, 2, 6)).toBe(12.5);
    expect(plainDecimalBytes(line, 7, 9)).toBe(-3);
    expect(plainDecimalBytes(line, 1, 6)).toBeNaN();
  });

  it('makes strings of every length from ASCII bytes', () => {
    const text = 'A0123456789abcdefghijklmnopqrstuvwxyz';
    const bytes = bytesOf(`,${text},`);
    for (let length = 0; length <= text.length; length++) expect(asciiString(bytes, 1, 1 + length)).toBe(text.slice(0, length));
  });
});

/** A file of `rows` rows; `line(i)` may replace row i's line; about 40 bytes a row. */
function file(rows: number, options: { newline?: string; bom?: boolean; line?: (i: number) => string | null } = {}) {
  const newline = options.newline ?? '\n';
  const lines = ['id,channel,bad,champion,note,challenger,amount'];
  for (let i = 0; i < rows; i++) {
    const plain = `A${i},${['web', 'branch', 'partner'][i % 3]},${i % 7 === 0 ? 1 : 0},${500 + (i % 97)},n${i % 10},${((i * 7919) % 1_000_000 / 1e6).toFixed(6)},${1000 + (i % 500)}.50`;
    lines.push(options.line?.(i) ?? plain);
  }
  const text = lines.join(newline) + newline;
  return new Uint8Array(Buffer.concat([options.bom ? Buffer.from([0xef, 0xbb, 0xbf]) : Buffer.alloc(0), Buffer.from(text, 'utf8')]));
}

/**
 * Lines of exactly 64 bytes (a padding column), so that the first chunks end on a line end, but
 * for one line of 65 bytes in the second chunk: the second chunk then comes alone (nothing left
 * of the first) and ends within a line, whose start must be kept as a copy (a Buffer's slice()
 * is a view of the chunk).
 */
function aligned(rows: number): Uint8Array {
  const pad = (line: string, length: number) => `${line},${'x'.repeat(length - line.length - 2)}\n`;
  const lines = [pad('id,channel,bad,champion,note,challenger,amount', 64)];
  for (let i = 0; i < rows; i++) lines.push(pad(`A${i},${['web', 'branch'][i % 2]},${i % 7 === 0 ? 1 : 0},${500 + (i % 97)},n,0.25,100`, i === 5_000 ? 65 : 64));
  return new TextEncoder().encode(lines.join(''));
}

const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'riskier' },
  id: 'id',
  segments: ['channel'],
  exposure: 'amount',
};

type Outcome = { ok: true; value: unknown } | { ok: false; error: { code: string; message: string; row: number | null; column: string | null } };
async function settle(work: () => Promise<unknown>): Promise<Outcome> {
  try {
    return { ok: true, value: await work() };
  } catch (error) {
    if (!(error instanceof HoldoutInputError)) throw error;
    return { ok: false, error: { code: error.code, message: error.message, row: error.row, column: error.column } };
  }
}

const fileName = 'bytes.csv';
const compare = async (bytes: Uint8Array, options: LoadOptions = {}) => {
  const fast = await settle(() => loadHoldout({ bytes, fileName }, mapping, options));
  const general = await settle(() => loadHoldout({ bytes, fileName }, mapping, { ...options, plainRows: false }));
  expect(fast).toEqual(general);
  return fast;
};

describe('files read through the byte path', () => {
  // 30,000 rows of about 40 bytes: five 256 KB chunks.
  const rows = 30_000;

  it.each(newlines)('loads the holdout of the general path, to the bit (line end %j)', async (newline) => {
    const loaded = await compare(file(rows, { newline }));
    expect(loaded.ok).toBe(true);
  });

  it('switches to text for a chunk with quotes and back to bytes after it, across CRLF line ends', async () => {
    // Quotes in the second chunk (one a field across lines), a quoted segment level met there first.
    const line = (i: number) => (i === 13_000 ? `A${i},"web",0,512,"two\r\nlines",0.5,100` : i === 13_500 ? `"A${i}","new, level",1,600,n,0.25,100` : null);
    const outcome = await compare(file(rows, { newline: '\r\n', line }));
    expect(outcome.ok).toBe(true);
    const { holdout, read } = (outcome as { value: Awaited<ReturnType<typeof loadHoldout>> }).value;
    expect(read.rowsRead).toBe(rows);
    expect(holdout.segments[0].levels).toEqual(['web', 'branch', 'partner', 'new, level']);
    expect(holdout.ids![13_500]).toBe('A13500');
    expect(holdout.ids![rows - 1]).toBe(`A${rows - 1}`);
  });

  it('reads a file with a BOM as bytes, then as text from its first byte above 127', async () => {
    const line = (i: number) => (i === 20_000 ? `Ä${i},café,0,512,n,0.5,100` : i === 25_000 ? `A${i},web,0,512,\ufeffnote,0.5,100` : null);
    for (const bom of [false, true]) {
      const outcome = await compare(file(rows, { bom, line }));
      const { holdout } = (outcome as { value: Awaited<ReturnType<typeof loadHoldout>> }).value;
      expect(holdout.ids![20_000]).toBe('Ä20000');
      expect(holdout.segments[0].levels).toContain('café');
    }
  });

  it('hands the ASCII chunks without quotes over as bytes, the others as text, every line once and in order', async () => {
    // About 6,600 rows a chunk: quotes in the third, a byte above 127 in the fifth.
    const line = (i: number) => (i === 15_000 ? `A${i},"web",0,512,"two\r\nlines",0.5,100` : i === 27_000 ? `Ä${i},web,0,512,n,0.5,100` : null);
    const source = { bytes: file(rows, { newline: '\r\n', line }), fileName };
    const seen: { how: string; first: number; count: number }[] = [];
    await readCsv(source, sourceInfo(source), {
      onHeader: () => undefined,
      onRows: (batch, lines) => void seen.push({ how: 'rows', first: lines[0], count: batch.length }),
      onPlainLines: (_, __, count, first) => void seen.push({ how: 'text', first, count }),
      onPlainBytes: (_, __, count, first) => void seen.push({ how: 'bytes', first, count }),
    });
    // Line numbers run on without a gap (the quoted field spans two lines).
    let next = 2;
    for (const part of seen) {
      expect(part.first).toBe(next);
      next += part.count + (part.how === 'rows' && part.first <= 15_002 && part.first + part.count > 15_002 ? 1 : 0);
    }
    expect(next).toBe(rows + 3);
    const how = (row: number) => seen.find((part) => part.first <= row + 2 && row + 2 < part.first + part.count + 1)!.how;
    expect(how(0)).toBe('rows');
    expect(how(8_000)).toBe('bytes');
    expect(how(15_000)).toBe('rows');
    expect(how(21_000)).toBe('bytes');
    expect(how(28_000)).toBe('text');
  });

  it('reads a file on disk as the same bytes in memory', async () => {
    const line = (i: number) => (i === 9_000 ? `A${i},"web",0,512,n,0.5,100` : i === 17_000 ? `A${i},web,0,5O0,n,0.5,100` : null);
    const dir = mkdtempSync(join(tmpdir(), 'plain-bytes-'));
    try {
      for (const [name, bytes] of [
        ['clean.csv', file(rows, { newline: '\r\n' })],
        ['quotes-and-a-bad-value.csv', file(rows, { line })],
        ['bom.csv', file(rows, { bom: true, line: (i) => (i === 27_000 ? `Ä${i},web,0,512,n,0.5,100` : null) })],
        ['aligned.csv', aligned(rows)],
      ] as const) {
        const path = join(dir, name);
        writeFileSync(path, bytes);
        const onDisk = await settle(() => loadHoldout({ path }, mapping));
        expect(onDisk).toEqual(await settle(() => loadHoldout({ bytes, fileName: name }, mapping, { plainRows: false })));
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('names the row and column of a bad value in the second chunk', async () => {
    // 256 KB ÷ about 40 bytes a row: row 8,000 is in the second chunk; line 8,002.
    const bad = await compare(file(rows, { line: (i) => (i === 8_000 ? `A${i},web,0,5O0,n,0.5,100` : null) }));
    expect(bad).toEqual({ ok: false, error: { code: 'not_a_number', message: 'row 8002, column "champion": "5O0" is not a number', row: 8002, column: 'champion' } });
    const ragged = await compare(file(rows, { newline: '\r\n', line: (i) => (i === 8_000 ? `A${i},web,0,500,n,0.5` : null) }));
    expect(ragged.ok === false && ragged.error.row).toBe(8002);
  });

  it('collects the same problems, in file order, as the general path', async () => {
    const line = (i: number) => (i % 2_999 === 5 ? `A${i},web,0,abc,n,0.5,100` : i % 4_001 === 7 ? `A${i},web,x,500,n,0.5,100` : i === 14_000 ? `"A${i}",web,0,bad,n,0.5,100` : null);
    const bytes = file(rows, { line });
    const fast = await validateHoldout({ bytes, fileName }, mapping, { maxErrors: 500 });
    const general = await validateHoldout({ bytes, fileName }, mapping, { maxErrors: 500, plainRows: false });
    expect(fast.errors.length).toBeGreaterThan(10);
    expect(fast).toEqual(general);
  });
});

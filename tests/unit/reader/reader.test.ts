import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { ColumnMapping } from '@shared/report';
import { MAX_COLUMNS, MAX_ROW_CHARS } from '@server/reader/csv-records';
import { HoldoutInputError } from '@server/reader/errors';
import { loadHoldout, validateHoldout } from '@server/reader/load';

const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'riskier' },
};
const bytes = (text: string | Uint8Array) => (typeof text === 'string' ? new TextEncoder().encode(text) : text);
const load = (text: string | Uint8Array, extra: Partial<ColumnMapping> = {}, options = {}) =>
  loadHoldout({ bytes: bytes(text), fileName: 'test.csv' }, { ...mapping, ...extra }, options);

async function failure(text: string | Uint8Array, extra: Partial<ColumnMapping> = {}, options = {}): Promise<HoldoutInputError> {
  try {
    await load(text, extra, options);
  } catch (error) {
    if (error instanceof HoldoutInputError) return error;
    throw error;
  }
  throw new Error('expected a HoldoutInputError');
}

const basic = 'bad,champion,challenger\n0,600,0.1\n1,550,0.4\n0,610,0.05\n';

describe('reading holdouts', () => {
  it('reads the mapped columns into typed arrays', async () => {
    const { holdout, read, input } = await load(basic);
    expect(holdout.n).toBe(3);
    expect([...holdout.bad]).toEqual([0, 1, 0]);
    expect([...holdout.champion]).toEqual([600, 550, 610]);
    expect([...holdout.challenger]).toEqual([0.1, 0.4, 0.05]);
    expect(holdout.higherIs).toEqual({ champion: 'safer', challenger: 'riskier' });
    expect(read).toMatchObject({ rowsRead: 3, rowsUsed: 3, goods: 2, bads: 1, goodValue: '0', delimiter: ',' });
    // SHA-256 of the bytes, as node:crypto computes it on the whole buffer
    expect(input).toEqual({ fileName: 'test.csv', bytes: basic.length, sha256: createHash('sha256').update(basic).digest('hex') });
  });

  it('detects semicolons and tabs, reads a decimal comma after semicolons', async () => {
    const semicolon = await load('bad;champion;challenger\n0;600;0,1\n1;550;0,4\n');
    expect([...semicolon.holdout.challenger]).toEqual([0.1, 0.4]);
    expect(semicolon.read.delimiter).toBe(';');
    const tab = await load('bad\tchampion\tchallenger\n0\t600\t0.1\n1\t550\t0.4\n');
    expect(tab.read.delimiter).toBe('\t');
    expect([...tab.holdout.champion]).toEqual([600, 550]);
  });

  it('handles a BOM, CRLF or CR line ends, no trailing newline, blank lines and spaces', async () => {
    for (const text of [
      '\uFEFFbad,champion,challenger\r\n0,600,0.1\r\n1,550,0.4',
      'bad,champion,challenger\r0,600,0.1\r1,550,0.4\r',
      'bad,champion,challenger\n\n0, 600 ,0.1\n\n1,550,0.4\n\n',
    ]) {
      const { holdout } = await load(text);
      expect([...holdout.champion]).toEqual([600, 550]);
      expect([...holdout.bad]).toEqual([0, 1]);
    }
  });

  it('reads quoted fields with delimiters, quotes and newlines inside, and counts their lines', async () => {
    const text = 'id,segment,bad,champion,challenger\n"A,1","web ""direct""",0,600,0.1\n"B\nsecond line",branch,1,550,0.4\n"C",broker,0,abc,0.2\n';
    const { holdout } = await load(text.replace(',abc,', ',610,'), { id: 'id', segments: ['segment'] });
    expect(holdout.ids).toEqual(['A,1', 'B\nsecond line', 'C']);
    expect(holdout.segments[0].levels).toEqual(['web "direct"', 'branch', 'broker']);
    // the record of "C" starts on line 5: header 1, A 2, B 3–4
    const error = await failure(text, { id: 'id' });
    expect(error.message).toBe('row 5, column "champion": "abc" is not a number');
  });

  it('streams across chunk boundaries (CRLF split between chunks, multi-byte characters)', async () => {
    const lines = ['id,bad,champion,challenger'];
    for (let i = 0; i < 60_000; i++) lines.push(`Zürich-€-${i},${i % 9 === 0 ? 1 : 0},${500 + (i % 300)},${(i % 97) / 97}`);
    const text = lines.join('\r\n') + '\r\n';
    expect(bytes(text).length).toBeGreaterThan(2 << 20);
    const { holdout, input } = await load(text, { id: 'id' });
    expect(holdout.n).toBe(60_000);
    expect(holdout.ids![59_999]).toBe('Zürich-€-59999');
    expect(holdout.bad.reduce((s, b) => s + b, 0)).toBe(Math.ceil(60_000 / 9));
    expect(input.sha256).toBe(createHash('sha256').update(text).digest('hex'));
  });

  it('reads the same from a path as from bytes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'scorecourt-reader-'));
    const path = join(dir, 'holdout.csv');
    writeFileSync(path, basic);
    const fromPath = await loadHoldout({ path }, mapping);
    const fromBytes = await load(readFileSync(path));
    expect(fromPath.holdout).toEqual(fromBytes.holdout);
    expect(fromPath.input).toEqual({ ...fromBytes.input, fileName: 'holdout.csv' });
  });

  it('maps outcome values as text, and numerically when both are numbers', async () => {
    const { holdout } = await load('bad,champion,challenger\n0,1,1\n1.0,2,2\n0.0,3,3\n');
    expect([...holdout.bad]).toEqual([0, 1, 0]);
    const words = await load('status,champion,challenger\ngood,1,1\nbad,2,2\n', { outcome: 'status', badValue: 'bad' });
    expect([...words.holdout.bad]).toEqual([0, 1]);
  });

  it('reads ids, segments and exposure', async () => {
    const text = 'id,channel,amount,bad,champion,challenger\nA,web,1000,0,600,0.1\nB,,2500.5,1,550,0.4\nC,web,300,0,610,0.05\n';
    const { holdout, read } = await load(text, { id: 'id', segments: ['channel'], exposure: 'amount' });
    expect(holdout.ids).toEqual(['A', 'B', 'C']);
    expect([...holdout.exposure!]).toEqual([1000, 2500.5, 300]);
    expect(holdout.segments[0]).toEqual({ column: 'channel', levels: ['web', '(blank)'], codes: Uint32Array.from([0, 1, 0]) });
    expect(read.missingByColumn).toEqual({ bad: 0, champion: 0, challenger: 0, id: 0, amount: 0, channel: 1 });
  });

  it('drops rows with a missing score only when asked, and counts them', async () => {
    const text = 'bad,champion,challenger\n0,600,0.1\n1,,0.4\n0,610,NA\n1,500,0.3\n';
    const error = await failure(text);
    expect(error).toMatchObject({ code: 'missing_score', row: 3, column: 'champion' });
    expect(error.message).toBe('row 3, column "champion": the score is empty; rows with a missing score can be left out with the drop-missing option');
    const { holdout, read } = await load(text, {}, { dropMissing: true });
    expect(holdout.n).toBe(2);
    expect(read).toMatchObject({ rowsRead: 4, rowsUsed: 2, rowsDroppedMissingScore: 2, missingByColumn: { bad: 0, champion: 1, challenger: 1 } });
  });
});

describe('bad input', () => {
  it('names the row and column of text in a score', async () => {
    const error = await failure('bad,champion,challenger\n0,600,0.1\n1,550,abc\n');
    expect(error).toMatchObject({ code: 'not_a_number', row: 3, column: 'challenger', message: 'row 3, column "challenger": "abc" is not a number' });
    // hexadecimal, Infinity and a comma decimal in a comma file are not numbers either
    for (const cell of ['0x1F', 'Infinity', '"1,5"']) expect((await failure(`bad,champion,challenger\n0,600,${cell}\n1,1,1\n`)).code).toBe('not_a_number');
  });

  it('names the row and column of an amount too large to be summed (over 1e15)', async () => {
    const error = await failure('bad,champion,challenger,amount\n0,600,610,1000\n1,550,540,1.7976931348623157e308\n', { exposure: 'amount' });
    expect(error).toMatchObject({ code: 'amount_too_large', row: 3, column: 'amount' });
    expect(error.message).toBe('row 3, column "amount": "1.7976931348623157e308" is too large for an amount (at most 10¹⁵ either way)');
  });

  it('names an outcome outside the two values', async () => {
    const error = await failure('bad,champion,challenger\n0,600,0.1\n1,550,0.4\n2,500,0.2\n');
    expect(error.message).toBe('row 4, column "bad": "2" is neither the bad value "1" nor the good value "0"');
    expect((await failure('bad,champion,challenger\n0,600,0.1\n,550,0.4\n')).message).toBe(
      'row 3, column "bad": the outcome is empty; applicants without an outcome can be kept with the keep-unknown option',
    );
  });

  it('names a missing column and lists the columns found', async () => {
    const error = await failure(basic, { challenger: 'challenger_pd' });
    expect(error).toMatchObject({ code: 'missing_column', row: 1, column: 'challenger_pd' });
    expect(error.message).toBe('column "challenger_pd" is not in the file (its columns: "bad", "champion", "challenger")');
  });

  it('names a ragged row', async () => {
    const error = await failure('bad,champion,challenger\n0,600,0.1\n1,550\n');
    expect(error).toMatchObject({ code: 'ragged_row', row: 3, message: 'row 3 has 2 fields, the header has 3' });
  });

  it('refuses an empty file, a header-only file and a single class', async () => {
    expect((await failure('')).code).toBe('empty_file');
    expect((await failure('\n\n')).code).toBe('empty_file');
    expect(await failure('bad,champion,challenger\n')).toMatchObject({ code: 'no_rows', message: 'the file has a header but no data rows' });
    const single = await failure('bad,champion,challenger\n0,600,0.1\n0,550,0.4\n');
    expect(single).toMatchObject({ code: 'single_class', row: null, column: 'bad' });
    expect(single.message).toBe('column "bad": every row used has the good value "0"; no row has the bad value "1" (is the bad value right?); a comparison needs both goods and bads');
  });

  it('refuses binary input: invalid UTF-8, NUL bytes, a ZIP (xlsx) or gzip file', async () => {
    expect((await failure(Uint8Array.from([0x62, 0x61, 0x64, 0x0a, 0xff, 0xfe, 0x00, 0x31]))).code).toBe('not_utf8');
    expect((await failure('bad,champion,challenger\n0,6\u000000,1\n')).code).toBe('binary_file');
    expect((await failure(Uint8Array.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00]))).message).toContain('ZIP archive');
    expect((await failure(Uint8Array.from([0x1f, 0x8b, 0x08, 0x00]))).message).toContain('gzip');
  });

  it('guards against absurd input: too many columns, a row longer than the limit (an open quote)', async () => {
    const wide = Array.from({ length: MAX_COLUMNS + 1 }, (_, i) => `c${i}`).join(',') + '\n';
    expect((await failure(wide)).code).toBe('too_many_columns');
    const open = `bad,champion,challenger\n0,600,"${'x'.repeat(MAX_ROW_CHARS + 10)}\n1,1,1\n`;
    const error = await failure(open);
    expect(error).toMatchObject({ code: 'row_too_long', row: 2 });
    expect(error.message).toContain('is a quote left open?');
  });

  it('refuses a weight column that is not in the file and an outcome mapped as a score', async () => {
    expect(await failure(basic, { weight: 'w' })).toMatchObject({ code: 'missing_column', column: 'w' });
    expect((await failure(basic, { champion: 'bad' })).code).toBe('same_column');
  });
});

describe('validation report', () => {
  it('lists the deliberate mistakes of the demo file by line and column', async () => {
    // sample-data/README.md: text in a score (line 13), an outcome of 2 (line 58), a short row
    // (line 102), an empty score (line 151).
    const report = await validateHoldout(
      { path: new URL('../../../sample-data/tallowmere-holdout-broken.csv', import.meta.url).pathname },
      {
        outcome: 'bad_12m',
        badValue: '1',
        champion: 'champion_points',
        challenger: 'challenger_points',
        higherIs: { champion: 'safer', challenger: 'safer' },
        id: 'account_id',
        segments: ['product', 'channel'],
        exposure: 'loan_amount',
      },
    );
    expect(report.ok).toBe(false);
    expect(report.summary).toBeNull();
    expect(report.errors.map((error) => [error.row, error.column])).toEqual([
      [13, 'challenger_points'],
      [58, 'bad_12m'],
      [102, null],
      [151, 'champion_points'],
    ]);
    expect(report.errors[0].message).toBe('row 13, column "challenger_points": "#VALUE!" is not a number');
  });

  it('summarises a clean file', async () => {
    const report = await validateHoldout({ bytes: bytes(basic), fileName: 'ok.csv' }, mapping);
    expect(report).toMatchObject({ ok: true, errors: [], summary: { rows: 3, rowsUsed: 3, goods: 2, bads: 1, badRate: 1 / 3, warnings: [] } });
  });

  it('stops at 50 problems', async () => {
    const text = 'bad,champion,challenger\n' + Array.from({ length: 80 }, (_, i) => `${i % 2},x${i},0.1`).join('\n');
    const report = await validateHoldout({ bytes: bytes(text), fileName: 'bad.csv' }, mapping);
    expect(report.errors).toHaveLength(50);
    expect(report.errors[49].row).toBe(51);
  });
});

describe('bad input found by the reliability suite (tests/reliability/reader-properties.test.ts)', () => {
  it('names the row of a quote that is never closed, after reading the rows before it', async () => {
    const text = 'bad,champion,challenger\n0,600,0.1\n1,"550,0.4\n0,610,0.05\n';
    expect(await failure(text)).toMatchObject({
      code: 'unclosed_quote',
      row: 3,
      message: 'row 3: a quote opened on this row is never closed, so the rest of the file reads as one field',
    });
    // Problems before it come first in the validation report, in file order.
    const report = await validateHoldout({ bytes: bytes(`bad,champion,challenger\n0,x,0.1\n${text.split('\n').slice(2).join('\n')}`), fileName: 'q.csv' }, mapping);
    expect(report.errors.map((error) => [error.row, error.column])).toEqual([
      [2, 'champion'],
      [3, null],
    ]);
  });

  it('keeps the problems found before one that stops the reader (a row over the limit)', async () => {
    const text = `bad,champion,challenger\n0,abc,0.1\n1,550,0.4\n0,600,"${'x'.repeat(MAX_ROW_CHARS + 10)}\n1,1,1\n`;
    const report = await validateHoldout({ bytes: bytes(text), fileName: 'long.csv' }, mapping);
    expect(report.errors.map((error) => error.row)).toEqual([2, 4]);
    expect(report.errors[0].message).toBe((await failure(text)).message);
  });

  it('explains a ragged row: a quoted field over several lines, or mixed line ends', async () => {
    const open = 'bad,champion,challenger\n0,600,0.1\n1,"550\n0",610,0.05\n"x"\n';
    expect((await failure(open)).message).toBe('row 3 has 4 fields, the header has 3; a quoted field on it runs over several lines: is a quote left open?');
    const mixed = 'bad,champion,challenger\r0,600,0.1\n1,550,0.4\r';
    expect((await failure(mixed)).message).toBe('row 2 has 5 fields, the header has 3; the file mixes line ends (its header ends with CR): save it with one kind');
  });

  it('names UTF-16, with or without a byte-order mark', async () => {
    const utf16 = Buffer.from(basic, 'utf16le');
    expect((await failure(Uint8Array.from([0xff, 0xfe, ...utf16]))).message).toBe('the file is UTF-16 text (little-endian, with a byte-order mark), not UTF-8: save it as CSV in UTF-8');
    expect((await failure(Uint8Array.from([0xfe, 0xff, ...Buffer.from(utf16).swap16()]))).message).toContain('UTF-16 text (big-endian, with a byte-order mark)');
    expect((await failure(Uint8Array.from(utf16))).message).toContain('UTF-16 text (little-endian)');
  });

  it('reads a hexadecimal literal after spaces as text, not a number', async () => {
    expect(await failure('bad,champion,challenger\n0, 0x1f,0.1\n1,550,0.4\n')).toMatchObject({ code: 'not_a_number', row: 2, column: 'champion' });
  });

  it('keeps a message on one line and short, whatever the column names hold', async () => {
    const header = `"a\nb",${'w'.repeat(5000)},champion,challenger\n1,2,3,4\n`;
    const error = await failure(header);
    expect(error.code).toBe('missing_column');
    expect(error.message).not.toMatch(/[\r\n]/);
    expect(error.message).toBe(`column "bad" is not in the file (its columns: "a\\nb", "${'w'.repeat(57)}…", "champion", "challenger")`);
  });
});

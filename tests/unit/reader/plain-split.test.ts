import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import type { ColumnMapping } from '@shared/report';
import { type Delimiter, splitPlain } from '@server/reader/csv-records';
import type { HoldoutInputError } from '@server/reader/errors';
import { loadHoldout } from '@server/reader/load';

/**
 * The reader's own splitter for text without quotes (issue 20), against papaparse (5.7.1, the
 * parser it stands in for) on the same text, and the loader on files long enough for most of
 * their rows to go through it (the first 256 KB chunk, with the header, goes to the parser).
 */

const newlines = ['\n', '\r\n', '\r'] as const;

function papa(input: string, last: boolean, delimiter: Delimiter, newline: (typeof newlines)[number]) {
  const parser = new Papa.Parser({ delimiter, newline, quoteChar: '"' });
  const result = parser.parse(input, 0, !last) as { data: string[][]; meta: { cursor: number } };
  return { data: result.data, cursor: last ? input.length : result.meta.cursor };
}

describe('the plain splitter', () => {
  it('cuts text without quotes into the rows and fields papaparse does (all line ends, chunk ends)', () => {
    const cell = fc.stringMatching(/^[a-z0-9 .\-;,\t\r\n]{0,6}$/);
    fc.assert(
      fc.property(fc.array(fc.array(cell, { minLength: 1, maxLength: 5 }), { minLength: 1, maxLength: 8 }), fc.constantFrom(...newlines), fc.constantFrom<Delimiter>(',', ';', '\t'), fc.boolean(), (rows, newline, delimiter, last) => {
        const text = rows.map((row) => row.join(delimiter)).join(newline);
        expect(splitPlain(text, last, delimiter, newline, null)).toEqual(papa(text, last, delimiter, newline));
      }),
      { numRuns: 2000 },
    );
  });

  it('leaves unread columns empty, and gives rows of another width or of one field whole', () => {
    const wanted = [true, false, true];
    const { data, cursor } = splitPlain('a,b,c\n1,2\n\n4,5,6,7\nx,y,z\nrest,of', false, ',', '\n', wanted);
    expect(data).toEqual([['a', '', 'c'], ['1', '2'], [''], ['4', '5', '6', '7'], ['x', '', 'z']]);
    expect(cursor).toBe('a,b,c\n1,2\n\n4,5,6,7\nx,y,z\n'.length);
    expect(splitPlain('only', false, ',', '\n', wanted)).toEqual({ data: [], cursor: 0 });
  });
});

describe('files read through the plain splitter', () => {
  const mapping: ColumnMapping = {
    outcome: 'bad',
    badValue: '1',
    champion: 'champion',
    challenger: 'challenger',
    higherIs: { champion: 'safer', challenger: 'safer' },
    segments: ['channel'],
  };
  const rows = 40_000; // about 1 MB: four chunks
  const file = (newline: string, fault?: (i: number) => string | null) => {
    const lines = ['id,channel,bad,champion,note,challenger'];
    for (let i = 0; i < rows; i++) lines.push(fault?.(i) ?? `A${i},${['web', 'branch'][i % 2]},${i % 7 === 0 ? 1 : 0},${500 + (i % 97)},n${i},${0.5 + (i % 1000) / 4000}`);
    return new TextEncoder().encode(lines.join(newline) + newline);
  };

  it.each(newlines)('load every row, value and segment (line end %j)', async (newline) => {
    const { holdout, read } = await loadHoldout({ bytes: file(newline), fileName: 'plain.csv' }, mapping);
    expect(read.rowsRead).toBe(rows);
    for (const i of [0, 1, 9_999, 10_000, 25_117, rows - 1]) {
      expect(holdout.bad[i]).toBe(i % 7 === 0 ? 1 : 0);
      expect(holdout.champion[i]).toBe(500 + (i % 97));
      expect(holdout.challenger[i]).toBe(0.5 + (i % 1000) / 4000);
      expect(holdout.segments[0].levels[holdout.segments[0].codes[i]]).toBe(['web', 'branch'][i % 2]);
    }
  });

  it('names the row of a bad value or a ragged row far into the file', async () => {
    const at = 31_000; // data row 31,001: line 31,002
    const fail = async (bytes: Uint8Array) => {
      try {
        await loadHoldout({ bytes, fileName: 'plain.csv' }, mapping);
      } catch (error) {
        return error as HoldoutInputError;
      }
      throw new Error('expected an error');
    };
    expect((await fail(file('\n', (i) => (i === at ? `A${i},web,0,abc,n,0.5` : null)))).message).toBe('row 31002, column "champion": "abc" is not a number');
    expect((await fail(file('\r\n', (i) => (i === at ? `A${i},web,0,500,0.5` : null)))).message).toBe('row 31002 has 5 fields, the header has 6');
  });
});

import { describe, expect, it } from 'vitest';
import { downloadName, safeCell } from '@server/comparisons/csv';
import type { RunInput } from '@server/db/entities/index';
import { decodeHoldout, decodeOrders, encodeHoldout, encodeOrder, viewAs } from '@server/holdouts/columns';
import { sanitiseFileName } from '@server/holdouts/file-name';
import type { Holdout } from '@server/stats/holdout';

describe('sanitiseFileName', () => {
  it('keeps only the last path segment, without control, bidi or leading-dot characters', () => {
    expect(sanitiseFileName('../../etc/passwd')).toBe('passwd');
    expect(sanitiseFileName('C:\\Users\\ana\\holdout 2025.csv')).toBe('holdout 2025.csv');
    expect(sanitiseFileName('evil\u202Evsc.csv')).toBe('evilvsc.csv');
    expect(sanitiseFileName('a\u0000b\u0007c\u009f.csv')).toBe('abc.csv');
    expect(sanitiseFileName('...hidden.csv')).toBe('hidden.csv');
    expect(sanitiseFileName('Prüfung – Ausfälle.csv')).toBe('Prüfung – Ausfälle.csv');
  });

  it('falls back to holdout.csv and caps the length at 200 characters', () => {
    for (const name of [undefined, null, '', '..', '/', ' \u0001 ']) expect(sanitiseFileName(name)).toBe('holdout.csv');
    expect(sanitiseFileName(`${'x'.repeat(300)}.csv`)).toHaveLength(200);
    expect(sanitiseFileName(`${'x'.repeat(300)}.csv`)).toBe(`${'x'.repeat(196)}.csv`);
    expect(sanitiseFileName(`${'ü'.repeat(250)}.tsv.gz`)).toBe(`${'ü'.repeat(197)}.gz`);
    expect(sanitiseFileName('y'.repeat(250))).toBe('y'.repeat(200));
    expect(sanitiseFileName('z'.repeat(100))).toBe('z'.repeat(100));
  });
});

describe('stored columns', () => {
  const holdout: Holdout = {
    n: 4,
    bad: Uint8Array.from([0, 1, 0, 1]),
    champion: Float64Array.from([600, 550.5, -3, 1e-9]),
    challenger: Float64Array.from([0.1, 0.4, 0.05, Number.MAX_VALUE]),
    higherIs: { champion: 'safer', challenger: 'riskier' },
    exposure: Float64Array.from([1000, 2500, 0, 12.25]),
    ids: ['A-1', '', 'Ç-3', 'line\nbreak'],
    segments: [{ column: 'channel', levels: ['web', 'branch'], codes: Uint32Array.from([0, 1, 1, 0]) }],
  };
  const input = { n: 4, hasIds: true, hasExposure: true, segments: [{ column: 'channel', levels: ['web', 'branch'] }] } as RunInput;
  const mapping = { outcome: 'bad', badValue: '1', champion: 'a', challenger: 'b', higherIs: { champion: 'safer', challenger: 'riskier' } } as const;

  it('decode what they encode, exactly, also from misaligned bytes', () => {
    const stored = new Map<string, Uint8Array>();
    for (const column of encodeHoldout(holdout)) {
      // Copied to an odd offset, as a database driver could hand them back.
      const shifted = new Uint8Array(column.data.length + 1).subarray(1);
      shifted.set(column.data);
      stored.set(column.name, shifted);
    }
    expect([...stored.keys()].sort()).toEqual(['bad', 'challenger', 'champion', 'exposure', 'ids', 'segment.0']);
    expect(decodeHoldout(input, mapping, stored)).toEqual(holdout);
    expect(decodeOrders(4, stored)).toBeNull();
    stored.set('order.champion', encodeOrder(Uint32Array.from([2, 3, 1, 0])));
    stored.set('order.challenger', encodeOrder(Uint32Array.from([3, 1, 0, 2])));
    expect(decodeOrders(4, stored)).toEqual({ champion: Uint32Array.from([2, 3, 1, 0]), challenger: Uint32Array.from([3, 1, 0, 2]) });
  });

  it('refuse a column of the wrong length', () => {
    expect(() => viewAs(Float64Array, new Uint8Array(24), 4, 'champion')).toThrow('stored column champion has 24 bytes, expected 32');
  });
});

describe('CSV cells', () => {
  it('escape text that a spreadsheet would run as a formula, and leave numbers as numbers', () => {
    // OWASP "CSV Injection": =, +, -, @, tab and carriage return start a formula.
    for (const text of ['=1+1', '+1', '-1+1', '@SUM(A1)', '\t=1', '\r=1']) expect(safeCell(text)).toBe(`'${text}`);
    for (const text of ['plain', "'already", '1-1', 'a=b', 'Ｘ＝1', '５']) expect(safeCell(text)).toBe(text);
    // Look-alike and hidden starts: full-width ＝＋－＠, the small ﹦, the minus sign, blanks and invisible characters before.
    for (const text of ['＝1+1', '＋1', '－1+1', '＠SUM(A1)', '﹦1', '−1+1', ' =1', '\u3000=1', '\u200b=1', '\ufeff=1', '\n=1']) expect(safeCell(text), JSON.stringify(text)).toBe(`'${text}`);
    expect(safeCell(-0.25)).toBe(-0.25);
    expect(safeCell(null)).toBe('');
    expect(safeCell(Number.NaN)).toBe('');
  });

  it('build download names from a-z, 0-9 and dashes only', () => {
    expect(downloadName({ id: 7, name: 'Q3 "Cards" → =HYPERLINK(x)' }, 'swap.csv')).toBe('comparison-7-q3-cards-hyperlink-x-swap.csv');
    expect(downloadName({ id: 8, name: '../../' }, 'bands.csv')).toBe('comparison-8-bands.csv');
    expect(downloadName({ id: 9, name: 'Crédit coopératif' }, 'report.json')).toBe('comparison-9-credit-cooperatif-report.json');
  });
});

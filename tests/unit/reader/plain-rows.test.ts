import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { ColumnMapping } from '@shared/report';
import { HoldoutInputError } from '@server/reader/errors';
import { loadHoldout, type LoadOptions, validateHoldout } from '@server/reader/load';
import { plainDecimal } from '@server/reader/values';

/**
 * The plain rows (issue 20): lines without quotes read straight from the text (load.ts
 * plainRows, values.ts plainDecimal), every other row through the general path. The reference is
 * the general path alone (`plainRows: false`) and, for the numbers, JavaScript's Number(): both
 * must give the same holdout to the bit and the same errors, naming the same row and column.
 */

describe('plainDecimal', () => {
  const same = (text: string) => {
    const value = plainDecimal(text, 0, text.length);
    if (Number.isNaN(value)) return;
    expect(Object.is(value, Number(text)), text).toBe(true);
  };

  it('gives Number()’s double, to the bit, for every plain decimal of up to 15 digits', () => {
    const decimal = fc
      .tuple(fc.boolean(), fc.stringMatching(/^[0-9]{1,15}$/), fc.stringMatching(/^[0-9]{0,14}$/))
      .map(([negative, whole, fraction]) => `${negative ? '-' : ''}${whole}${fraction ? '.' + fraction : ''}`);
    fc.assert(
      fc.property(decimal, (text) => {
        const digits = text.replace(/[^0-9]/g, '').length;
        const value = plainDecimal(text, 0, text.length);
        if (digits <= 15) expect(Object.is(value, Number(text)), text).toBe(true);
        else expect(value).toBeNaN();
      }),
      { numRuns: 20_000 },
    );
    // Scores as bench and banks write them: six-decimal PDs, points, amounts in cents.
    for (let i = 0; i < 20_000; i++) same(((i * 7919) % 1_000_000 / 1e6).toFixed(6));
    for (const text of ['0', '-0', '-0.0', '007', '0.1', '0.3', '123456789012345', '99999999999999.9', '0.000001', '1.000000', '-12.5']) {
      expect(Object.is(plainDecimal(text, 0, text.length), Number(text)), text).toBe(true);
    }
  });

  it('is NaN for anything else, which the general parser then reads', () => {
    for (const text of ['', '-', '.5', '5.', '+5', '1e5', '1E-3', ' 5', '5 ', '0x1f', '1,5', '1.2.3', 'NA', '--1', '1234567890123456', '0.1234567890123456', 'Infinity', '5\t']) {
      expect(plainDecimal(text, 0, text.length), JSON.stringify(text)).toBeNaN();
    }
  });

  it('reads only its own range of the text', () => {
    const text = 'x,12.5,-3,y';
    expect(plainDecimal(text, 2, 6)).toBe(12.5);
    expect(plainDecimal(text, 7, 9)).toBe(-3);
    expect(plainDecimal(text, 1, 6)).toBeNaN();
  });
});

/** A seeded generator of holdout files with rare cells of every kind the general path handles. */
function holdoutText(seed: number, rows: number, options: { delimiter?: string; newline?: string; faults?: number; quotes?: boolean } = {}) {
  let state = seed >>> 0 || 1;
  const random = () => {
    state ^= state << 13;
    state ^= state >>> 17;
    state ^= state << 5;
    return (state >>> 0) / 2 ** 32;
  };
  const d = options.delimiter ?? ',';
  const faults = options.faults ?? 0.01;
  const pick = <T,>(values: readonly T[]) => values[Math.floor(random() * values.length)];
  const lines = [['id', 'channel', 'bad', 'champion', 'note', 'challenger', 'amount', 'w', 'refit', 'pd'].join(d)];
  const oddScores = ['', 'NA', ' 512 ', '5e2', '+5', '0x1f', 'abc', '0.12345678901234567', '-0', '007', '.5', '5.', '1,5', '-', 'null'];
  const oddOutcomes = ['x', '', ' 1', '1.0', '0.0', 'NA', 'reject', '-1'];
  const oddIds = ['', ' A1', 'B2 ', 'NA'];
  const oddLevels = ['phone', ' web', 'NA', '(blank)', '', 'broker', 'web '];
  for (let i = 0; i < rows; i++) {
    const odd = () => random() < faults;
    if (odd() && random() < 0.15) {
      lines.push(pick(['', '1,2', 'a,b,c,d,e,f,g,h,i,j,k']).replaceAll(',', d));
      continue;
    }
    const champion = odd() ? pick(oddScores) : String(300 + Math.floor(random() * 550));
    const challenger = odd() ? pick(oddScores) : (random() * 0.999).toFixed(6);
    const cells = [
      odd() ? pick(oddIds) : `A${i}`,
      odd() ? pick(oddLevels) : pick(['web', 'branch', 'partner']),
      odd() ? pick(oddOutcomes) : random() < 0.1 ? '1' : '0',
      champion,
      options.quotes && odd() ? '"said ""no"""' : 'n',
      challenger,
      odd() ? pick(['', '1e16', '-2500.50', 'abc', '1000000000000000000']) : (1000 + Math.floor(random() * 9e6) / 100).toFixed(2),
      odd() ? pick(['0', '-1', '', 'abc', '2.5']) : String(1 + Math.floor(random() * 4)),
      odd() ? pick(oddScores) : String(300 + Math.floor(random() * 550)),
      odd() ? pick(['1.5', '-0.1', '', '0.25']) : (random() * 0.5).toFixed(6),
    ];
    lines.push(cells.join(d));
  }
  return new TextEncoder().encode(lines.join(options.newline ?? '\n') + (random() < 0.5 ? options.newline ?? '\n' : ''));
}

const base: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'riskier' },
  id: 'id',
  segments: ['channel'],
  exposure: 'amount',
};
const mappings: [string, ColumnMapping, LoadOptions][] = [
  ['id, segment, exposure', base, {}],
  ['drop-missing', base, { dropMissing: true }],
  ['no id, no exposure', { ...base, id: null, exposure: null }, { dropMissing: true }],
  ['weights and keep-unknown', { ...base, weight: 'w', keepUnknown: true, unknownValues: ['reject', '-1'] }, { dropMissing: true }],
  ['a PD challenger and a further challenger', { ...base, challenger: 'pd', probabilityOfDefault: { champion: false, challenger: true }, moreChallengers: [{ column: 'refit', higherIs: 'safer' }] }, { dropMissing: true }],
];

type Outcome = { ok: true; value: unknown } | { ok: false; error: { code: string; message: string; row: number | null; column: string | null } };
async function settle(work: () => Promise<unknown>): Promise<Outcome> {
  try {
    return { ok: true, value: await work() };
  } catch (error) {
    if (!(error instanceof HoldoutInputError)) throw error;
    return { ok: false, error: { code: error.code, message: error.message, row: error.row, column: error.column } };
  }
}

describe('the plain rows against the general path', () => {
  const fileName = 'plain-rows.csv';
  // 12,000 rows of about 70 bytes: four chunks, the first (with the header) through the parser.
  it.each(mappings)('loads the same holdout, or fails on the same row and column (%s)', async (_, mapping, options) => {
    let loads = 0;
    for (const [seed, faults, delimiter, newline] of [
      [1, 0, ',', '\n'],
      [2, 0.0005, ',', '\r\n'],
      [3, 0.002, ';', '\n'],
      [4, 0.0001, '\t', '\r'],
      [5, 0.01, ',', '\n'],
    ] as const) {
      const bytes = holdoutText(seed, 12_000, { faults, delimiter, newline });
      const fast = await settle(() => loadHoldout({ bytes, fileName }, mapping, options));
      const general = await settle(() => loadHoldout({ bytes, fileName }, mapping, { ...options, plainRows: false }));
      expect(fast).toEqual(general);
      if (fast.ok) loads++;
    }
    // Not every file fails: the holdouts themselves are compared too.
    expect(loads).toBeGreaterThan(0);
  });

  it.each(mappings)('collects the same problems, in file order, in the validation report (%s)', async (_, mapping, options) => {
    for (const seed of [11, 12]) {
      const bytes = holdoutText(seed, 12_000, { faults: 0.003, quotes: seed === 12 });
      const fast = await validateHoldout({ bytes, fileName }, mapping, { ...options, maxErrors: 500 });
      const general = await validateHoldout({ bytes, fileName }, mapping, { ...options, maxErrors: 500, plainRows: false });
      expect(fast.errors.length).toBeGreaterThan(5);
      expect(fast).toEqual(general);
    }
  });

  it('reads a clean file through the plain rows with the values of its text', async () => {
    const bytes = holdoutText(21, 12_000, { faults: 0 });
    const { holdout, read } = await loadHoldout({ bytes, fileName }, base);
    const text = new TextDecoder().decode(bytes).trim().split('\n');
    expect(read.rowsRead).toBe(12_000);
    for (const i of [0, 4_000, 7_777, 11_999]) {
      const cells = text[i + 1].split(',');
      expect(holdout.ids![i]).toBe(cells[0]);
      expect(holdout.segments[0].levels[holdout.segments[0].codes[i]]).toBe(cells[1]);
      expect(holdout.bad[i]).toBe(Number(cells[2]));
      expect(holdout.champion[i]).toBe(Number(cells[3]));
      expect(holdout.challenger[i]).toBe(Number(cells[5]));
      expect(holdout.exposure![i]).toBe(Number(cells[6]));
    }
  });
});

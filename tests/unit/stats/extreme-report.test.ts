import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { ColumnMapping } from '@shared/report';
import type { Holdout } from '@server/stats/holdout';
import { buildReport } from '@server/stats/report';
import { StatisticError } from '@server/stats/statistic-error';

/**
 * Every number in a report built from finite scores is finite (or null with its reason): scores,
 * exposures and weights at the edge of the double range (±1.7976931348623157e308), denormals
 * (5e-324), −0 and ordinary values mixed. A statistic that squares or sums such values without
 * scaling first overflows to Infinity or NaN; this walks every field of the report to find one.
 * The regression case of the reader property test (seed 959281728, path "15": one score of
 * 1.7976931348623151e+308) is the first fixed case. Expected values: by definition (finite inputs,
 * finite outputs); nothing else is compared here.
 */

const extremes = [1.7976931348623157e308, -1.7976931348623157e308, 1.7976931348623151e308, 5e-324, -5e-324, -0, 0, 1e308, -1e308, 2.2250738585072014e-308];
const input = { fileName: 'extreme.csv', sha256: '0'.repeat(64), bytes: 0 };
const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'safer' },
  exposure: 'amount',
  segments: ['region'],
};

/** Paths of the numbers in `value` that are not finite (NaN, ±Infinity). */
function nonFinite(value: unknown, path = 'report', found: string[] = []): string[] {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) found.push(`${path} = ${value}`);
  } else if (Array.isArray(value)) {
    value.forEach((item, index) => nonFinite(item, `${path}[${index}]`, found));
  } else if (value !== null && typeof value === 'object') {
    for (const [key, item] of Object.entries(value)) nonFinite(item, `${path}.${key}`, found);
  }
  return found;
}

function holdoutOf(rows: { bad: boolean; champion: number; challenger: number; amount: number; region: number }[]): Holdout {
  const n = rows.length;
  return {
    n,
    bad: Uint8Array.from(rows, (row) => (row.bad ? 1 : 0)),
    champion: Float64Array.from(rows, (row) => row.champion),
    challenger: Float64Array.from(rows, (row) => row.challenger),
    higherIs: { champion: 'safer', challenger: 'safer' },
    exposure: Float64Array.from(rows, (row) => row.amount),
    ids: null,
    segments: [{ column: 'region', levels: ['north', 'south'], codes: Uint32Array.from(rows, (row) => row.region) }],
  };
}

async function check(holdout: Holdout): Promise<string[]> {
  try {
    const report = await buildReport({ holdout, input, mapping, settings: { bootstrap: 20, seed: 3 }, threads: 0 });
    return nonFinite(report);
  } catch (error) {
    // A clear refusal of the data is an acceptable answer; anything else is a failure.
    if (error instanceof StatisticError) return [];
    throw error;
  }
}

const score = fc.oneof(fc.constantFrom(...extremes), fc.integer({ min: 300, max: 900 }), fc.double({ noNaN: true, noDefaultInfinity: true }));
const row = fc.record({
  bad: fc.boolean(),
  champion: score,
  challenger: score,
  // Amounts above 1e15 are refused by the reader (naming row and column) and by the engine.
  amount: fc.oneof(fc.constantFrom(5e-324, -0, 0, 1e15, -1e15), fc.double({ min: -1e15, max: 1e15, noNaN: true })),
  region: fc.integer({ min: 0, max: 1 }),
});

describe('a report from finite extreme values', () => {
  it('holds only finite numbers for the reader property test\'s case (seed 959281728, path "15")', async () => {
    const rows = Array.from({ length: 40 }, (_, i) => ({ bad: i % 4 === 0, champion: 500 + i, challenger: 520 + ((i * 7) % 40), amount: 1000 + i, region: i % 2 }));
    rows[15].champion = 1.7976931348623151e308;
    expect(await check(holdoutOf(rows))).toEqual([]);
  });

  it('refuses an amount beyond 1e15 rather than summing it to Infinity', async () => {
    const rows = Array.from({ length: 10 }, (_, i) => ({ bad: i < 3, champion: 500 + i, challenger: 510 - i, amount: 1000, region: i % 2 }));
    rows[4].amount = 1.7976931348623157e308;
    await expect(buildReport({ holdout: holdoutOf(rows), input, mapping, settings: { bootstrap: 0 }, threads: 0 })).rejects.toThrow(/exposure of account 5 .* at most 1e15/);
  });

  it('holds only finite numbers for ±1.8e308, denormals and −0 among ordinary values, in every field', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(row, { minLength: 8, maxLength: 60 }), async (rows) => {
        // Both outcomes present, so the report is built rather than refused.
        rows[0].bad = true;
        rows[1].bad = false;
        expect(await check(holdoutOf(rows))).toEqual([]);
      }),
      { numRuns: 60, seed: 20261202 },
    );
  });
});

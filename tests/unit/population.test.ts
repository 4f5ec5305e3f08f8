import { describe, expect, it } from 'vitest';
import { hasUnknownOrWeights, swapRowsHaveUnknownOrWeights } from '@shared/population';

// When the tables add the applicants and "without an outcome" columns (shared/population.ts).
const population = (rows: number, accounts: number, unknownRows: number) => ({
  rows,
  accounts,
  known: { rows: rows - unknownRows, accounts: accounts - unknownRows, goods: 0, bads: 0 },
  unknown: { rows: unknownRows, accounts: unknownRows },
});

describe('which reports show the population columns', () => {
  it('plain reports (and those before engine 1.2) do not', () => {
    expect(hasUnknownOrWeights({ population: undefined })).toBe(false);
    expect(hasUnknownOrWeights({ population: population(2000, 2000, 0) })).toBe(false);
  });

  it('reports with applicants without an outcome, or with weights, do', () => {
    expect(hasUnknownOrWeights({ population: population(2000, 2000, 10) })).toBe(true);
    expect(hasUnknownOrWeights({ population: population(2000, 5000, 0) })).toBe(true);
  });

  it('swap sets by segment: cells carry accounts only with weights or unknown outcomes', () => {
    const plain = { count: 10, bads: 1, badRate: 0.1, badRateCi: null, amount: null };
    expect(swapRowsHaveUnknownOrWeights([{ swapIn: plain, swapOut: plain }])).toBe(false);
    expect(swapRowsHaveUnknownOrWeights([{ swapIn: { ...plain, accounts: 40 }, swapOut: plain }])).toBe(true);
    expect(swapRowsHaveUnknownOrWeights([{ swapIn: plain, swapOut: plain, unknown: 3 }])).toBe(true);
  });
});

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { argsortAscending, safety, scoreBlocks } from '@server/stats/order';

/** The contract, by a comparator sort: ascending, ties in index order, −0 equal to +0. */
function reference(values: Float64Array): number[] {
  return [...values.keys()].sort((a, b) => (values[a] < values[b] ? -1 : values[a] > values[b] ? 1 : a - b));
}

describe('argsortAscending', () => {
  it('sorts stably, like a comparator sort, for arbitrary doubles (radix path)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ noNaN: true }), { maxLength: 300 }), (list) => {
        const values = Float64Array.from(list);
        expect([...argsortAscending(values)]).toEqual(reference(values));
      }),
    );
  });

  it('sorts stably for integer points with many ties (counting path)', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -1000, max: 1000 }), { maxLength: 500 }), (list) => {
        const values = Float64Array.from(list);
        expect([...argsortAscending(values)]).toEqual(reference(values));
      }),
    );
  });

  it('keeps −0 and +0 tied, and puts infinities at the ends', () => {
    const values = Float64Array.from([0, -0, Infinity, -Infinity, -0, 0, 1e-300, -1e-300]);
    expect([...argsortAscending(values)]).toEqual([3, 7, 0, 1, 4, 5, 6, 2]);
  });

  it('handles wide integer ranges and fractional grids', () => {
    const wide = Float64Array.from([2 ** 40, -(2 ** 40), 3, 2 ** 40, 0]);
    expect([...argsortAscending(wide)]).toEqual([1, 4, 2, 0, 3]);
    const grid = Float64Array.from([0.125, -0.5, 0.125, 0.25, -0.5]);
    expect([...argsortAscending(grid)]).toEqual([1, 4, 0, 2, 3]);
    expect(argsortAscending(new Float64Array(0))).toHaveLength(0);
  });
});

describe('scoreBlocks', () => {
  it('cuts the order into blocks of equal scores with their goods and bads', () => {
    const scores = Float64Array.from([3, 1, 3, 2, 1]);
    const bad = Uint8Array.from([1, 0, 0, 1, 1]);
    const blocks = scoreBlocks(scores, bad);
    expect(blocks.count).toBe(3);
    expect([...blocks.value]).toEqual([1, 2, 3]);
    expect([...blocks.start]).toEqual([0, 2, 3, 5]);
    expect([...blocks.goods]).toEqual([1, 0, 1]);
    expect([...blocks.bads]).toEqual([1, 1, 1]);
    expect([blocks.nGood, blocks.nBad]).toEqual([2, 3]);
  });

  it('turns riskier scores around with safety()', () => {
    const pd = Float64Array.from([0.1, 0.5]);
    expect([...safety(pd, 'riskier')]).toEqual([-0.1, -0.5]);
    expect(safety(pd, 'safer')).toBe(pd);
  });
});

describe('scoreBlocks without an order', () => {
  it('equals the blocks built from argsortAscending (values and outcomes carried through the sort)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.oneof(fc.double({ noNaN: true }), fc.integer({ min: -50, max: 50 }).map((v) => v)), fc.boolean()), { maxLength: 200 }),
        (rows) => {
          const values = Float64Array.from(rows.map(([v]) => v));
          const bad = Uint8Array.from(rows.map(([, b]) => (b ? 1 : 0)));
          const carried = scoreBlocks(values, bad);
          const gathered = scoreBlocks(values, bad, argsortAscending(values));
          expect(carried).toEqual(gathered);
          for (let k = 0; k < values.length; k++) expect(carried.sortedBad[k]).toBe(bad[carried.order[k]]);
        },
      ),
    );
    // integer points only (the counting path), and all-equal values (no radix pass at all)
    const points = Float64Array.from([600, 580, 600, 610, 580]);
    const bad = Uint8Array.from([1, 0, 0, 1, 1]);
    expect(scoreBlocks(points, bad)).toEqual(scoreBlocks(points, bad, argsortAscending(points)));
    const flat = Float64Array.from([0.5, 0.5, 0.5]);
    expect(scoreBlocks(flat, Uint8Array.from([0, 1, 0]))).toMatchObject({ count: 1, value: Float64Array.from([0.5]) });
  });
});

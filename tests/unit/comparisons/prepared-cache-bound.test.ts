import { describe, expect, it } from 'vitest';
import { BYTES_PER_ACCOUNT, heldAccounts, PreparedCache, preparedBytes, type PreparedRun } from '@server/comparisons/prepared-cache';
import type { RunInput } from '@server/db/entities/index';
import type { Holdout } from '@server/stats/holdout';
import { preparePolicyData, type PreparedHoldout } from '@server/stats/policy-data';

/** A holdout of n accounts with `further` challengers after the primary (scores with ties, as real scores have). */
function holdoutOf(n: number, further: number, weighted = false): Holdout {
  let state = 12345;
  const next = () => (state = (state * 1103515245 + 12345) % 2147483648) / 2147483648;
  const score = () => Float64Array.from({ length: n }, () => 300 + Math.floor(next() * 500));
  return {
    n,
    bad: Uint8Array.from({ length: n }, () => (next() < 0.1 ? 1 : 0)),
    champion: score(),
    challenger: score(),
    higherIs: { champion: 'safer', challenger: 'safer' },
    moreChallengers: Array.from({ length: further }, (_, k) => ({ column: `c${k + 2}`, name: `c${k + 2}`, higherIs: 'safer' as const, scores: score() })),
    exposure: null,
    ids: null,
    segments: [],
    weight: weighted ? Float64Array.from({ length: n }, () => 1 + Math.floor(next() * 3)) : null,
  };
}

const prepared = (n: number, further: number, weighted = false) => preparePolicyData(holdoutOf(n, further, weighted), { bands: 10 });

const entryOf = (runId: number, data: PreparedHoldout): PreparedRun => ({
  runId,
  input: { n: data.n } as RunInput,
  settings: {} as PreparedRun['settings'],
  data,
  matrix: {} as PreparedRun['matrix'],
});

describe('the prepared cache counts every challenger', () => {
  it('counts the bytes of every array, each further challenger adding its own', () => {
    const n = 20_000;
    const two = prepared(n, 0);
    const six = prepared(n, 4);
    // By hand: per account, a model holds its scores (raw and safety are one array when higher is
    // safer, as here) and its sorted scores (8 bytes each), its order and cumulative bads (4 each),
    // its band (1), plus its blocks' ends (4 per distinct score) and band ends; the holdout the
    // outcome (1). 2 · 25 + 1 = 51 bytes before the blocks; 25 more per further challenger.
    const model = 8 + 8 + 4 + 4 + 1;
    const blocksAndBands = (data: PreparedHoldout) => [data.champion, data.challenger, ...(data.moreChallengers ?? []).map((extra) => extra.model)].reduce((sum, m) => sum + m.blockEnds.byteLength + m.bandEnds.byteLength, 0);
    const cumulative = 4; // badsBefore has n + 1 entries
    expect(preparedBytes(two)).toBe(n * (2 * model + 1) + 2 * cumulative + blocksAndBands(two));
    expect(preparedBytes(six)).toBe(n * (6 * model + 1) + 6 * cumulative + blocksAndBands(six));
    // So a run with five challengers counts about three times a two-model run of the same rows.
    expect(heldAccounts({ data: six }) / heldAccounts({ data: two })).toBeGreaterThan(2.5);
    expect(heldAccounts({ data: two })).toBe(Math.ceil(preparedBytes(two) / BYTES_PER_ACCOUNT));
  });

  it('counts weighted runs by what they hold too (cumulative sums in 8 bytes)', () => {
    const n = 20_000;
    const plain = preparedBytes(prepared(n, 4));
    const weighted = preparedBytes(prepared(n, 4, true));
    expect(weighted).toBeGreaterThan(plain + 6 * 12 * n); // per model: accounts-before (8) and bads-before in 8 rather than 4
  });

  it('keeps its bound with five challengers: evicts by the bytes held, not by the row count', () => {
    const n = 2_000;
    const two = prepared(n, 0);
    const six = prepared(n, 4);
    const small = heldAccounts({ data: two });
    const large = heldAccounts({ data: six });
    expect(large).toBeGreaterThan(2.5 * small);
    // Room for three two-model runs, not for a five-challenger run beside them.
    const cache = new PreparedCache(3 * small);
    for (const runId of [1, 2, 3]) cache.put(entryOf(runId, two));
    expect(cache.runIds).toEqual([1, 2, 3]);
    expect(cache.heldAccounts).toBe(3 * small);
    // Counting rows (2,000 each) would keep two of them beside it; counting bytes keeps none.
    cache.put(entryOf(4, six));
    expect(cache.runIds).toEqual([4]);
    expect(cache.heldAccounts).toBe(large);
    // A two-model run beside it would exceed the bound: the five-challenger run goes first.
    cache.put(entryOf(5, two));
    expect(cache.runIds).toEqual([5]);
    expect(cache.heldAccounts).toBe(small);
    // Replacing an entry takes its old size out.
    cache.put(entryOf(5, six));
    expect(cache.heldAccounts).toBe(large);
  });
});

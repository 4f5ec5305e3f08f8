import { describe, expect, it } from 'vitest';
import type { ColumnMapping } from '@shared/report';
import { HoldoutInputError } from '@server/reader/errors';
import { loadHoldout, validateHoldout } from '@server/reader/load';
import { decodeHoldout, encodeHoldout } from '@server/holdouts/columns';

// Applicants without an outcome (keep-unknown, coded values) and sampling weights in the reader.
const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'riskier' },
};
const source = (text: string) => ({ bytes: new TextEncoder().encode(text), fileName: 'through-the-door.csv' });
const load = (text: string, extra: Partial<ColumnMapping> = {}) => loadHoldout(source(text), { ...mapping, ...extra });
async function failure(text: string, extra: Partial<ColumnMapping> = {}): Promise<HoldoutInputError> {
  try {
    await load(text, extra);
  } catch (error) {
    if (error instanceof HoldoutInputError) return error;
    throw error;
  }
  throw new Error('expected a HoldoutInputError');
}

const file = [
  'bad,champion,challenger,w,pb',
  '0,600,0.1,4,',
  '1,550,0.4,1,',
  ',500,0.3,1,0.2',
  'R,480,0.5,2,0.35',
  'reject,470,0.45,2,0.5',
  '-1,490,0.2,1,0.1',
  '0,610,0.05,4,',
].join('\n');

describe('applicants without an outcome', () => {
  it('is an error naming row and column without the option, as before', async () => {
    expect(await failure(file)).toMatchObject({ code: 'missing_outcome', row: 4, column: 'bad' });
  });

  it('keeps blank and coded outcomes as unknown rows with the option', async () => {
    const { holdout, read } = await load(file, { keepUnknown: true, unknownValues: ['R', 'reject', '-1'] });
    expect(holdout.n).toBe(7);
    expect([...holdout.known!]).toEqual([1, 1, 0, 0, 0, 0, 1]);
    expect([...holdout.bad]).toEqual([0, 1, 0, 0, 0, 0, 0]);
    expect(read).toMatchObject({ goods: 2, bads: 1, unknown: 4, weightTotal: null });
  });

  it('a coded value not declared is taken as an outcome value and refused by name', async () => {
    const error = await failure(file, { keepUnknown: true, unknownValues: ['R', 'reject'] });
    expect(error).toMatchObject({ code: 'bad_outcome', row: 7, column: 'bad' });
  });

  it('refuses a coded value equal to the bad value', async () => {
    expect((await failure(file, { keepUnknown: true, unknownValues: ['1'] })).code).toBe('bad_outcome');
  });

  it('needs goods and bads among the rows with an outcome', async () => {
    const error = await failure('bad,champion,challenger\n0,1,1\n,2,2\n0,3,3\n', { keepUnknown: true });
    expect(error.code).toBe('single_class');
    expect(error.message).toContain('with an outcome');
  });
});

describe('sampling weights', () => {
  it('reads a positive weight per row', async () => {
    const { holdout, read } = await load(file, { keepUnknown: true, unknownValues: ['R', 'reject', '-1'], weight: 'w' });
    expect([...holdout.weight!]).toEqual([4, 1, 1, 2, 2, 1, 4]);
    expect(read.weightTotal).toBe(15);
  });

  it('names row and column of a blank, zero, negative or text weight', async () => {
    const base = 'bad,champion,challenger,w\n0,600,0.1,1\n1,550,0.4,1\n';
    for (const [cell, words] of [
      ['', 'the weight is empty'],
      ['0', 'must be a positive number'],
      ['-2', 'must be a positive number'],
      ['abc', 'is not a number'],
    ] as const) {
      const error = await failure(`${base}0,610,0.05,${cell}\n`, { weight: 'w' });
      expect(error).toMatchObject({ code: 'bad_weight', row: 4, column: 'w' });
      expect(error.message).toContain(words);
    }
  });

  it('the check lists every bad weight, each with its row', async () => {
    const result = await validateHoldout(source('bad,champion,challenger,w\n0,600,0.1,0\n1,550,0.4,x\n0,1,1,1\n'), { ...mapping, weight: 'w' });
    expect(result.ok).toBe(false);
    expect(result.errors.map((e) => [e.row, e.column])).toEqual([
      [2, 'w'],
      [3, 'w'],
    ]);
  });
});

describe('inferred probability of bad', () => {
  const extra: Partial<ColumnMapping> = { keepUnknown: true, unknownValues: ['R', 'reject', '-1'], inferredBad: 'pb' };
  it('reads it on unknown rows', async () => {
    const { holdout } = await load(file, extra);
    expect([...holdout.inferredBad!].map((v) => (Number.isNaN(v) ? null : v))).toEqual([null, null, 0.2, 0.35, 0.5, 0.1, null]);
  });

  it('requires a probability 0 to 1 on every unknown row, naming row and column', async () => {
    expect(await failure(file.replace(',500,0.3,1,0.2', ',500,0.3,1,'), extra)).toMatchObject({ code: 'bad_probability', row: 4, column: 'pb' });
    expect(await failure(file.replace('R,480,0.5,2,0.35', 'R,480,0.5,2,1.35'), extra)).toMatchObject({ code: 'bad_probability', row: 5, column: 'pb' });
  });
});

describe('stored columns', () => {
  it('carry the weights, the known flags and the inferred probabilities', async () => {
    const { holdout } = await load(file, { ...{ keepUnknown: true, unknownValues: ['R', 'reject', '-1'], inferredBad: 'pb' }, weight: 'w' });
    const stored = new Map(encodeHoldout(holdout).map((column) => [column.name, new Uint8Array(column.data)]));
    const back = decodeHoldout({ n: holdout.n, hasExposure: false, hasIds: false, segments: [] } as never, mapping, stored);
    expect([...back.weight!]).toEqual([...holdout.weight!]);
    expect([...back.known!]).toEqual([...holdout.known!]);
    expect(Object.is(back.inferredBad![0], NaN)).toBe(true);
    expect(back.inferredBad![3]).toBe(0.35);
  });
});

import { describe, expect, it } from 'vitest';
import { mappingInputSchema } from '@shared/comparisons';
import { challengersOf, type ColumnMapping, mappingModelProblems } from '@shared/report';
import { decodeHoldout, encodeHoldout } from '@server/holdouts/columns';
import { HoldoutInputError } from '@server/reader/errors';
import { loadHoldout, validateHoldout } from '@server/reader/load';
import type { RunInput } from '@server/db/entities/analysis-run';

// A holdout with one champion and three challengers (the third a PD); expected values are the
// cells of the text below, read by eye.
const text = 'bad,champion,cf3,refit,pd\n0,600,0.1,610,0.02\n1,550,0.4,540,0.3\n0,610,0.05,620,0.01\n1,580,0.2,575,0.25\n';
const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'cf3',
  higherIs: { champion: 'safer', challenger: 'riskier' },
  championName: 'CF-2 scorecard',
  challengerName: 'CF-3 bureau',
  moreChallengers: [
    { column: 'refit', higherIs: 'safer', name: 'CF-2 refit' },
    { column: 'pd', higherIs: 'riskier' },
  ],
};
const load = (body: string, extra: Partial<ColumnMapping> = {}, options = {}) =>
  loadHoldout({ bytes: new TextEncoder().encode(body), fileName: 'k.csv' }, { ...mapping, ...extra }, options);

async function failure(body: string, extra: Partial<ColumnMapping> = {}): Promise<HoldoutInputError> {
  try {
    await load(body, extra);
  } catch (error) {
    if (error instanceof HoldoutInputError) return error;
    throw error;
  }
  throw new Error('expected a HoldoutInputError');
}

describe('a holdout with several challengers', () => {
  it('reads every challenger with its orientation and name, the primary in the two-model place', async () => {
    const { holdout, read } = await load(text);
    expect([...holdout.challenger]).toEqual([0.1, 0.4, 0.05, 0.2]);
    expect(holdout.moreChallengers).toHaveLength(2);
    expect(holdout.moreChallengers![0]).toMatchObject({ column: 'refit', name: 'CF-2 refit', higherIs: 'safer' });
    expect([...holdout.moreChallengers![0].scores]).toEqual([610, 540, 620, 575]);
    expect(holdout.moreChallengers![1]).toMatchObject({ column: 'pd', name: 'pd', higherIs: 'riskier' });
    expect([...holdout.moreChallengers![1].scores]).toEqual([0.02, 0.3, 0.01, 0.25]);
    expect(read.missingByColumn).toEqual({ bad: 0, champion: 0, cf3: 0, refit: 0, pd: 0 });
    expect(challengersOf(mapping).map((model) => model.name)).toEqual(['CF-3 bureau', 'CF-2 refit', 'pd']);
  });

  it('a two-model mapping reads as before: no further challengers', async () => {
    const { holdout } = await load(text, { moreChallengers: undefined });
    expect(holdout.moreChallengers).toBeUndefined();
  });

  it('names the row and column of a bad score in a further challenger', async () => {
    const error = await failure('bad,champion,cf3,refit,pd\n0,600,0.1,610,0.02\n1,550,0.4,abc,0.3\n');
    expect(error.row).toBe(3);
    expect(error.column).toBe('refit');
    expect(error.message).toContain('row 3');
    expect(error.message).toContain('"abc" is not a number');
  });

  it('collects every problem of every challenger in the validation report', async () => {
    const report = await validateHoldout(
      { bytes: new TextEncoder().encode('bad,champion,cf3,refit,pd\n0,600,0.1,,0.02\n1,550,0.4,540,x\n0,1,1,1,1\n'), fileName: 'k.csv' },
      mapping,
    );
    expect(report.ok).toBe(false);
    expect(report.errors.map((error) => [error.row, error.column])).toEqual([
      [2, 'refit'],
      [3, 'pd'],
    ]);
  });

  it('drops a row whose further challenger has no score with drop-missing, and counts it', async () => {
    const { holdout, read } = await load('bad,champion,cf3,refit,pd\n0,600,0.1,,0.02\n1,550,0.4,540,0.3\n0,610,0.05,620,0.01\n', {}, { dropMissing: true });
    expect(holdout.n).toBe(2);
    expect(read.rowsDroppedMissingScore).toBe(1);
    expect(read.missingByColumn.refit).toBe(1);
  });

  it('refuses a column named twice, a name given twice, a missing column, and a sixth challenger', async () => {
    expect((await failure(text, { moreChallengers: [{ column: 'cf3', higherIs: 'safer' }] })).message).toBe(
      'column "cf3" is both the primary challenger and challenger 2; each model needs its own score column',
    );
    expect((await failure(text, { moreChallengers: [{ column: 'champion', higherIs: 'safer' }] })).message).toContain('is both the champion and challenger 2');
    expect((await failure(text, { moreChallengers: [{ column: 'refit', higherIs: 'safer', name: ' cf-3 BUREAU ' }] })).message).toContain(
      'is given to both the primary challenger and challenger 2',
    );
    const missing = await failure(text, { moreChallengers: [{ column: 'nope', higherIs: 'safer' }] });
    expect(missing.code).toBe('missing_column');
    expect(missing.column).toBe('nope');
    const six = { ...mapping, moreChallengers: ['a', 'b', 'c', 'd', 'e'].map((column) => ({ column, higherIs: 'safer' as const })) };
    expect(mappingModelProblems(six)[0]).toBe('a comparison has at most 5 challengers; this mapping names 6');
    // The API's schema refuses both before any reading.
    expect(mappingInputSchema.safeParse(six).success).toBe(false);
    const twice = mappingInputSchema.safeParse({ ...mapping, moreChallengers: [{ column: 'cf3', higherIs: 'safer' }] });
    expect(twice.success).toBe(false);
    expect(twice.error!.issues[0].message).toContain('each model needs its own score column');
    expect(mappingInputSchema.safeParse(mapping).success).toBe(true);
  });

  it('stores and decodes every challenger as run columns', async () => {
    const { holdout } = await load(text);
    const stored = new Map(encodeHoldout(holdout).map((column) => [column.name, new Uint8Array(column.data)]));
    expect([...stored.keys()]).toContain('challenger.2');
    const input = { n: holdout.n, segments: [], hasExposure: false, hasIds: false } as unknown as RunInput;
    const decoded = decodeHoldout(input, mapping, stored);
    expect(decoded.moreChallengers!.map((extra) => [extra.name, [...extra.scores]])).toEqual([
      ['CF-2 refit', [610, 540, 620, 575]],
      ['pd', [0.02, 0.3, 0.01, 0.25]],
    ]);
  });
});

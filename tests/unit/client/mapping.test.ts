import { describe, expect, it } from 'vitest';
import { type HoldoutInfo } from '@shared/comparisons';
import { ApiError } from '@/lib/api-client';
import { nameFromFile } from '@/features/comparisons/lib/name-from-file';
import { columnOptionLabel, mappingFormDefaults, mappingFormSchema, outcomeValues, toColumnMapping } from '@/features/holdouts/lib/mapping';
import { rowErrorsFrom } from '@/features/holdouts/lib/row-errors';
import { pdGuess, pdGuessMapping } from './pd-holdout';

const guess = pdGuess;

describe('the column-mapping form', () => {
  it('starts from the reader\'s guess, with "" for columns left out', () => {
    expect(mappingFormDefaults(guess)).toEqual({
      outcome: 'bad_12m',
      badValue: '1',
      champion: 'champion_points',
      challenger: 'challenger_pd',
      higherIs: { champion: 'safer', challenger: 'riskier' },
      championName: '',
      challengerName: '',
      moreChallengers: [],
      id: 'account_id',
      segments: ['product'],
      exposure: '',
      weight: '',
      keepUnknown: false,
      unknownValues: '',
      inferredBad: '',
      dropMissing: false,
      pd: { champion: false, challenger: false },
      grades: { champion: '', challenger: '' },
      period: '',
    });
  });

  it('marks a score as a probability of default only with higher = riskier, and passes PD, grade and period on', () => {
    const base = mappingFormDefaults(guess);
    const wrong = mappingFormSchema.safeParse({ ...base, pd: { champion: true, challenger: false } });
    expect(wrong.success).toBe(false);
    expect(wrong.error!.issues[0]).toMatchObject({ path: ['pd', 'champion'], message: expect.stringMatching(/higher = riskier/) });
    const values = { ...base, pd: { champion: false, challenger: true }, grades: { champion: '', challenger: 'grade' }, period: 'application_month' };
    expect(mappingFormSchema.safeParse(values).success).toBe(true);
    expect(toColumnMapping(values)).toMatchObject({
      probabilityOfDefault: { champion: false, challenger: true },
      grades: { champion: null, challenger: 'grade' },
      period: 'application_month',
    });
  });

  it('keeps applicants without an outcome with their coded values and inferred-bad column', () => {
    const values = { ...mappingFormDefaults(guess), weight: 'w', keepUnknown: true, unknownValues: ' R, reject ,, -1, R', inferredBad: 'bureau_pd' };
    expect(toColumnMapping(values)).toMatchObject({ weight: 'w', keepUnknown: true, unknownValues: ['R', 'reject', '-1'], inferredBad: 'bureau_pd' });
    // without the option the coded values and the column are not part of the mapping
    expect(toColumnMapping({ ...values, keepUnknown: false })).not.toHaveProperty('keepUnknown');
    expect(mappingFormDefaults(guess, toColumnMapping(values))).toMatchObject({ keepUnknown: true, unknownValues: 'R, reject, -1', inferredBad: 'bureau_pd' });
  });

  it('starts from an earlier mapping when there is one', () => {
    const previous = { outcome: 'y', badValue: 'bad', champion: 'a', challenger: 'b', higherIs: { champion: 'riskier', challenger: 'safer' } } as const;
    expect(mappingFormDefaults(guess, previous, true)).toMatchObject({ outcome: 'y', badValue: 'bad', segments: [], id: '', dropMissing: true });
  });

  it('turns the form into the shared mapping, with null for columns left out', () => {
    const values = { ...mappingFormDefaults(guess), dropMissing: true };
    expect(toColumnMapping(values)).toEqual(pdGuessMapping);
  });

  it('refuses a column given two roles, naming the column and its first role', () => {
    const result = mappingFormSchema.safeParse({ ...mappingFormDefaults(guess), challenger: 'champion_points', segments: ['bad_12m'] });
    expect(result.success).toBe(false);
    const issues = result.error!.issues.map((issue) => [issue.path.join('.'), issue.message]);
    expect(issues).toContainEqual(['challenger', '"champion_points" is already the champion\'s score']);
    expect(issues).toContainEqual(['segments', '"bad_12m" is already the outcome; it cannot also be a segment']);
  });

  it('asks for each required column in words', () => {
    const result = mappingFormSchema.safeParse({ ...mappingFormDefaults(guess), outcome: '', champion: '' });
    expect(result.error!.issues.map((issue) => issue.message)).toEqual(['Choose the outcome column', "Choose the champion's score column"]);
  });

  it('offers the outcome values seen in the preview, with the guessed bad value', () => {
    const holdout = {
      columns: [
        { name: 'id', kind: 'text', distinct: 3, missing: 0 },
        { name: 'bad', kind: 'numeric', distinct: 2, missing: 0 },
      ],
      preview: [
        ['a', '0'],
        ['b', ' 0 '],
        ['c', ''],
      ],
    } satisfies Pick<HoldoutInfo, 'columns' | 'preview'>;
    // No bad in the first rows: "1" comes from the guess, which read the whole file.
    expect(outcomeValues(holdout, 'bad', ['1'])).toEqual(['0', '1']);
    expect(outcomeValues(holdout, 'missing')).toEqual([]);
    expect(columnOptionLabel(holdout.columns[1])).toBe('bad (numbers)');
  });
});

describe('problems named by row and column in an API error', () => {
  it('reads a list, the validation report shape, and a single place', () => {
    const list = [{ row: 13, column: 'challenger_points', message: 'not a number' }];
    expect(rowErrorsFrom(new ApiError(400, 'bad_input', 'x', list))).toEqual(list);
    expect(rowErrorsFrom(new ApiError(400, 'bad_input', 'x', { errors: list }))).toEqual(list);
    // The API's 400 for an upload: { row, column, problem } with the words in the message.
    expect(rowErrorsFrom(new ApiError(400, 'bad_input', 'row 102 has 6 fields, the header has 8', { row: 102, column: null, problem: 'ragged_row' }))).toEqual([
      { row: 102, column: null, message: 'row 102 has 6 fields, the header has 8' },
    ]);
    expect(rowErrorsFrom(new ApiError(400, 'bad_input', 'empty file', { row: null, column: null }))).toEqual([]);
    expect(rowErrorsFrom(new Error('x'))).toEqual([]);
  });
});

describe('a name from the file', () => {
  it('drops the extension and turns separators into spaces', () => {
    expect(nameFromFile('tallowmere-holdout-2025_sample.csv')).toBe('tallowmere holdout 2025 sample');
    expect(nameFromFile('.csv')).toBe('.csv');
  });
});

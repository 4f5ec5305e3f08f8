import { type HoldoutInfo } from '@shared/comparisons';

/**
 * The reader's guess for the demo's PD file (sample-data/tallowmere-holdout-2025-pd.csv): the
 * mapping form's starting point in the client tests (mapping.test.ts, forms/mapping-form.test.tsx).
 */
export const pdGuess: HoldoutInfo['guess'] = {
  outcome: 'bad_12m',
  badValue: '1',
  champion: 'champion_points',
  challenger: 'challenger_pd',
  higherIs: { champion: 'safer', challenger: 'riskier' },
  orientationHints: { champion: 'bads have lower scores', challenger: 'bads have higher scores' },
  id: 'account_id',
  segments: ['product'],
  exposure: null,
};

/** The shared ColumnMapping the form hands on for that guess, unchanged: null for columns left out. */
export const pdGuessMapping = {
  outcome: 'bad_12m',
  badValue: '1',
  champion: 'champion_points',
  challenger: 'challenger_pd',
  higherIs: { champion: 'safer', challenger: 'riskier' },
  id: 'account_id',
  segments: ['product'],
  exposure: null,
  weight: null,
} as const;

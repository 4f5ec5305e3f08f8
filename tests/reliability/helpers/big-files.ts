import { existsSync, mkdirSync, renameSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ColumnMapping } from '@shared/report';
import { writeBenchHoldout } from '../../../bench/holdout';

/**
 * Large seeded holdouts for the fault and load suites, written once into
 * $TMPDIR/scorecourt-bench (the engine bench's folder and seeds, bench/holdout.ts) and reused:
 * account_id, channel, loan_amount, bad, champion, challenger; integer points, higher = safer.
 */
const dataDir = join(tmpdir(), 'scorecourt-bench');

/** The file of `rows` accounts; `variant` > 0 gives other accounts of the same kind (another seed). */
export async function benchHoldout(rows: number, variant = 0): Promise<string> {
  const name = variant === 0 ? `holdout-${rows}-points` : `holdout-${rows}-points-v${variant}`;
  const file = join(dataDir, `${name}.csv`);
  if (!existsSync(file)) {
    mkdirSync(dataDir, { recursive: true });
    const partial = `${file}.${process.pid}.part`;
    await writeBenchHoldout(partial, { rows, seed: variant === 0 ? `bench-${rows}-points` : `bench-${rows}-points-v${variant}`, scores: 'points' });
    renameSync(partial, file);
  }
  return file;
}

export const benchMapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'safer' },
  id: 'account_id',
  segments: ['channel'],
  exposure: 'loan_amount',
};

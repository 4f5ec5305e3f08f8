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

export async function benchHoldout(rows: number): Promise<string> {
  const file = join(dataDir, `holdout-${rows}-points.csv`);
  if (!existsSync(file)) {
    mkdirSync(dataDir, { recursive: true });
    const partial = `${file}.${process.pid}.part`;
    await writeBenchHoldout(partial, { rows, seed: `bench-${rows}-points`, scores: 'points' });
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

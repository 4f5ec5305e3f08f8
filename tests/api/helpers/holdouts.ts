import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { ColumnMapping } from '@shared/report';
import type request from 'supertest';
import type { DataSource } from 'typeorm';
import type { TestClient } from './client';

/** Helpers for the holdout and comparison API tests. */

export const sampleDir = join(import.meta.dirname, '..', '..', '..', 'sample-data');
/** The demo's 2,000-row sample (sample-data/README.md): points, higher = safer, bad_12m = 1 is bad. */
const sample2kPath = join(sampleDir, 'tallowmere-holdout-2025-sample-2k.csv');
export const sample2k = () => readFileSync(sample2kPath);
/**
 * The first `rows` accounts of the 2,000-row sample, for tests of rules rather than figures (the
 * workflow matrix): every analysis costs a tenth, the columns and both outcomes stay.
 */
export const sampleHead = (rows: number) => {
  const lines = readFileSync(sample2kPath, 'utf8').split('\n');
  return `${lines.slice(0, rows + 1).join('\n')}\n`;
};

export const sampleMapping: ColumnMapping = {
  outcome: 'bad_12m',
  badValue: '1',
  champion: 'champion_points',
  challenger: 'challenger_points',
  higherIs: { champion: 'safer', challenger: 'safer' },
  id: 'account_id',
  segments: ['product', 'channel'],
  exposure: 'loan_amount',
};

/** A multipart upload with the CSRF header, as the browser sends it. */
export async function uploadFile(client: TestClient, bytes: Buffer | string, fileName = 'holdout.csv'): Promise<request.Response> {
  const token = client.csrf ?? (await client.fetchCsrf());
  return client.agent
    .post('/api/holdouts')
    .set('X-CSRF-Token', token)
    .attach('file', typeof bytes === 'string' ? Buffer.from(bytes, 'utf8') : bytes, fileName);
}

/** Rows in each table this feature writes, and the audit trail, to check that nothing was half-stored. */
export async function rowCounts(dataSource: DataSource): Promise<Record<string, number>> {
  const counts: Record<string, number> = {};
  for (const table of ['holdouts', 'holdout_chunks', 'comparisons', 'analysis_runs', 'run_columns', 'cutoff_scenarios', 'audit_events']) {
    const [{ n }] = (await dataSource.query(`SELECT COUNT(*) AS n FROM "${table}"`)) as { n: number }[];
    counts[table] = n;
  }
  return counts;
}

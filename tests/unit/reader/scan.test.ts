import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { mappingFromGuess, PREVIEW_ROWS, scanHoldout } from '@server/reader/scan';

const sample = (name: string) => new URL(`../../../sample-data/${name}`, import.meta.url).pathname;

describe('scanning a holdout', () => {
  it('describes the demo holdout and guesses its mapping from names and data', async () => {
    const path = sample('tallowmere-holdout-2025.csv');
    const scan = await scanHoldout({ path });
    // sample-data/README.md: 58,699 rows (a through-the-door sample); columns as listed there
    expect(scan.rowCount).toBe(58_699);
    expect(scan.sha256).toBe(createHash('sha256').update(readFileSync(path)).digest('hex'));
    expect(scan.preview).toHaveLength(PREVIEW_ROWS);
    expect(scan.preview[0]).toEqual(['TCC-25-000001', '2025-05', 'credit-card', 'branch', 'credit-card/branch', '3900', '0', '622', '643', '4', '', '', '626']);
    expect(Object.fromEntries(scan.columns.map((c) => [c.name, c.kind]))).toEqual({
      account_id: 'text',
      application_month: 'categorical',
      product: 'categorical',
      channel: 'categorical',
      product_channel: 'categorical',
      loan_amount: 'numeric',
      bad_12m: 'numeric',
      champion_points: 'numeric',
      challenger_points: 'numeric',
      sample_weight: 'numeric',
      bureau_pd_12m: 'numeric',
      bureau_basis: 'categorical',
      refit_points: 'numeric',
    });
    expect(scan.guess).toMatchObject({
      outcome: 'bad_12m',
      badValue: '1',
      champion: 'champion_points',
      challenger: 'challenger_points',
      higherIs: { champion: 'safer', challenger: 'safer' },
      id: 'account_id',
      segments: ['application_month', 'product', 'channel', 'product_channel', 'bureau_basis'],
      exposure: 'loan_amount',
    });
    expect(scan.guess.orientationHints.champion).toMatch(/^bads have lower scores: AUC 0\.\d{3} taking higher = safer/);
    expect(mappingFromGuess(scan.guess)).not.toBeNull();
  });

  it('reads the orientation of a PD from the data', async () => {
    const scan = await scanHoldout({ path: sample('tallowmere-holdout-2025-pd.csv') });
    expect(scan.guess.challenger).toBe('challenger_pd');
    expect(scan.guess.higherIs.challenger).toBe('riskier');
    expect(scan.guess.orientationHints.challenger).toMatch(/^bads have higher scores/);
  });

  it('guesses without helpful names, from the data alone', async () => {
    // s1: higher for goods (safer); s2: higher for bads (riskier) — computed by hand from the rows
    const lines = ['y,s1,s2,region'];
    for (let i = 0; i < 400; i++) {
      const y = i % 4 === 0 ? 'Y' : 'N';
      lines.push(`${y},${y === 'Y' ? 300 + (i % 50) : 320 + (i % 70)},${y === 'Y' ? 0.3 + (i % 10) / 100 : 0.1 + (i % 25) / 100},${['north', 'south'][i % 2]}`);
    }
    const scan = await scanHoldout({ bytes: new TextEncoder().encode(lines.join('\n')), fileName: 'plain.csv' });
    expect(scan.guess).toMatchObject({
      outcome: 'y',
      badValue: 'Y',
      champion: 's1',
      challenger: 's2',
      higherIs: { champion: 'safer', challenger: 'riskier' },
      segments: ['region'],
      id: null,
      exposure: null,
    });
  });

  it('proposes a coded "no outcome" value of a through-the-door sample, and keeps the outcome out of the segments', async () => {
    // 300 rows: declined applicants (every third) coded R, booked ones 0 or 1 (every fifth bad).
    const lines = ['account_id,bad_12m,champion_points,challenger_points,channel'];
    for (let i = 0; i < 300; i++) {
      const outcome = i % 3 === 0 ? 'R' : i % 5 === 0 ? '1' : '0';
      lines.push(`A${i},${outcome},${outcome === '1' ? 540 + (i % 40) : 600 + (i % 60)},${outcome === '1' ? 530 + (i % 50) : 610 + (i % 55)},${['web', 'branch'][i % 2]}`);
    }
    const scan = await scanHoldout({ bytes: new TextEncoder().encode(lines.join('\n')), fileName: 'through-the-door.csv' });
    expect(scan.guess).toMatchObject({ outcome: 'bad_12m', badValue: '1', unknownValues: ['R'], champion: 'champion_points', challenger: 'challenger_points', segments: ['channel'] });
    expect(mappingFromGuess(scan.guess)).toMatchObject({ outcome: 'bad_12m', badValue: '1', keepUnknown: true, unknownValues: ['R'] });
    // A plain two-valued outcome proposes none.
    const plain = await scanHoldout({ bytes: new TextEncoder().encode(lines.filter((line) => !line.includes(',R,')).join('\n')), fileName: 'plain.csv' });
    expect(plain.guess.outcome).toBe('bad_12m');
    expect(plain.guess.unknownValues).toBeUndefined();
  });

  it('leaves the guess incomplete when there is no outcome column', async () => {
    const scan = await scanHoldout({ bytes: new TextEncoder().encode('a,b\n1,2\n3,4\n5,6\n'), fileName: 'x.csv' });
    expect(scan.guess.outcome).toBeNull();
    expect(mappingFromGuess(scan.guess)).toBeNull();
  });
});

describe('scanning a file with mistakes', () => {
  it('scans the demo broken file: counts the short row, still guesses the outcome with its stray value', async () => {
    // sample-data/README.md: a short row on line 102, an outcome of 2 on line 58
    const scan = await scanHoldout({ path: sample('tallowmere-holdout-broken.csv') });
    expect(scan.rowCount).toBe(200);
    expect(scan.problems).toEqual([{ row: 102, column: null, message: 'row 102 has 7 fields, the header has 9' }]);
    expect(scan.guess).toMatchObject({ outcome: 'bad_12m', badValue: '1', champion: 'champion_points', challenger: 'challenger_points' });
    expect(scan.columns.find((c) => c.name === 'champion_points')).toMatchObject({ kind: 'numeric', missing: 1 });
  });
});

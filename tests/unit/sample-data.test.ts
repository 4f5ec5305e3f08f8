import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildSampleFiles, sampleDataDir } from '../../sample-data/generate';

describe('demo sample data', () => {
  const files = buildSampleFiles();

  it('regenerates the committed files byte for byte', () => {
    for (const [name, text] of Object.entries(files)) {
      expect(readFileSync(join(sampleDataDir, name), 'utf8'), name).toBe(text);
    }
  });

  it('has about 60,000 accounts with a bad rate near 7%', () => {
    const [header, ...rows] = files['tallowmere-holdout-2025.csv'].trim().split('\n');
    const outcome = header.split(',').indexOf('bad_12m');
    const bads = rows.filter((row) => row.split(',')[outcome] === '1').length;
    expect(rows).toHaveLength(60_000);
    // Scenario brief: "bad rate about 7%"; the generator's intercept is tuned to it.
    expect(bads / rows.length).toBeGreaterThan(0.065);
    expect(bads / rows.length).toBeLessThan(0.075);
  });
});

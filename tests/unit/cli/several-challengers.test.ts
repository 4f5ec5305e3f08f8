import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { reportSchema } from '@shared/report';
import { parseCommand, runCompare } from '@server/cli/compare';
import { compiledEntry } from '../../setup/compiled';
import { regionsHoldoutCsv } from '../../api/helpers/regions-holdout';

const root = new URL('../../../', import.meta.url).pathname;
const reference = join(root, 'tests/reference/challengers');
// Expected values: tests/reference/challengers/joint.json, printed by joint.R (R 4.2.2, pROC 1.18.0,
// the contrast χ² with MASS::ginv) on the same CSVs.
const expected = (JSON.parse(readFileSync(join(reference, 'joint.json'), 'utf8')) as {
  cases: Record<string, { joint: { chi2: number; df: number; p: number }; auc: number[] }>;
}).cases;
const relative = (value: number, truth: number) => Math.abs(value - truth) / Math.abs(truth);

async function run(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const status = await runCompare(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), progress: false });
  return { status, stdout, stderr };
}

describe('compare CLI with several challengers', () => {
  it('reads --challenger repeated (first = primary) with its orientations and names in the same order', () => {
    const command = parseCommand([
      'f.csv',
      '--champion', 'champion',
      '--challenger', 'c1', '--challenger', 'c2', '--challenger', 'c3',
      '--challenger-higher-is', 'riskier', '--challenger-higher-is', 'safer', '--challenger-higher-is', 'riskier',
      '--challenger-name', 'CF-3 bureau', '--challenger-name', 'CF-4 open banking', '--challenger-name', 'CF-2 refit',
      '--champion-name', 'CF-2',
    ]);
    expect(command.mapping).toMatchObject({
      challenger: 'c1',
      higherIs: { champion: 'safer', challenger: 'riskier' },
      championName: 'CF-2',
      challengerName: 'CF-3 bureau',
      moreChallengers: [
        { column: 'c2', higherIs: 'safer', name: 'CF-4 open banking' },
        { column: 'c3', higherIs: 'riskier', name: 'CF-2 refit' },
      ],
    });
    // One challenger: the mapping keeps its earlier form (no new keys).
    expect(Object.keys(parseCommand(['f.csv', '--challenger', 'b', '--challenger-higher-is', 'riskier']).mapping)).toEqual([
      'outcome', 'badValue', 'champion', 'challenger', 'higherIs', 'id', 'segments', 'exposure',
    ]);
  });

  it('refuses orientations or names not given once per challenger, and a sixth challenger (exit 2)', async () => {
    const file = join(reference, 'mixed-3.csv');
    for (const [argv, message] of [
      [[file, '--challenger', 'c1', '--challenger', 'c2', '--challenger-higher-is', 'riskier'], 'compare: give --challenger-higher-is once per --challenger, in the same order (2 challengers, 1 orientations)\n'],
      [[file, '--challenger', 'c1', '--challenger', 'c2', '--challenger-name', 'A'], 'compare: give --challenger-name once per --challenger, in the same order (2 challengers, 1 names)\n'],
      [[file, ...['a', 'b', 'c', 'd', 'e', 'f'].flatMap((column) => ['--challenger', column])], 'compare: give at most 5 --challenger columns, got 6\n'],
      [[file, '--challenger', 'c1', '--challenger', 'c1'], `compare: ${file}: column "c1" is both the primary challenger and challenger 2; each model needs its own score column\n`],
      [[file, '--challenger', 'c1', '--challenger', 'c9'], `compare: ${file}: column "c9" is not in the file (its columns: "bad", "champion", "c1", "c2", "c3")\n`],
    ] as const) {
      const result = await run([...argv]);
      expect(result.status, message).toBe(2);
      expect(result.stderr).toBe(message);
    }
  });

  it('prints the joint test the R script gives, to 1e-9 relative, as a process (the compiled CLI)', () => {
    // mixed-3.csv: champion in points, c1 PD, c2 points, c3 PD (cases.json).
    const result = spawnSync(
      process.execPath,
      [
        compiledEntry('server/cli/compare'),
        join(reference, 'mixed-3.csv'),
        '--champion-higher-is', 'safer',
        ...['c1', 'c2', 'c3'].flatMap((column) => ['--challenger', column]),
        ...['riskier', 'safer', 'riskier'].flatMap((orientation) => ['--challenger-higher-is', orientation]),
        '--bootstrap', '0',
        '--json',
      ],
      { encoding: 'utf8', cwd: root },
    );
    expect(result.stderr).toBe('');
    expect(result.status).toBe(0);
    const report = reportSchema.parse(JSON.parse(result.stdout));
    const truth = expected['mixed-3.csv champion+c1+c2+c3'];
    expect(report.joint!.df).toBe(truth.joint.df);
    expect(relative(report.joint!.chi2, truth.joint.chi2)).toBeLessThan(1e-9);
    expect(relative(report.joint!.p, truth.joint.p)).toBeLessThan(1e-9);
    expect(report.challengers!.map((challenger) => challenger.metrics.auc)).toEqual(report.challengers!.map((_, k) => expect.closeTo(truth.auc[k + 1], 12)));
    expect(report.challenger).toEqual(report.challengers![0].metrics);
    expect(report.pairwise).toHaveLength(3);
  }, 60_000);

  it('summarises every challenger, the joint test and the recommended one in the readable output', async () => {
    const { status, stdout } = await run([
      join(reference, 'points-ties-3.csv'),
      ...['c1', 'c2', 'c3'].flatMap((column) => ['--challenger', column]),
      ...['CF-3 bureau', 'CF-4 open banking', 'CF-2 refit'].flatMap((name) => ['--challenger-name', name]),
      '--bootstrap', '0',
    ]);
    expect(status).toBe(0);
    expect(stdout).toContain('Challengers against the champion (ΔGini in points, 95% CI by DeLong; p one-sided, Holm-adjusted across 3)');
    expect(stdout).toMatch(/ {2}CF-4 open banking +Gini 40\.7 +ΔGini \+5\.70/);
    expect(stdout).toContain('Joint test that every challenger equals the champion: χ² = 11.190, df 3');
    expect(stdout).toContain('CF-4 open banking is recommended');
  });

  it('names the segment values where a further challenger is worse, under its line, as its verdict reads them', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'scorecourt-regions-'));
    const file = join(dir, 'regions.csv');
    writeFileSync(file, regionsHoldoutCsv());
    const common = [file, '--champion', 'champion', '--segment', 'region', '--weight', 'weight', '--id', 'id', '--bootstrap', '0'];
    const { status, stdout } = await run([...common, '--challenger', 'c1', '--challenger', 'c2', '--challenger-name', 'CF-3 bureau', '--challenger-name', 'CF-4 open banking']);
    expect(status).toBe(0);
    const lines = stdout.split('\n');
    const at = lines.findIndex((line) => line.trimStart().startsWith('CF-4 open banking') && line.includes('ΔGini'));
    expect(lines[at + 1]).toMatch(/^\s+worse than the champion in region = B \(significantly worse/);
    // The primary is worse nowhere: no such line under it; one challenger: no such line at all.
    expect(stdout.match(/worse than the champion in/g)).toHaveLength(1);
    const alone = await run([...common, '--challenger', 'c2']);
    expect(alone.stdout).not.toContain('worse than the champion in');
  });
});

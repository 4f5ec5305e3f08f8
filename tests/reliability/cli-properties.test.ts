import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { projectRoot } from '@server/runtime';
import { anyInputArb, describeCase, sampleMapping } from './helpers/holdouts';
import { checkProperty, messageProblems } from './helpers/outcomes';
import { record } from './helpers/figures';

/**
 * The compiled command-line comparison (`dist/server/cli/compare.js`, built by
 * `npm run test:reliability`) on random and mutated files, as a pipeline would run it: exit 0 with
 * the report as JSON and nothing on stderr, or exit 2 with exactly one line on stderr naming what
 * is wrong (and where) and nothing on stdout — never another status, a stack trace or a hang.
 */

const cli = join(projectRoot, 'dist/server/cli/compare.js');
const RUNS = Number(process.env.RELIABILITY_CLI_RUNS ?? 40);
let dir: string;

beforeAll(() => {
  if (!existsSync(cli)) throw new Error('dist/server/cli/compare.js is missing: run `npm run build` (npm run test:reliability does)');
  dir = mkdtempSync(join(tmpdir(), 'scorecourt-cli-props-'));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const mappingArgs = [
  '--outcome', sampleMapping.outcome,
  '--bad-value', sampleMapping.badValue,
  '--champion', sampleMapping.champion,
  '--challenger', sampleMapping.challenger,
  '--id', 'account_id',
  '--segment', 'product',
  '--segment', 'channel',
  '--exposure', 'loan_amount',
  '--bootstrap', '20',
  '--json',
];

function run(args: string[], timeoutMs = 30_000): Promise<{ code: number | null; signal: string | null; stdout: string; stderr: string; ms: number }> {
  const started = performance.now();
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [cli, ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk: Buffer) => (stdout += chunk.toString()));
    child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`HANG: the CLI took longer than ${timeoutMs} ms`));
    }, timeoutMs);
    child.on('error', reject);
    child.on('close', (code, signal) => {
      clearTimeout(timer);
      resolve({ code, signal, stdout, stderr, ms: performance.now() - started });
    });
  });
}

function outcomeProblems(result: Awaited<ReturnType<typeof run>>): string[] {
  const problems: string[] = [];
  if (result.code === 0) {
    if (result.stderr !== '') problems.push(`exit 0 but stderr: ${result.stderr.slice(0, 300)}`);
    try {
      const report = JSON.parse(result.stdout) as { rows?: unknown; verdict?: unknown };
      if (typeof report.rows !== 'number' || !report.verdict) problems.push('stdout is JSON but not a report');
    } catch {
      problems.push(`exit 0 but stdout is not JSON: ${result.stdout.slice(0, 200)}`);
    }
  } else if (result.code === 2) {
    if (result.stdout !== '') problems.push(`exit 2 but stdout: ${result.stdout.slice(0, 200)}`);
    const lines = result.stderr.replace(/\n$/, '').split('\n');
    if (lines.length !== 1) problems.push(`stderr has ${lines.length} lines: ${result.stderr.slice(0, 500)}`);
    problems.push(...messageProblems(lines[0]));
  } else {
    problems.push(`exit ${result.code} (signal ${result.signal}); stderr: ${result.stderr.slice(0, 800)}`);
  }
  return problems;
}

describe('the compare CLI under bad input', () => {
  it(`answers ${RUNS} random and mutated files with a report (exit 0) or one line on stderr (exit 2)`, async () => {
    const tally = { cases: 0, reports: 0, refused: 0, slowestMs: 0 };
    await checkProperty(
      fc.asyncProperty(anyInputArb, async (input) => {
        const file = join(dir, `case-${tally.cases++}.csv`);
        writeFileSync(file, input.bytes);
        const result = await run([file, ...mappingArgs]);
        rmSync(file, { force: true });
        tally.slowestMs = Math.max(tally.slowestMs, result.ms);
        if (result.code === 0) tally.reports++;
        if (result.code === 2) tally.refused++;
        const problems = outcomeProblems(result);
        if (problems.length > 0) throw new Error(`${describeCase(input)}:\n  ${problems.join('\n  ')}`);
      }),
      { numRuns: RUNS },
    );
    record('cli', { cases: tally.cases, reports: tally.reports, exit2: tally.refused, slowestMs: Math.round(tally.slowestMs) });
    expect(tally.reports + tally.refused).toBe(tally.cases);
  });

  it('exits 2 with one line for a million columns, a missing file, a folder and bad options', async () => {
    const wide = join(dir, 'wide.csv');
    writeFileSync(wide, Array.from({ length: 1_000_000 }, (_, i) => `c${i}`).join(',') + '\n1\n');
    const cases: [string[], RegExp][] = [
      [[wide, ...mappingArgs], /^compare: .*wide\.csv: the header has 1,000,000 columns; at most 5000 are read$/],
      [[join(dir, 'missing.csv'), ...mappingArgs], /missing\.csv/],
      [[dir, ...mappingArgs], /./],
      [[wide, '--bootstrap', '-3'], /--bootstrap/],
      [[wide, '--higher-is', 'sideways'], /--higher-is/],
      [[wide, '--no-such-option'], /no-such-option/],
    ];
    for (const [args, message] of cases) {
      const result = await run(args);
      expect(outcomeProblems(result), args.join(' ').slice(0, 100)).toEqual([]);
      expect(result.code).toBe(2);
      expect(result.stderr.trim()).toMatch(message);
    }
  });
});

import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { availableParallelism, cpus, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ColumnMapping } from '@shared/report';
import { loadHoldout } from '@server/reader/load';
import { auc } from '@server/stats/auc';
import { bootstrap } from '@server/stats/bootstrap';
import { pairedDelong } from '@server/stats/delong';
import type { Holdout } from '@server/stats/holdout';
import { ks } from '@server/stats/ks';
import { safety, scoreBlocks } from '@server/stats/order';
import { buildReport } from '@server/stats/report';
import { writeBenchHoldout } from './holdout';
import { benchPolicyStages } from './policy-stages';

/**
 * `npm run bench` (builds, then runs dist/bench/index.js): the engine's speed on a seeded
 * 1,000,000-row holdout, per stage the median of several runs and the peak memory (RSS). Each
 * stage runs in a fresh process, so its peak RSS is its own (it includes reading the file the
 * stage works on). `npm run bench -- --full` adds the whole analysis of a 5,000,000-row holdout
 * with 2,000 replicates. Targets (issue 3) are printed beside the figures; they are a benchmark,
 * not a test. Files are generated once into $TMPDIR/scorecourt-bench and reused.
 *
 * Also times R's pROC on the same 1M file when Rscript is installed (bench/proc-1m.R: data.table's
 * fread, two roc, roc.test, two ks.test), for comparison with the compare command.
 */

const ROWS = 1_000_000;
const FULL_ROWS = 5_000_000;
const here = fileURLToPath(new URL('.', import.meta.url));
const projectRoot = join(here, existsSync(join(here, '..', 'package.json')) ? '..' : '../..');
const dataDir = join(tmpdir(), 'scorecourt-bench');

type Scores = 'points' | 'continuous';

const mappingFor = (scores: Scores): ColumnMapping => {
  const higherIs = scores === 'points' ? 'safer' : 'riskier';
  return {
    outcome: 'bad',
    badValue: '1',
    champion: 'champion',
    challenger: 'challenger',
    higherIs: { champion: higherIs, challenger: higherIs },
    id: 'account_id',
    segments: ['channel'],
    exposure: 'loan_amount',
  };
};

function fileFor(scores: Scores, rows: number): string {
  return join(dataDir, `holdout-${rows}-${scores}.csv`);
}

async function ensureFile(scores: Scores, rows: number): Promise<string> {
  const path = fileFor(scores, rows);
  if (!existsSync(path)) {
    mkdirSync(dataDir, { recursive: true });
    await writeBenchHoldout(path, { rows, seed: `bench-${rows}-${scores}`, scores });
  }
  return path;
}

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
};
const maxRssMb = () => process.resourceUsage().maxRSS / 1024;

interface StageResult {
  stage: string;
  runsMs: number[];
  /** CPU time of the process (all its threads) per run: less sensitive than wall time to other
   * programs sharing the machine. */
  cpuMs?: number[];
  peakRssMb: number;
  note?: string;
}

let lastCpu: number[] = [];
async function timeRuns(runs: number, work: () => unknown | Promise<unknown>): Promise<number[]> {
  const times: number[] = [];
  lastCpu = [];
  for (let r = 0; r < runs; r++) {
    const cpu = process.cpuUsage();
    const start = performance.now();
    await work();
    times.push(performance.now() - start);
    const used = process.cpuUsage(cpu);
    lastCpu.push((used.user + used.system) / 1000);
  }
  return times;
}

async function load(scores: Scores, rows = ROWS): Promise<Holdout> {
  return (await loadHoldout({ path: fileFor(scores, rows) }, mappingFor(scores))).holdout;
}

function core(holdout: Holdout) {
  const a = scoreBlocks(safety(holdout.champion, holdout.higherIs.champion), holdout.bad);
  const b = scoreBlocks(safety(holdout.challenger, holdout.higherIs.challenger), holdout.bad);
  const delong = pairedDelong(a, b, holdout.bad, 0.95);
  return { a, b, delong, auc: [auc(a), auc(b)], ks: [ks(a, holdout.higherIs.champion), ks(b, holdout.higherIs.challenger)] };
}

/** Runs one stage in this process and prints its result as JSON (the child side). */
async function runStage(name: string): Promise<void> {
  const [kind, scores] = name.split(':') as [string, Scores];
  const results: StageResult[] = [];
  if (kind === 'read') {
    const runs = await timeRuns(3, () => load(scores));
    results.push({ stage: `read the CSV (${scores}; id, segment, exposure mapped)`, runsMs: runs, cpuMs: lastCpu, peakRssMb: maxRssMb() });
  } else if (kind === 'core') {
    const holdout = await load(scores);
    const runs = await timeRuns(7, () => core(holdout));
    results.push({ stage: `AUC + DeLong + KS, both models (${scores})`, runsMs: runs, cpuMs: lastCpu, peakRssMb: maxRssMb() });
  } else if (kind === 'bootstrap') {
    const holdout = await load(scores);
    const { a, b } = core(holdout);
    let cells = 0;
    const runs = await timeRuns(3, async () => {
      await bootstrap(a, b, holdout.bad, { replicates: 2000, seed: 1, confidence: 0.95 });
    });
    const { planBootstrap } = await import('@server/stats/bootstrap-kernel');
    cells = planBootstrap(a, b, holdout.bad).cells;
    results.push({
      stage: `2000 bootstrap replicates (${scores}), ${availableParallelism()} threads`,
      runsMs: runs,
      cpuMs: lastCpu,
      peakRssMb: maxRssMb(),
      note: `${cells.toLocaleString('en-US')} cells`,
    });
  } else if (kind === 'policy') {
    const holdout = await load(scores);
    const { a, b } = core(holdout);
    for (const timing of benchPolicyStages(holdout, { orders: { champion: a.order, challenger: b.order } })) {
      results.push({ stage: `${timing.stage} (${scores})`, runsMs: timing.runsMs, peakRssMb: maxRssMb() });
    }
  } else if (kind === 'weights') {
    // The cost of sampling weights: the whole report (bootstrap 200 replicates, one thread so the
    // comparison is not one of thread scheduling) without weights, with weights by outcome (goods
    // 4, bads 1: a one-in-four sample of goods) and with weights 1–4 at random (cells split by weight).
    const holdout = await load(scores);
    const byOutcome = new Float64Array(holdout.n);
    const random = new Float64Array(holdout.n);
    for (let i = 0; i < holdout.n; i++) {
      byOutcome[i] = holdout.bad[i] ? 1 : 4;
      random[i] = 1 + ((i * 2654435761) >>> 0) % 4;
    }
    const mapping = mappingFor(scores);
    const input = { fileName: 'bench.csv', sha256: '', bytes: 0 };
    const settings = { bootstrap: 200 };
    const variants: [string, Holdout][] = [
      ['unweighted', holdout],
      ['weights by outcome', { ...holdout, weight: byOutcome }],
      ['weights 1–4 at random', { ...holdout, weight: random }],
    ];
    const runs: number[][] = variants.map(() => []);
    for (let round = 0; round < 3; round++) {
      for (let v = 0; v < variants.length; v++) {
        const start = performance.now();
        await buildReport({ holdout: variants[v][1], input, mapping: { ...mapping, weight: v === 0 ? null : 'w' }, settings, threads: 0 });
        runs[v].push(performance.now() - start);
      }
    }
    const base = median(runs[0]);
    variants.forEach(([label], v) => {
      const ratio = median(runs[v]) / base;
      results.push({
        stage: `whole report, 200 replicates, one thread, ${label} (${scores})`,
        runsMs: runs[v],
        peakRssMb: maxRssMb(),
        note: v === 0 ? 'the base of the ratios below' : `${ratio.toFixed(2)}× unweighted (goal: under 1.20×)`,
      });
    });
  } else if (kind === 'full') {
    const cpu = process.cpuUsage();
    const start = performance.now();
    const loaded = await loadHoldout({ path: fileFor(scores, FULL_ROWS) }, mappingFor(scores));
    const read = performance.now() - start;
    const stages: string[] = [];
    let stageName = '';
    let stageStart = performance.now();
    await buildReport({
      ...loaded,
      mapping: mappingFor(scores),
      settings: { bootstrap: 2000 },
      read: loaded.read,
      onProgress: ({ stage }) => {
        const name = stage.startsWith('Bootstrap') ? 'bootstrap' : stage;
        if (name === stageName) return;
        if (stageName) stages.push(`${stageName} ${((performance.now() - stageStart) / 1000).toFixed(1)} s`);
        stageName = name;
        stageStart = performance.now();
      },
    });
    const total = performance.now() - start;
    const used = process.cpuUsage(cpu);
    results.push({
      stage: `whole analysis, ${FULL_ROWS.toLocaleString('en-US')} rows (${scores}), 2000 replicates, read included`,
      runsMs: [total],
      cpuMs: [(used.user + used.system) / 1000],
      peakRssMb: maxRssMb(),
      note: `reading ${(read / 1000).toFixed(1)} s; ${stages.join('; ')}`,
    });
  }
  process.stdout.write(JSON.stringify(results));
}

function child(stage: string): StageResult[] {
  const result = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--stage', stage], { encoding: 'utf8', maxBuffer: 1 << 24 });
  if (result.status !== 0) throw new Error(`stage ${stage} failed: ${result.stderr}`);
  return JSON.parse(result.stdout) as StageResult[];
}

/** The compare command without bootstrap, as compiled JavaScript, timed from outside. */
function compareCommand(scores: Scores): StageResult {
  const cli = join(projectRoot, 'dist/server/cli/compare.js');
  const higherIs = scores === 'points' ? 'safer' : 'riskier';
  const args = [cli, fileFor(scores, ROWS), '--bootstrap', '0', '--higher-is', higherIs, '--json'];
  const runsMs: number[] = [];
  const cpuMs: number[] = [];
  let peak = 0;
  for (let r = 0; r < 3; r++) {
    const start = performance.now();
    const result = spawnSync('/usr/bin/time', ['-f', '%M %U %S', process.execPath, ...args], { encoding: 'utf8', maxBuffer: 1 << 28 });
    runsMs.push(performance.now() - start);
    if (result.status !== 0) throw new Error(`compare failed: ${result.stderr}`);
    const [rss, user, system] = (result.stderr.trim().split('\n').at(-1) ?? '').split(' ').map(Number);
    peak = Math.max(peak, rss / 1024);
    cpuMs.push((user + system) * 1000);
  }
  return { stage: `whole compare command, no bootstrap (${scores}, node dist/server/cli/compare.js)`, runsMs, cpuMs, peakRssMb: peak };
}

function proc(scores: Scores): StageResult | null {
  const script = join(projectRoot, 'bench/proc-1m.R');
  const probe = spawnSync('Rscript', ['-e', 'cat(requireNamespace("pROC", quietly = TRUE))'], { encoding: 'utf8' });
  if (probe.status !== 0 || probe.stdout.trim() !== 'TRUE') return null;
  const runsMs: number[] = [];
  const cpuMs: number[] = [];
  let peak = 0;
  let note = '';
  for (let r = 0; r < 3; r++) {
    const start = performance.now();
    const result = spawnSync('/usr/bin/time', ['-f', '%M %U %S', 'Rscript', script, fileFor(scores, ROWS), scores === 'points' ? 'safer' : 'riskier'], { encoding: 'utf8' });
    runsMs.push(performance.now() - start);
    if (result.status !== 0) return { stage: 'R pROC script', runsMs: [], peakRssMb: 0, note: `failed: ${result.stderr.split('\n')[0]}` };
    const [rss, user, system] = (result.stderr.trim().split('\n').at(-1) ?? '').split(' ').map(Number);
    peak = Math.max(peak, rss / 1024);
    cpuMs.push((user + system) * 1000);
    note = result.stdout.trim().split('\n').at(-1) ?? '';
  }
  return { stage: `R pROC whole script (${scores}): fread, 2 roc, roc.test, 2 ks.test`, runsMs, cpuMs, peakRssMb: peak, note };
}

const targets: [RegExp, string][] = [
  [/^read the CSV/, '< 1 s'],
  [/^AUC \+ DeLong \+ KS.*points/, '< 0.1 s'],
  [/^AUC \+ DeLong \+ KS.*continuous/, '< 0.4 s'],
  [/^2000 bootstrap/, '< 6 s'],
  [/swap sets \+ matrix \+ strategy curve \+ bands/, '< 0.5 s'],
  [/^whole analysis, 5,000,000/, '< 60 s, < 2 GB'],
  [/^whole compare command/, 'faster than R pROC'],
];

function print(results: StageResult[]): void {
  const seconds = (values: number[] | undefined) => (values && values.length ? `${(median(values) / 1000).toFixed(3)} s` : '—');
  const rows = results.map((result) => {
    const target = targets.find(([pattern]) => pattern.test(result.stage))?.[1] ?? '';
    return [result.stage, seconds(result.runsMs), seconds(result.cpuMs), `${Math.round(result.peakRssMb)} MB`, target, result.note ?? ''];
  });
  const head = ['stage', 'median', 'CPU', 'peak RSS', 'target', 'note'];
  const widths = head.map((title, c) => Math.max(...rows.map((row) => row[c].length), title.length));
  const line = (cells: string[]) => cells.map((cell, c) => (c < head.length - 1 ? cell.padEnd(widths[c]) : cell)).join('  ');
  console.log(line(head));
  for (const row of rows) console.log(line(row));
  console.log('\nmedian: wall-clock time, median of the runs; CPU: CPU time of all the process threads (median);');
  console.log('peak RSS: the largest resident memory of the stage process (it includes reading its file).');
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const stageAt = args.indexOf('--stage');
  if (stageAt !== -1) {
    await runStage(args[stageAt + 1]);
    return;
  }
  const full = args.includes('--full');
  console.log(`Scorecourt engine benchmark: ${ROWS.toLocaleString('en-US')} rows; ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}); Node ${process.version}`);
  for (const scores of ['points', 'continuous'] as const) await ensureFile(scores, ROWS);
  if (full) await ensureFile('points', FULL_ROWS);
  const results: StageResult[] = [];
  const stages = ['read:points', 'read:continuous', 'core:points', 'core:continuous', 'bootstrap:points', 'bootstrap:continuous', 'policy:points', 'weights:points'];
  for (const stage of stages) {
    const result = child(stage);
    results.push(...result);
    for (const r of result) console.error(`  ${r.stage}: ${(median(r.runsMs) / 1000).toFixed(3)} s`);
  }
  for (const scores of ['points', 'continuous'] as const) {
    results.push(compareCommand(scores));
    const r = proc(scores);
    if (r) results.push(r);
  }
  if (full) results.push(...child('full:points'));
  console.log('');
  print(results);
}

await main();

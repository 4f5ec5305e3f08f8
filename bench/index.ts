import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { availableParallelism, cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { ColumnMapping } from '@shared/report';
import { loadHoldout } from '@server/reader/load';
import { auc } from '@server/stats/auc';
import { bootstrap } from '@server/stats/bootstrap';
import { pairedDelong } from '@server/stats/delong';
import type { Holdout } from '@server/stats/holdout';
import { ks } from '@server/stats/ks';
import { safety, scoreBlocks } from '@server/stats/order';
import { buildReport } from '@server/stats/report';
import { fourModels, twoModels, withTwoMoreChallengers } from './challengers';
import { writeBenchHoldout } from './holdout';
import { benchPolicyStages } from './policy-stages';
import { largePageEnv } from '../scripts/large-pages.mjs';

/**
 * `npm run bench` (builds, then runs dist/bench/index.js): the engine's speed on a seeded
 * 1,000,000-row holdout, per stage the median of several runs and the peak memory (RSS). Each
 * stage runs in a fresh process, so its peak RSS is its own (it includes reading the file the
 * stage works on). Targets are printed beside the figures; they are a benchmark, not a test.
 * Files are generated once into $TMPDIR/scorecourt-bench and reused (the two 10M-row files take
 * about 700 MB and a minute or two to write).
 *
 * Then the goals of issue 20, each as a ratio or a time from the same run:
 * - the continuous-score bootstrap against a numpy bootstrap on per-score histograms
 *   (bench/numpy-bootstrap.py, run with /usr/bin/python3 when it has numpy);
 * - the compare command as the README runs it (`npm run -s compare -- FILE --bootstrap 0 --json`)
 *   against the R script (bench/proc-1m.R: data.table's fread, two roc, roc.test, two ks.test);
 * - the whole analysis of 10,000,000 rows (PD scores with six decimals; points), 2,000
 *   replicates, reading included, with the time and peak RSS of each stage;
 * - the cost of sampling weights (the weights stage).
 *
 * Flags: `--goals` runs only what the goals need, once each (a few minutes); `--no-10m` leaves
 * out the 10M-row analyses; `--markdown` prints the tables as Markdown, ready for the README;
 * `--full` adds the whole analysis of a 5,000,000-row holdout; `--only weights:points,challengers:continuous`
 * runs only the stages named (kind:scores, as in the lists in main()) and the goals they measure,
 * `--runs N` sets how many times each of them repeats. A whole analysis can be named with its rows
 * and replicates: `--only whole:pd6:10000000:0` is the 10M PD analysis without the bootstrap.
 */

const ROWS = 1_000_000;
const FULL_ROWS = 5_000_000;
const here = fileURLToPath(new URL('.', import.meta.url));
const projectRoot = join(here, existsSync(join(here, '..', 'package.json')) ? '..' : '../..');
const dataDir = join(tmpdir(), 'scorecourt-bench');

type Scores = 'points' | 'continuous' | 'pd6';
const TEN_MILLION = 10_000_000;

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

/** Runs one stage in this process and prints its result as JSON (the child side). `runs`
 * overrides the stage's number of repeats (the goals-only run uses 1). */
async function runStage(name: string, runs?: number): Promise<void> {
  const [kind, scores, rowsText, replicatesText] = name.split(':') as [string, Scores, string | undefined, string | undefined];
  const results: StageResult[] = [];
  if (kind === 'read') {
    const times = await timeRuns(runs ?? 3, () => load(scores));
    results.push({ stage: `read the CSV (${scores}; id, segment, exposure mapped)`, runsMs: times, cpuMs: lastCpu, peakRssMb: maxRssMb() });
  } else if (kind === 'core') {
    const holdout = await load(scores);
    const times = await timeRuns(runs ?? 7, () => core(holdout));
    results.push({ stage: `AUC + DeLong + KS, both models (${scores})`, runsMs: times, cpuMs: lastCpu, peakRssMb: maxRssMb() });
  } else if (kind === 'bootstrap') {
    const holdout = await load(scores);
    const { a, b } = core(holdout);
    let cells = 0;
    const times = await timeRuns(runs ?? 3, async () => {
      await bootstrap(a, b, holdout.bad, { replicates: 2000, seed: 1, confidence: 0.95 });
    });
    const { planBootstrap } = await import('@server/stats/bootstrap-plan');
    cells = planBootstrap(a, b, holdout.bad).cells;
    results.push({
      stage: `2000 bootstrap replicates (${scores}), ${availableParallelism()} threads`,
      runsMs: times,
      cpuMs: lastCpu,
      peakRssMb: maxRssMb(),
      note: `${cells.toLocaleString('en-US')} cells`,
    });
  } else if (kind === 'challengers') {
    // Issue 15: a champion and three challengers against two models, runs alternating (bench/challengers.ts).
    const holdout = withTwoMoreChallengers(await load(scores), scores === 'points');
    const two: number[] = [];
    const four: number[] = [];
    const twoCpu: number[] = [];
    const fourCpu: number[] = [];
    for (let r = 0; r < (runs ?? 7); r++) {
      two.push(...(await timeRuns(1, () => twoModels(holdout))));
      twoCpu.push(...lastCpu);
      four.push(...(await timeRuns(1, () => fourModels(holdout))));
      fourCpu.push(...lastCpu);
    }
    results.push({ stage: `AUC + DeLong + KS, two models, alternating with four (${scores})`, runsMs: two, cpuMs: twoCpu, peakRssMb: maxRssMb() });
    results.push({
      stage: `AUC + DeLong + KS, champion and 3 challengers (${scores})`,
      runsMs: four,
      cpuMs: fourCpu,
      peakRssMb: maxRssMb(),
      note: `Holm, every pair, joint test; ${(median(four) / median(two)).toFixed(2)}× the two models`,
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
    const rounds = runs ?? 3;
    const times: number[][] = variants.map(() => []);
    const cpuTimes: number[][] = variants.map(() => []);
    for (let round = 0; round < rounds; round++) {
      for (let v = 0; v < variants.length; v++) {
        const cpu = process.cpuUsage();
        const start = performance.now();
        await buildReport({ holdout: variants[v][1], input, mapping: { ...mapping, weight: v === 0 ? null : 'w' }, settings, threads: 0 });
        times[v].push(performance.now() - start);
        const used = process.cpuUsage(cpu);
        cpuTimes[v].push((used.user + used.system) / 1000);
      }
    }
    const base = median(times[0]);
    variants.forEach(([label], v) => {
      const ratio = median(times[v]) / base;
      results.push({
        stage: `whole report, 200 replicates, one thread, ${label} (${scores})`,
        runsMs: times[v],
        cpuMs: cpuTimes[v],
        peakRssMb: maxRssMb(),
        note: v === 0 ? 'the base of the ratios below' : `${ratio.toFixed(2)}× unweighted (goal: under 1.20×); CPU ${(median(cpuTimes[v]) / median(cpuTimes[0])).toFixed(2)}×`,
      });
    });
  } else if (kind === 'whole') {
    // Issue 20: the whole analysis of a 10M-row file, 2,000 replicates, reading included, with
    // the time and the peak resident memory of each stage (a sampling thread watches the RSS).
    results.push(await wholeAnalysis(scores, rowsText ? Number(rowsText) : TEN_MILLION, replicatesText === undefined ? 2000 : Number(replicatesText)));
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

/**
 * Peak RSS per stage: a thread samples the process's resident memory every 10 ms into shared
 * memory; take() returns the largest sample since the previous take().
 */
function memoryWatch(): { take(): number; stop(): Promise<number> } {
  const shared = new Float64Array(new SharedArrayBuffer(8));
  const code = `const { workerData, parentPort } = require('node:worker_threads');
    const peak = new Float64Array(workerData);
    const timer = setInterval(() => { const rss = process.memoryUsage.rss(); if (rss > peak[0]) peak[0] = rss; }, 10);
    parentPort.on('message', () => { clearInterval(timer); process.exit(0); });`;
  const watcher = new Worker(code, { eval: true, workerData: shared.buffer });
  const take = () => {
    const peak = Math.max(shared[0], process.memoryUsage.rss());
    shared[0] = process.memoryUsage.rss();
    return peak / 2 ** 20;
  };
  return {
    take,
    stop: async () => {
      const last = take();
      watcher.postMessage('stop');
      await new Promise((resolve) => watcher.once('exit', resolve));
      return last;
    },
  };
}

async function wholeAnalysis(scores: Scores, rows: number, replicates: number): Promise<StageResult> {
  const watch = memoryWatch();
  const cpu = process.cpuUsage();
  const start = performance.now();
  const loaded = await loadHoldout({ path: fileFor(scores, rows) }, mappingFor(scores));
  // Per stage: wall time, CPU time of the process (every thread: from "AUC" on, the bootstrap's
  // threads work beside the stage, and their time counts too) and peak RSS.
  const cpuSince = (from: NodeJS.CpuUsage) => {
    const used = process.cpuUsage(from);
    return ((used.user + used.system) / 1e6).toFixed(1);
  };
  const stages: string[] = [`reading ${((performance.now() - start) / 1000).toFixed(1)} s (CPU ${cpuSince(cpu)} s), ${Math.round(watch.take())} MB`];
  // The stages of the main thread (report.ts onStage); from the bootstrap's start they run beside
  // its threads, whose time shows in the CPU and whose memory in each stage's peak.
  let stageName = '';
  let stageStart = performance.now();
  let stageCpu = process.cpuUsage();
  const close = () => {
    if (stageName) stages.push(`${stageName} ${((performance.now() - stageStart) / 1000).toFixed(1)} s (CPU ${cpuSince(stageCpu)} s), ${Math.round(watch.take())} MB`);
  };
  await buildReport({
    ...loaded,
    mapping: mappingFor(scores),
    settings: { bootstrap: replicates },
    read: loaded.read,
    onStage: (stage) => {
      close();
      stageName = stage;
      stageStart = performance.now();
      stageCpu = process.cpuUsage();
    },
  });
  close();
  const total = performance.now() - start;
  const used = process.cpuUsage(cpu);
  await watch.stop();
  return {
    stage: `whole analysis, ${rows.toLocaleString('en-US')} rows (${scoresLabel[scores]}), ${replicates} replicates, read included`,
    runsMs: [total],
    cpuMs: [(used.user + used.system) / 1000],
    peakRssMb: maxRssMb(),
    note: `per stage (wall, CPU of every thread, peak RSS; from "AUC" on beside the bootstrap's threads): ${stages.join('; ')}`,
  };
}

const scoresLabel: Record<Scores, string> = { points: 'points', continuous: 'PD, 6 significant digits', pd6: 'PD, six decimals' };

/** The numpy reference of the bootstrap (bench/numpy-bootstrap.py), when /usr/bin/python3 has numpy. */
function numpyBootstrap(scores: Scores, replicates: number): StageResult | null {
  const python = '/usr/bin/python3';
  const probe = spawnSync(python, ['-c', 'import numpy'], { encoding: 'utf8' });
  if (probe.status !== 0) return null;
  const script = join(projectRoot, 'bench/numpy-bootstrap.py');
  const result = spawnSync('/usr/bin/time', ['-f', '%M', python, script, fileFor(scores, ROWS), scores === 'points' ? 'safer' : 'riskier', String(replicates), '1'], { encoding: 'utf8' });
  if (result.status !== 0) return { stage: 'numpy histogram bootstrap', runsMs: [], peakRssMb: 0, note: `failed: ${result.stderr.split('\n')[0]}` };
  const out = JSON.parse(result.stdout.trim().split('\n').at(-1)!) as { seconds: number; cpuSeconds: number; numpy: string; deltaGini: [number, number] };
  return {
    stage: `numpy ${out.numpy} histogram bootstrap, ${replicates} replicates (${scores}), 1 thread`,
    runsMs: [out.seconds * 1000],
    cpuMs: [out.cpuSeconds * 1000],
    peakRssMb: Number(result.stderr.trim().split('\n').at(-1)) / 1024,
    note: `replicates only (reading not timed); ΔGini 95% ${out.deltaGini.map((v) => v.toFixed(4)).join(' to ')}`,
  };
}

/** The compare command as the README runs it: `npm run -s compare -- FILE --bootstrap 0 --json`. */
function compareThroughNpm(scores: Scores, runs: number): StageResult {
  const higherIs = scores === 'points' ? 'safer' : 'riskier';
  const runsMs: number[] = [];
  let peak = 0;
  for (let r = 0; r < runs; r++) {
    const start = performance.now();
    const result = spawnSync('/usr/bin/time', ['-f', '%M', 'npm', 'run', '-s', 'compare', '--', fileFor(scores, ROWS), '--bootstrap', '0', '--higher-is', higherIs, '--json'], {
      cwd: projectRoot,
      encoding: 'utf8',
      maxBuffer: 1 << 28,
    });
    runsMs.push(performance.now() - start);
    if (result.status !== 0) throw new Error(`npm run compare failed: ${result.stderr}`);
    peak = Math.max(peak, Number(result.stderr.trim().split('\n').at(-1)) / 1024);
  }
  return { stage: `whole compare command through npm, no bootstrap (${scores}: npm run -s compare -- FILE --bootstrap 0 --json)`, runsMs, peakRssMb: peak };
}

function child(stage: string, runs?: number): StageResult[] {
  const extra = runs === undefined ? [] : ['--runs', String(runs)];
  // Each stage on large memory pages, as `npm run compare` and `npm run worker` run the engine.
  const result = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--stage', stage, ...extra], { encoding: 'utf8', maxBuffer: 1 << 24, env: largePageEnv() });
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
    const result = spawnSync('/usr/bin/time', ['-f', '%M %U %S', process.execPath, ...args], { encoding: 'utf8', maxBuffer: 1 << 28, env: largePageEnv() });
    runsMs.push(performance.now() - start);
    if (result.status !== 0) throw new Error(`compare failed: ${result.stderr}`);
    const [rss, user, system] = (result.stderr.trim().split('\n').at(-1) ?? '').split(' ').map(Number);
    peak = Math.max(peak, rss / 1024);
    cpuMs.push((user + system) * 1000);
  }
  return { stage: `whole compare command, no bootstrap (${scores}, node dist/server/cli/compare.js)`, runsMs, cpuMs, peakRssMb: peak };
}

function proc(scores: Scores, runs = 3): StageResult | null {
  const script = join(projectRoot, 'bench/proc-1m.R');
  const probe = spawnSync('Rscript', ['-e', 'cat(requireNamespace("pROC", quietly = TRUE))'], { encoding: 'utf8' });
  if (probe.status !== 0 || probe.stdout.trim() !== 'TRUE') return null;
  const runsMs: number[] = [];
  const cpuMs: number[] = [];
  let peak = 0;
  let note = '';
  for (let r = 0; r < runs; r++) {
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
  [/^AUC \+ DeLong \+ KS, champion and 3 challengers/, '< 2.5× two models (issue 15)'],
  [/^AUC \+ DeLong \+ KS.*points/, '< 0.1 s'],
  [/^AUC \+ DeLong \+ KS.*continuous/, '< 0.4 s'],
  [/^2000 bootstrap replicates \(continuous/, '≤ 0.2 of numpy (issue 20)'],
  [/^2000 bootstrap/, '< 6 s'],
  [/^whole compare command through npm/, '≤ 0.5 of R pROC (issue 20)'],
  [/^whole analysis, 10,000,000 rows \(PD/, '< 90 s, < 4 GB'],
  [/^whole analysis, 10,000,000 rows \(points/, '< 30 s'],
  [/^whole report, 200 replicates, one thread, weights/, '< 1.20× unweighted'],
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

interface Goal {
  goal: string;
  measured: string;
  met: boolean | null;
}

function printGoals(goals: Goal[], markdown: boolean): void {
  const verdict = (met: boolean | null) => (met === null ? 'not measured' : met ? 'met' : 'missed');
  if (markdown) {
    console.log('| goal (issue 20) | measured in this run | |');
    console.log('|---|---|---|');
    for (const g of goals) console.log(`| ${g.goal} | ${g.measured} | ${verdict(g.met)} |`);
    return;
  }
  console.log('Goals (issue 20), each from this run:');
  for (const g of goals) console.log(`  ${verdict(g.met).padEnd(12)} ${g.goal}: ${g.measured}`);
}

function printMarkdown(results: StageResult[]): void {
  const seconds = (values: number[] | undefined) => (values && values.length ? `${(median(values) / 1000).toFixed(3)} s` : '—');
  console.log('| stage | median | CPU | peak RSS | target | note |');
  console.log('|---|---|---|---|---|---|');
  for (const result of results) {
    const target = targets.find(([pattern]) => pattern.test(result.stage))?.[1] ?? '';
    console.log(`| ${result.stage} | ${seconds(result.runsMs)} | ${seconds(result.cpuMs)} | ${Math.round(result.peakRssMb)} MB | ${target} | ${result.note ?? ''} |`);
  }
}

async function main(): Promise<void> {
  const args = process.argv.slice(2);
  const stageAt = args.indexOf('--stage');
  if (stageAt !== -1) {
    const runsAt = args.indexOf('--runs');
    await runStage(args[stageAt + 1], runsAt === -1 ? undefined : Number(args[runsAt + 1]));
    return;
  }
  const full = args.includes('--full');
  const goalsOnly = args.includes('--goals');
  const markdown = args.includes('--markdown');
  const onlyAt = args.indexOf('--only');
  const only = onlyAt === -1 ? null : args[onlyAt + 1].split(',');
  const runsAt = args.indexOf('--runs');
  const runsFlag = runsAt === -1 ? undefined : Number(args[runsAt + 1]);
  const tenMillion = !args.includes('--no-10m') && only === null;
  const startLoad = loadavg()[0];
  const started = new Date().toISOString().slice(0, 16).replace('T', ' ');
  console.log(`Scorecourt engine benchmark: ${ROWS.toLocaleString('en-US')} rows; ${cpus().length} cores (${cpus()[0]?.model ?? 'unknown'}); Node ${process.version}; ${started} UTC, load average ${startLoad.toFixed(1)} at the start`);
  const needed = only ? [...new Set(only.map((stage) => stage.split(':')[1] as Scores))] : (['points', 'continuous'] as const);
  for (const scores of needed) await ensureFile(scores, ROWS);
  // A whole analysis named with --only (whole:pd6, whole:points:5000000) needs its own file.
  for (const stage of only ?? []) {
    const [kind, scores, rowsText] = stage.split(':') as [string, Scores, string | undefined];
    if (kind === 'whole') await ensureFile(scores, rowsText ? Number(rowsText) : TEN_MILLION);
  }
  if (full) await ensureFile('points', FULL_ROWS);
  if (tenMillion) for (const scores of ['pd6', 'points'] as const) await ensureFile(scores, TEN_MILLION);
  const results: StageResult[] = [];
  const run = (stage: string, runs?: number) => {
    const result = child(stage, runs);
    results.push(...result);
    for (const r of result) console.error(`  ${r.stage}: ${(median(r.runsMs) / 1000).toFixed(3)} s`);
    return result;
  };
  const goalRuns = goalsOnly ? 1 : runsFlag;
  const stages = only ?? (goalsOnly
    ? ['bootstrap:continuous', 'weights:points', 'challengers:continuous']
    : ['read:points', 'read:continuous', 'core:points', 'core:continuous', 'challengers:points', 'challengers:continuous', 'bootstrap:points', 'bootstrap:continuous', 'policy:points', 'weights:points']);
  for (const stage of stages) run(stage, goalRuns);
  const numpy = only ? null : numpyBootstrap('continuous', 2000);
  if (numpy) results.push(numpy);
  let rPoints: StageResult | null = null;
  let viaNpm: StageResult | null = null;
  if (!only) {
    viaNpm = compareThroughNpm('points', goalsOnly ? 1 : 3);
    results.push(viaNpm);
    for (const scores of ['points', 'continuous'] as const) {
      if (!goalsOnly) results.push(compareCommand(scores));
      const r = goalsOnly && scores === 'continuous' ? null : proc(scores, goalsOnly ? 1 : 3);
      if (r) results.push(r);
      if (scores === 'points') rPoints = r;
    }
  }
  const whole = tenMillion ? [...run('whole:pd6'), ...run('whole:points')] : [];
  if (full) run('full:points');
  const endLoad = loadavg()[0];

  // The goals of issue 20, each a ratio or a time from this run.
  const seconds = (result: StageResult) => median(result.runsMs) / 1000;
  const ours = results.find((result) => /^2000 bootstrap replicates \(continuous\)/.test(result.stage));
  const goals: Goal[] = [];
  if (only) {
    // Only the named stages ran: their goals below, not those of the comparisons left out.
  } else if (ours && numpy && numpy.runsMs.length > 0) {
    const ratio = seconds(ours) / seconds(numpy);
    goals.push({
      goal: '2,000 paired replicates at 1M continuous scores: at most 0.2 of the numpy histogram bootstrap',
      // On a loaded machine wall times depend on what else runs; CPU time per thread, ours spread
      // over the cores against numpy's one thread, is the steadier estimate of the quiet ratio.
      measured: `${seconds(ours).toFixed(1)} s against ${seconds(numpy).toFixed(1)} s: ${ratio.toFixed(2)}; CPU ${(median(ours.cpuMs!) / 1000).toFixed(1)} s over ${availableParallelism()} threads against ${(median(numpy.cpuMs!) / 1000).toFixed(1)} s on 1: ${(median(ours.cpuMs!) / availableParallelism() / median(numpy.cpuMs!)).toFixed(2)}`,
      met: ratio <= 0.2,
    });
  } else goals.push({ goal: 'bootstrap against numpy', measured: '/usr/bin/python3 with numpy not found', met: null });
  if (only) {
    // As above.
  } else if (viaNpm && rPoints && rPoints.runsMs.length > 0) {
    const ratio = seconds(viaNpm) / seconds(rPoints);
    goals.push({
      goal: 'whole compare command through npm, no bootstrap, 1M points: at most half the R pROC script',
      measured: `${seconds(viaNpm).toFixed(2)} s against ${seconds(rPoints).toFixed(2)} s: ${ratio.toFixed(2)}`,
      met: ratio <= 0.5,
    });
  } else goals.push({ goal: 'compare command against R', measured: 'Rscript with pROC not found', met: null });
  for (const [pattern, limitS, limitMb, label] of [
    [/10,000,000 rows \(PD, six decimals\)/, 90, 4096, '10M rows of PD scores (six decimals), whole analysis with 2,000 replicates, read included: under 90 s and 4 GB'],
    [/10,000,000 rows \(points\)/, 30, Infinity, '10M rows of points, the same: under 30 s'],
  ] as const) {
    const result = whole.find((candidate) => pattern.test(candidate.stage));
    if (only) continue;
    if (!result) {
      goals.push({ goal: label, measured: 'not run (--no-10m)', met: null });
      continue;
    }
    goals.push({
      goal: label,
      measured: `${seconds(result).toFixed(1)} s, peak ${(result.peakRssMb / 1024).toFixed(2)} GB; ${result.note}`,
      met: seconds(result) < limitS && result.peakRssMb < limitMb,
    });
  }
  const weighted = results.filter((result) => /^whole report, 200 replicates, one thread, weights/.test(result.stage));
  const base = results.find((result) => /^whole report, 200 replicates, one thread, unweighted/.test(result.stage));
  if (base) {
    for (const result of weighted) {
      const ratio = seconds(result) / seconds(base);
      const cpu = result.cpuMs && base.cpuMs ? `; CPU ${(median(result.cpuMs) / median(base.cpuMs)).toFixed(2)}×` : '';
      goals.push({ goal: `the cost of sampling weights at 1M points (${result.stage.replace(/.*one thread, /, '')}): under 1.20× unweighted`, measured: `${ratio.toFixed(2)}×${cpu}`, met: ratio < 1.2 });
    }
  }

  // Issue 15: several challengers at no more than 2.5 times the two-model work.
  for (const scores of ['points', 'continuous'] as const) {
    const four = results.find((result) => result.stage === `AUC + DeLong + KS, champion and 3 challengers (${scores})`);
    const two = results.find((result) => result.stage === `AUC + DeLong + KS, two models, alternating with four (${scores})`);
    if (!four || !two) continue;
    const ratio = seconds(four) / seconds(two);
    goals.push({
      goal: `1M rows (${scores}), champion and 3 challengers: AUC + DeLong + KS of all four under 2.5× the two models (issue 15)`,
      measured: `${seconds(four).toFixed(3)} s against ${seconds(two).toFixed(3)} s: ${ratio.toFixed(2)}×; CPU ${(median(four.cpuMs!) / median(two.cpuMs!)).toFixed(2)}×`,
      met: ratio < 2.5,
    });
  }

  console.log('');
  if (markdown) printMarkdown(results);
  else print(results);
  console.log('');
  printGoals(goals, markdown);
  console.log(`\nload average ${startLoad.toFixed(1)} at the start, ${endLoad.toFixed(1)} at the end (${cpus().length} cores): ratios from a loaded machine are indicative only.`);
}

await main();

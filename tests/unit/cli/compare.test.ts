import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { type ColumnMapping, type Report, reportSchema } from '@shared/report';
import { parseCommand, runCompare, usage } from '@server/cli/compare';
import { loadHoldout } from '@server/reader/load';
import { buildReport } from '@server/stats/report';
import { compiledEntry } from '../../setup/compiled';

const root = new URL('../../../', import.meta.url).pathname;
const demo = join(root, 'sample-data/tallowmere-holdout-2025-sample-2k.csv');
const broken = join(root, 'sample-data/tallowmere-holdout-broken.csv');
const demoFlags = ['--outcome', 'bad_12m', '--champion', 'champion_points', '--challenger', 'challenger_points'];

async function run(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const status = await runCompare(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), progress: false });
  return { status, stdout, stderr };
}

describe('compare CLI', () => {
  it('prints only the report JSON with --json, the same report buildReport makes', async () => {
    const { status, stdout, stderr } = await run([demo, ...demoFlags, '--bootstrap', '50', '--segment', 'channel', '--json']);
    expect(status).toBe(0);
    expect(stderr).toBe('');
    const report = reportSchema.parse(JSON.parse(stdout));
    expect(report.settings.bootstrap).toBe(50);
    expect(report.segments.map((row) => row.value)).toEqual(['branch', 'broker', 'web']);
    const mapping: ColumnMapping = {
      outcome: 'bad_12m',
      badValue: '1',
      champion: 'champion_points',
      challenger: 'challenger_points',
      higherIs: { champion: 'safer', challenger: 'safer' },
      id: null,
      segments: ['channel'],
      exposure: null,
    };
    const loaded = await loadHoldout({ path: demo }, mapping);
    const direct = await buildReport({ ...loaded, mapping, settings: { bootstrap: 50, dropMissing: false } });
    expect(report).toEqual(JSON.parse(JSON.stringify(direct)));
  });

  it('prints a readable summary without --json', async () => {
    const { status, stdout } = await run([demo, ...demoFlags, '--bootstrap', '0']);
    expect(status).toBe(0);
    expect(stdout).toContain('Scorecourt comparison of tallowmere-holdout-2025-sample-2k.csv');
    expect(stdout).toContain('ΔGini');
    expect(stdout).toContain('bootstrap skipped');
    expect(stdout).toMatch(/Verdict under adoption policy v2: (SUPPORTED|NOT-PROVEN|CHAMPION-BETTER)/);
    expect(stdout).toContain('Statistical significance is not business approval');
    expect(stdout).not.toContain('Swap sets by segment');
  });

  it('prints the swap sets within each segment value, marking those whose swap-in is riskier', async () => {
    const { status, stdout } = await run([demo, ...demoFlags, '--bootstrap', '0', '--segment', 'channel', '--json']);
    expect(status).toBe(0);
    const report = JSON.parse(stdout) as Report;
    const text = (await run([demo, ...demoFlags, '--bootstrap', '0', '--segment', 'channel'])).stdout;
    const lines = text.split('\n');
    const at = lines.findIndex((line) => line.startsWith('Swap sets by segment'));
    expect(at).toBeGreaterThan(0);
    expect(report.swap.bySegment.map((row) => row.value)).toEqual(['branch', 'broker', 'web']);
    for (const [k, row] of report.swap.bySegment.entries()) {
      const line = lines[at + 1 + k];
      expect(line).toContain(`channel = ${row.value}`);
      expect(line).toContain(`swap-in ${row.swapIn.count.toLocaleString('en-US')} `);
      expect(line.endsWith('(swap-in riskier)')).toBe(row.swapIn.badRate! > row.swapOut.badRate!);
    }
  });

  it('exits 2 with one line naming the row and column on bad input', async () => {
    const { status, stdout, stderr } = await run([broken, ...demoFlags]);
    expect(status).toBe(2);
    expect(stdout).toBe('');
    // sample-data/README.md: the first mistake is on line 13, in the challenger's score
    expect(stderr).toBe(
      'compare: ' + broken + ': row 13, column "challenger_points": "#VALUE!" is not a number\n',
    );
    const wrongColumn = await run([demo]);
    expect(wrongColumn.status).toBe(2);
    expect(wrongColumn.stderr).toMatch(/^compare: .*: column "bad" is not in the file \(its columns: "account_id", /);
    expect(wrongColumn.stderr.split('\n')).toHaveLength(2);
  });

  it('reads the sheet named by --sheet from a workbook, and names it in errors and the summary', async () => {
    const rows = readFileSync(demo, 'utf8').trim().split('\n').map((line) => line.split(','));
    const book = new ExcelJS.Workbook();
    book.addWorksheet('Notes').addRow(['not the holdout']);
    const sheet = book.addWorksheet('Holdout 2025');
    rows.forEach((row, index) => sheet.addRow(index === 0 ? row : row.map((cell) => (/^-?\d+(\.\d+)?$/.test(cell) ? Number(cell) : cell))));
    const dir = mkdtempSync(join(tmpdir(), 'compare-sheet-'));
    const file = join(dir, 'holdout.xlsx');
    writeFileSync(file, new Uint8Array(await book.xlsx.writeBuffer()));
    const fromCsv = JSON.parse((await run([demo, ...demoFlags, '--bootstrap', '0', '--json'])).stdout) as Report;
    const fromSheet = await run([file, ...demoFlags, '--sheet', 'Holdout 2025', '--bootstrap', '0', '--json']);
    expect(fromSheet.status, fromSheet.stderr).toBe(0);
    const report = JSON.parse(fromSheet.stdout) as Report;
    expect(report.input.sheet).toBe('Holdout 2025');
    expect(report.champion).toEqual(fromCsv.champion);
    expect(report.difference).toEqual(fromCsv.difference);
    expect((await run([file, ...demoFlags, '--sheet', 'Holdout 2025', '--bootstrap', '0'])).stdout).toContain('Scorecourt comparison of holdout.xlsx, sheet “Holdout 2025”');
    const missing = await run([file, ...demoFlags, '--sheet', 'Holdout 2024']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toBe(`compare: ${file}: the workbook has no sheet named "Holdout 2024"; its sheets are "Notes", "Holdout 2025"\n`);
    const firstSheet = await run([file, ...demoFlags]);
    expect(firstSheet.status).toBe(2);
    expect(firstSheet.stderr).toMatch(/^compare: .*: sheet "Notes", column "bad_12m" is not in the file/);
  });

  it('exits 2 on bad options and a missing file', async () => {
    for (const [argv, message] of [
      [[demo, '--confidence', '2'], 'compare: --confidence must be between 0.5 and 1 (e.g. 0.95), got "2"\n'],
      [[demo, '--bootstrap', '-1'], 'compare: --bootstrap must be a whole number from 0 to 20000, got "-1"\n'],
      [[demo, '--higher-is', 'up'], 'compare: --higher-is must be "safer" or "riskier", got "up"\n'],
      [[demo, '--cutoff-champion', '600'], 'compare: give both --cutoff-champion and --cutoff-challenger, or neither (then --approval-rate matches them)\n'],
      [[], 'compare: give the holdout CSV file (see --help)\n'],
      [['/nonexistent/holdout.csv'], 'compare: cannot read /nonexistent/holdout.csv: no such file\n'],
    ] as const) {
      const result = await run([...argv]);
      expect(result.status, argv.join(' ')).toBe(2);
      expect(result.stderr).toBe(message);
    }
    const unknown = await run([demo, '--frobnicate']);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toMatch(/^compare: Unknown option '--frobnicate'/);
  });

  it('prints the help', async () => {
    const { status, stdout } = await run(['--help']);
    expect(status).toBe(0);
    expect(stdout).toBe(usage);
    expect(usage).toContain('npm run -s compare');
  });

  it('reads every option of issue 3', () => {
    const command = parseCommand([
      'f.csv',
      '--outcome', 'y',
      '--bad-value', 'B',
      '--champion', 'a',
      '--challenger', 'b',
      '--higher-is', 'riskier',
      '--challenger-higher-is', 'safer',
      '--bootstrap', '500',
      '--seed', '7',
      '--confidence', '0.9',
      '--cutoff-champion', '0.2',
      '--cutoff-challenger', '610',
      '--segment', 'product',
      '--segment', 'channel',
      '--exposure', 'amount',
      '--id', 'account',
      '--drop-missing',
      '--json',
    ]);
    expect(command).toEqual({
      help: false,
      file: 'f.csv',
      json: true,
      dropMissing: true,
      mapping: {
        outcome: 'y',
        badValue: 'B',
        champion: 'a',
        challenger: 'b',
        higherIs: { champion: 'riskier', challenger: 'safer' },
        id: 'account',
        segments: ['product', 'channel'],
        exposure: 'amount',
      },
      settings: { bootstrap: 500, seed: 7, confidence: 0.9, cutoffs: { champion: 0.2, challenger: 610 }, dropMissing: true },
      reference: null,
      sheet: null,
    });
    expect(parseCommand(['f.csv', '--approval-rate', '0.8', '--champion-higher-is', 'riskier']).settings.approvalRate).toBe(0.8);
  });

  it('reads the calibration and stability options, and refuses inconsistent ones', () => {
    const command = parseCommand(['f.csv', '--pd', 'challenger', '--grade-challenger', 'grade', '--period', 'month', '--reference', 'dev.csv']);
    expect(command.mapping).toMatchObject({ probabilityOfDefault: { champion: false, challenger: true }, grades: { champion: null, challenger: 'grade' }, period: 'month' });
    expect(command.reference).toBe('dev.csv');
    expect(parseCommand(['f.csv', '--period', 'month', '--reference-period', '2025-01']).settings.referencePeriod).toBe('2025-01');
    expect(() => parseCommand(['f.csv', '--pd', 'both'])).toThrow(/--pd must be/);
    expect(() => parseCommand(['f.csv', '--reference-period', '2025-01'])).toThrow(/needs --period/);
    expect(() => parseCommand(['f.csv', '--period', 'm', '--reference', 'd.csv', '--reference-period', 'x'])).toThrow(/not both/);
    // Without these options the mapping keeps its earlier form (no new keys).
    expect(parseCommand(['f.csv']).mapping).not.toHaveProperty('probabilityOfDefault');
  });

  it('drops rows with missing scores with --drop-missing and counts them', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'scorecourt-cli-'));
    const file = join(dir, 'gaps.csv');
    const rows = ['bad,champion,challenger'];
    for (let i = 0; i < 200; i++) rows.push(`${i % 5 === 0 ? 1 : 0},${(i * 7) % 50},${i % 11 === 0 ? '' : (i * 3) % 41}`);
    writeFileSync(file, rows.join('\n'));
    expect((await run([file])).status).toBe(2);
    const { status, stdout } = await run([file, '--drop-missing', '--bootstrap', '0', '--json']);
    expect(status).toBe(0);
    const report = reportSchema.parse(JSON.parse(stdout));
    expect(report.dataQuality.rowsDroppedMissingScore).toBe(19);
    expect(report.rows).toBe(181);
  });

  it('runs as a process (the compiled CLI, as `npm run compare` runs it): exit status 2 and no stack trace on bad input', () => {
    const result = spawnSync(process.execPath, [compiledEntry('server/cli/compare'), broken, ...demoFlags], { encoding: 'utf8', cwd: root });
    expect(result.status).toBe(2);
    expect(result.stdout).toBe('');
    expect(result.stderr.trim().split('\n')).toHaveLength(1);
    expect(result.stderr).not.toMatch(/\n\s+at /);
  });
});

describe('compare CLI arguments', () => {
  it('reads negative cut-offs (scores on a log-odds scale)', () => {
    expect(parseCommand(['f.csv', '--cutoff-champion', '-1.5', '--cutoff-challenger', '-.25']).settings.cutoffs).toEqual({ champion: -1.5, challenger: -0.25 });
  });
});

import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { type ColumnMapping, type HigherIs, type Report, reportSchema } from '@shared/report';
import { loadHoldout } from '@server/reader/load';
import { buildReport } from '@server/stats/report';

const directory = new URL('../../reference/challengers/', import.meta.url);
const joint = JSON.parse(readFileSync(new URL('joint.json', directory), 'utf8')) as {
  cases: Record<string, { joint: { chi2: number; df: number; p: number }; auc: number[]; vsChampion: { pOneSidedHolm: number; pTwoSidedHolm: number }[] }>;
};
const relative = (value: number, truth: number) => Math.abs(value - truth) / Math.abs(truth);

function mappingOf(challengers: { column: string; higherIs: HigherIs; name?: string }[], championHigherIs: HigherIs): ColumnMapping {
  const [primary, ...more] = challengers;
  const mapping: ColumnMapping = {
    outcome: 'bad',
    badValue: '1',
    champion: 'champion',
    challenger: primary.column,
    higherIs: { champion: championHigherIs, challenger: primary.higherIs },
    id: null,
    segments: [],
    exposure: null,
  };
  if (primary.name) mapping.challengerName = primary.name;
  if (more.length > 0) mapping.moreChallengers = more;
  return mapping;
}

async function reportOf(file: string, mapping: ColumnMapping, bootstrap = 300, text?: string): Promise<Report> {
  const bytes = text === undefined ? readFileSync(new URL(file, directory)) : new TextEncoder().encode(text);
  const loaded = await loadHoldout({ bytes, fileName: file }, mapping);
  return buildReport({ holdout: loaded.holdout, input: loaded.input, mapping, settings: { bootstrap, seed: 11 }, read: loaded.read, threads: 0 });
}

const newFields = ['challengers', 'pairwise', 'joint', 'choice', 'approvalPatterns'] as const;

describe('a report with one challenger', () => {
  // SHA-256 of JSON.stringify(report) as the engine before several challengers (commit 4ad0254)
  // wrote it for the same file, mapping and settings (bootstrap 300, seed 11, in this thread).
  it.each([
    ['points-ties-3.csv', 'c2', 'safer', 62133, '78fb69f1a6155bfada2c53e7451256e876c4212de9028881eca08a1cc7026995'],
    ['mixed-3.csv', 'c1', 'riskier', 184759, '3a502bd01c6257160d88af2ef6aad2a29a515690a46e4a7938849f2ee7fcb43a'],
  ] as const)('is byte for byte the earlier report apart from the new fields (%s)', async (file, column, higherIs, length, sha256) => {
    const report = await reportOf(file, mappingOf([{ column, higherIs }], 'safer'));
    expect(report.challengers).toHaveLength(1);
    expect(report.pairwise).toEqual([]);
    const old = { ...report } as Partial<Report>;
    for (const field of newFields) delete old[field];
    const json = JSON.stringify(old);
    expect(json.length).toBe(length);
    expect(createHash('sha256').update(json).digest('hex')).toBe(sha256);
  });

  it('states its one challenger in the new fields as the report states it, the joint test being z²', async () => {
    const report = await reportOf('points-ties-3.csv', mappingOf([{ column: 'c2', higherIs: 'safer', name: 'CF-3 bureau' }], 'safer'));
    const [only] = report.challengers!;
    expect(only).toMatchObject({ column: 'c2', name: 'CF-3 bureau', metrics: report.challenger, difference: report.difference, verdict: report.verdict });
    expect(only.pOneSidedHolm).toBe(report.difference.pOneSided);
    expect(only.histograms).toEqual({
      deltaGini: report.bootstrap.histograms!.deltaGini,
      deltaKs: report.bootstrap.histograms!.deltaKs,
      challengerKs: report.bootstrap.histograms!.challengerKs,
    });
    expect(report.joint!.df).toBe(1);
    // χ² with one degree of freedom is the paired test's z² (up to the rounding of a different formula).
    expect(relative(report.joint!.chi2, report.difference.z! ** 2)).toBeLessThan(1e-12);
    // Two models: the approval patterns are the swap sets' four cells.
    const cells = report.approvalPatterns!.combinations;
    expect(cells.map((cell) => cell.count)).toEqual([report.swap.bothReject.count, report.swap.swapOut.count, report.swap.swapIn.count, report.swap.bothAccept.count]);
    expect(report.choice!.recommended === null ? report.verdict.outcome !== 'supported' : report.verdict.outcome === 'supported').toBe(true);
  });
});

describe('a report with three challengers', async () => {
  // points-ties-3.csv: champion and c1…c3 in points (higher = safer); expected values from joint.R (pROC 1.18.0).
  const expected = joint.cases['points-ties-3.csv champion+c1+c2+c3'];
  const mapping = mappingOf(
    [
      { column: 'c1', higherIs: 'safer', name: 'CF-3 bureau' },
      { column: 'c2', higherIs: 'safer', name: 'CF-4 open banking' },
      { column: 'c3', higherIs: 'safer', name: 'CF-2 refit' },
    ],
    'safer',
  );
  const report = await reportOf('points-ties-3.csv', mapping);

  it('is a report the shared schema accepts, with every challenger in order', () => {
    expect(reportSchema.parse(report)).toBeTruthy();
    expect(report.challengers!.map((challenger) => challenger.name)).toEqual(['CF-3 bureau', 'CF-4 open banking', 'CF-2 refit']);
    expect(report.challengers![0].metrics).toEqual(report.challenger);
    expect(report.challengers![0].verdict).toEqual(report.verdict);
  });

  it('gives the AUCs, the Holm-adjusted p and the joint test of the R script', () => {
    report.challengers!.forEach((challenger, k) => {
      expect(Math.abs(challenger.metrics.auc - expected.auc[k + 1])).toBeLessThan(1e-12);
      expect(relative(challenger.pOneSidedHolm!, expected.vsChampion[k].pOneSidedHolm)).toBeLessThan(1e-12);
      expect(relative(challenger.pTwoSidedHolm!, expected.vsChampion[k].pTwoSidedHolm)).toBeLessThan(1e-12);
    });
    expect(Math.abs(report.champion.auc - expected.auc[0])).toBeLessThan(1e-12);
    expect(report.joint!.df).toBe(expected.joint.df);
    expect(relative(report.joint!.chi2, expected.joint.chi2)).toBeLessThan(1e-9);
    expect(relative(report.joint!.p, expected.joint.p)).toBeLessThan(1e-9);
    expect(report.pairwise!.map((pair) => [pair.a, pair.b])).toEqual([
      [0, 1],
      [0, 2],
      [1, 2],
    ]);
  });

  it('states the Holm adjustment in the significance criterion of every verdict', () => {
    for (const challenger of report.challengers!) {
      const significance = challenger.verdict.criteria.find((criterion) => criterion.id === 'significance')!;
      expect(significance.detail).toMatch(/^Holm-adjusted one-sided p .* across 3 challengers\)$/);
    }
  });

  it('counts every account once in the approval patterns, each model approving at the report rate', () => {
    const patterns = report.approvalPatterns!;
    expect(patterns.combinations).toHaveLength(16);
    const total = patterns.combinations.reduce((sum, cell) => sum + cell.count, 0);
    expect(total).toBe(report.rows);
    patterns.models.forEach((model, m) => {
      const approved = patterns.combinations.filter((cell) => cell.approved[m]).reduce((sum, cell) => sum + cell.count, 0);
      expect(approved / report.rows).toBe(model.approvalRate);
    });
    // Champion and CF-4 (models 0 and 2): their swap-in is every combination the champion declines and CF-4 approves.
    const swapIn = patterns.combinations.filter((cell) => !cell.approved[0] && cell.approved[2]).reduce((sum, cell) => sum + cell.count, 0);
    expect(swapIn).toBe(report.challengers![1].swap.swapIn.count);
  });

  it('recommends the supported challenger with the highest Gini, or none', () => {
    const supported = report.challengers!.map((challenger, k) => ({ k, challenger })).filter(({ challenger }) => challenger.verdict.outcome === 'supported');
    const best = supported.sort((x, y) => y.challenger.metrics.gini - x.challenger.metrics.gini)[0];
    expect(report.choice!.recommended).toBe(best === undefined ? null : best.k);
  });
});

describe('the bootstrap paired across every model', () => {
  // A further challenger that is a copy of the champion, and one that is a copy of the primary:
  // on the same resampled rows the first's ΔGini and ΔKS are 0 in every replicate, and the second's
  // distributions are the primary's.
  const text = (() => {
    const [header, ...lines] = readFileSync(new URL('mixed-3.csv', directory), 'utf8').trim().split('\n');
    return [`${header},same,again`, ...lines.map((line) => `${line},${line.split(',')[1]},${line.split(',')[2]}`)].join('\n');
  })();
  it('gives identical replicates to identical scores', async () => {
    const mapping = mappingOf(
      [
        { column: 'c1', higherIs: 'riskier' },
        { column: 'same', higherIs: 'safer' },
        { column: 'again', higherIs: 'riskier' },
      ],
      'safer',
    );
    const report = await reportOf('mixed-3-copies.csv', mapping, 200, text);
    const [primary, same, again] = report.challengers!;
    expect(same.histograms!.deltaGini).toEqual({ edges: [0, 0], counts: [200] });
    expect(same.histograms!.deltaKs).toEqual({ edges: [0, 0], counts: [200] });
    expect(same.difference.giniBootstrapCi).toEqual([0, 0]);
    expect(again.histograms).toEqual(primary.histograms);
    expect(again.difference.giniBootstrapCi).toEqual(primary.difference.giniBootstrapCi);
    expect(again.metrics.ksCi).toEqual(primary.metrics.ksCi);
  });
});

describe('every pair of challengers from one pass', () => {
  it('gives the paired DeLong test of the two challengers to the bit', async () => {
    const { pairedDelong } = await import('@server/stats/delong');
    const { safety, scoreBlocks } = await import('@server/stats/order');
    const { severalChallengers } = await import('@server/stats/several-challengers');
    const [header, ...lines] = readFileSync(new URL('pd-5.csv', directory), 'utf8').trim().split('\n');
    const rows = lines.map((line) => line.split(',').map(Number));
    const bad = Uint8Array.from(rows, (row) => row[0]);
    const blocks = header
      .split(',')
      .slice(1)
      .map((_, m) => scoreBlocks(safety(Float64Array.from(rows, (row) => row[m + 1]), 'riskier'), bad));
    const several = severalChallengers(blocks[0], blocks.slice(1), bad, 0.95);
    expect(several.pairwise).toHaveLength(10);
    for (const pair of several.pairwise) {
      const { difference } = pairedDelong(blocks[pair.a + 1], blocks[pair.b + 1], bad, 0.95);
      expect([pair.deltaGini, pair.giniSe, pair.z, pair.pTwoSided]).toEqual([difference.gini, difference.giniSe, difference.z, difference.pTwoSided]);
    }
  });
});

import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { ColumnMapping, Report } from '@shared/report';
import { loadHoldout } from '@server/reader/load';
import type { Holdout } from '@server/stats/holdout';
import { buildReport } from '@server/stats/report';

// Sampling weights checked from outside the project (tests/reference/weights/):
//   weights-python.json: generate.py (numpy 1.24.2, scipy 1.10.1, sklearn 1.2.1): sklearn's AUC and
//     scipy's KS on the row-expanded files, sklearn's AUC with sample_weight, a seeded paired
//     stratified row bootstrap (4,000 replicates) of the weighted AUCs and their difference;
//   weights-proc.json: proc.R (R 4.2.2, pROC 1.18.0): AUCs on the row-expanded files.
// The four checks of the issue: (a) every weight 1 gives the unweighted report exactly; (b) integer
// weights agree with the reference libraries on the expanded file (to the last few bits: the
// libraries sum in another order); (c) the linearisation se agrees with the row bootstrap within
// 5% (the bootstrap's own noise at 4,000 replicates is about 1.1%); (d) a constant weight on the
// goods leaves AUC, KS and their se unchanged and moves bad and approval rates to the population.
const folder = join(process.cwd(), 'tests/reference/weights');
const python = JSON.parse(readFileSync(join(folder, 'weights-python.json'), 'utf8'));
const proc = JSON.parse(readFileSync(join(folder, 'weights-proc.json'), 'utf8'));
const relative = (value: number, truth: number) => Math.abs(value - truth) / Math.abs(truth);

const mapping: ColumnMapping = {
  outcome: 'bad',
  badValue: '1',
  champion: 'champion',
  challenger: 'challenger',
  higherIs: { champion: 'safer', challenger: 'safer' },
  id: 'id',
  segments: ['segment'],
};
const settings = { bootstrap: 200, seed: 3 };

async function reportOf(file: string, weighted: boolean): Promise<{ report: Report; holdout: Holdout }> {
  const map = weighted ? { ...mapping, weight: 'w' } : mapping;
  const loaded = await loadHoldout({ path: join(folder, file) }, map);
  const report = await buildReport({ holdout: loaded.holdout, input: loaded.input, mapping: map, settings, read: loaded.read, threads: 0 });
  return { report, holdout: loaded.holdout };
}

/** The report without the fields only a weighted report has. */
function withoutWeightFields(report: Report): unknown {
  const copy = JSON.parse(JSON.stringify(report)) as Record<string, unknown> & Report;
  delete copy.population;
  delete (copy.mapping as Partial<ColumnMapping>).weight;
  // The report's swap sets, and each challenger's (several challengers).
  for (const swap of [copy.swap, ...(copy.challengers ?? []).map((challenger) => challenger.swap)]) {
    for (const cell of [swap.bothAccept, swap.swapIn, swap.swapOut, swap.bothReject, ...swap.bySegment.flatMap((row) => [row.swapIn, row.swapOut])]) {
      for (const key of ['accounts', 'known', 'unknown', 'badRateBounds', 'inferred'] as const) delete cell[key];
    }
    for (const row of swap.bySegment) delete row.unknown;
  }
  for (const row of copy.segments) {
    delete row.accounts;
    delete row.unknown;
  }
  // Calibration says whether weights were given (its figures with weights 1 are in calibration-reference.test.ts).
  if (copy.calibration) delete (copy.calibration as Partial<NonNullable<Report['calibration']>>).weighted;
  return copy;
}

let plain: { report: Report; holdout: Holdout };
let weighted: { report: Report; holdout: Holdout };
let goodsWeighted: { report: Report; holdout: Holdout };
beforeAll(async () => {
  plain = await reportOf('weighted-3000.csv', false);
  weighted = await reportOf('weighted-3000.csv', true);
  goodsWeighted = await reportOf('goods-weighted-3000.csv', true);
});

describe('(a) every weight 1 is the unweighted report, exactly', () => {
  it('gives the same report, bootstrap included, to the last bit', async () => {
    const holdout: Holdout = { ...plain.holdout, weight: new Float64Array(plain.holdout.n).fill(1) };
    const ones = await buildReport({ holdout, input: plain.report.input, mapping: { ...mapping, weight: 'w' }, settings, threads: 0 });
    const unweighted = await buildReport({ holdout: plain.holdout, input: plain.report.input, mapping, settings, threads: 0 });
    expect(ones.population).toBeDefined();
    expect(ones.swap.swapIn.accounts).toBe(ones.swap.swapIn.count);
    const expected = JSON.parse(JSON.stringify(unweighted)) as Report;
    if (expected.calibration) delete (expected.calibration as Partial<NonNullable<Report['calibration']>>).weighted;
    expect(withoutWeightFields(ones)).toEqual(expected);
  });
});

describe('(b) integer weights against the reference libraries on the row-expanded file', () => {
  it('AUC of both models: sklearn and pROC on the expanded rows', () => {
    for (const model of ['champion', 'challenger'] as const) {
      expect(relative(weighted.report[model].auc, python.weighted[model].aucExpanded)).toBeLessThan(1e-13);
      expect(relative(weighted.report[model].auc, python.weighted[model].aucSampleWeight)).toBeLessThan(1e-13);
      expect(relative(weighted.report[model].auc, proc.weighted[model].auc)).toBeLessThan(1e-13);
    }
  });

  it('KS of both models: scipy ks_2samp on the expanded rows', () => {
    for (const model of ['champion', 'challenger'] as const) {
      expect(relative(weighted.report[model].ks, python.weighted[model].ksExpanded)).toBeLessThan(1e-13);
    }
  });

  it('the weighted bad rate and the accounts', () => {
    expect(relative(weighted.report.badRate, python.weighted.badRate)).toBeLessThan(1e-13);
    expect(weighted.report.population!.accounts).toBe(python.weighted.accounts);
    expect(weighted.report.rows).toBe(python.rows);
    expect(weighted.report.bads).toBe(python.bads);
  });
});

describe('(c) the linearisation se against a seeded row bootstrap (numpy, 4,000 replicates)', () => {
  it('is within 5% for both AUCs and their difference', () => {
    const boot = python.weighted.bootstrap;
    expect(relative(weighted.report.champion.aucSe!, boot.seChampion)).toBeLessThan(0.05);
    expect(relative(weighted.report.challenger.aucSe!, boot.seChallenger)).toBeLessThan(0.05);
    expect(relative(weighted.report.difference.se!, boot.seDifference)).toBeLessThan(0.05);
  });

  it('differs from the naive DeLong of the expanded file, which treats copies as independent', () => {
    // The expanded file has about 3× the rows; its DeLong se would be about √3 smaller.
    expect(weighted.report.champion.aucSe).toBeGreaterThan(0.9 * python.weighted.bootstrap.seChampion);
  });
});

describe('(d) a constant weight on the goods only', () => {
  it('leaves AUC, KS and their standard errors unchanged', () => {
    for (const model of ['champion', 'challenger'] as const) {
      expect(relative(goodsWeighted.report[model].auc, plain.report[model].auc)).toBeLessThan(1e-14);
      expect(goodsWeighted.report[model].ks).toBe(plain.report[model].ks);
      expect(relative(goodsWeighted.report[model].aucSe!, plain.report[model].aucSe!)).toBeLessThan(1e-12);
      expect(relative(goodsWeighted.report[model].auc, python.goodsWeighted[model].aucExpanded)).toBeLessThan(1e-13);
    }
    expect(relative(goodsWeighted.report.difference.se!, plain.report.difference.se!)).toBeLessThan(1e-12);
  });

  it('moves the bad rate and the approval rates to the population values', () => {
    expect(relative(goodsWeighted.report.badRate, python.goodsWeighted.badRate)).toBeLessThan(1e-14);
    const { holdout } = goodsWeighted;
    const cutoff = goodsWeighted.report.swap.champion.cutoff;
    let accepted = 0;
    let total = 0;
    let acceptedBads = 0;
    for (let i = 0; i < holdout.n; i++) {
      total += holdout.weight![i];
      if (holdout.champion[i] >= cutoff) {
        accepted += holdout.weight![i];
        if (holdout.bad[i]) acceptedBads += 1;
      }
    }
    expect(goodsWeighted.report.swap.champion.approvalRate).toBe(accepted / total);
    const cells = goodsWeighted.report.swap;
    expect(cells.bothAccept.bads + cells.swapOut.bads).toBe(acceptedBads);
    // the approval rate of the unweighted report differs: there every account counts once
    expect(plain.report.badRate).not.toBe(goodsWeighted.report.badRate);
  });
});

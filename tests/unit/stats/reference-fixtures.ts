import { readFileSync } from 'node:fs';
import type { HigherIs } from '@shared/report';
import { loadHoldout } from '@server/reader/load';
import type { Holdout } from '@server/stats/holdout';

/** The committed reference holdouts and the values R's pROC and scipy printed for them. */
const referenceDir = new URL('../../reference/holdouts/', import.meta.url);

export interface ReferenceCase {
  file: string;
  higherIs: { champion: HigherIs; challenger: HigherIs };
  segment?: string;
  single?: boolean;
}

export interface ProcModel {
  auc: number;
  var: number;
  ciLower: number;
  ciUpper: number;
}
export interface ProcPaired {
  n: number;
  goods: number;
  bads: number;
  champion: ProcModel;
  challenger: ProcModel;
  cov: number;
  z: number;
  pTwoSided: number;
  pOneSided: number;
  ciLower: number;
  ciUpper: number;
}
export interface ProcCase extends ProcPaired {
  segments?: (ProcPaired & { value: string })[];
  hanleyMcNeilSe?: number;
}
export interface ScipyKs {
  statistic: number;
  exactFraction: number;
  scipyMode: 'exact' | 'asymp';
  statisticLocation: number;
  reachedAt: number[];
  riskiestReached: number;
}

const json = (name: string) => JSON.parse(readFileSync(new URL(name, referenceDir), 'utf8'));
export const cases = json('cases.json') as ReferenceCase[];
export const proc = json('proc.json') as { cases: Record<string, ProcCase> };
export const scipyKs = json('ks.json') as { cases: Record<string, { champion: ScipyKs; challenger: ScipyKs }> };

export async function loadCase(referenceCase: ReferenceCase): Promise<Holdout> {
  const { holdout } = await loadHoldout(
    { path: new URL(referenceCase.file, referenceDir).pathname },
    {
      outcome: 'bad',
      badValue: '1',
      champion: 'champion',
      challenger: 'challenger',
      higherIs: referenceCase.higherIs,
      segments: referenceCase.segment ? [referenceCase.segment] : [],
    },
  );
  return holdout;
}

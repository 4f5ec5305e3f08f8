import type { Stability } from '@shared/calibration';
import { defaultAdoptionPolicy } from '@shared/policy';
import { describe, expect, it } from 'vitest';
import { stabilityByPeriod } from '@server/stats/stability';
import { stabilityCriteria } from '@server/stats/verdict-stability';

// Small holdouts built by hand: in period A the challenger ranks perfectly and the champion
// randomly; in period B the reverse. Expected signs follow from the construction.
function twoPeriods(badsPerPeriod: number) {
  const perPeriod = 4 * badsPerPeriod;
  const n = 2 * perPeriod;
  const bad = new Uint8Array(n);
  const champion = new Float64Array(n);
  const challenger = new Float64Array(n);
  const codes = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    const period = i < perPeriod ? 0 : 1;
    const k = i % perPeriod;
    codes[i] = period;
    bad[i] = k < badsPerPeriod ? 1 : 0;
    const informative = bad[i] ? -1 - (k % 7) / 10 : 1 + (k % 5) / 10; // higher = safer, separates perfectly
    const noise = ((k * 7919) % 101) / 101; // unrelated to the outcome
    champion[i] = period === 0 ? noise : informative;
    challenger[i] = period === 0 ? informative : noise;
  }
  return { bad, champion, challenger, codes };
}

describe('stability by period', () => {
  it('flags the period whose ΔGini has the other sign when it has enough bads, and not otherwise', () => {
    const { bad, champion, challenger, codes } = twoPeriods(40);
    const input = {
      bad,
      champion,
      challenger,
      higherIs: { champion: 'safer' as const, challenger: 'safer' as const },
      weights: null,
      period: { column: 'month', levels: ['2025-02', '2025-01'], codes },
      overallDeltaGini: 0.1,
      confidence: 0.95,
      bands: 5,
      alpha: 0.05,
    };
    const rows = stabilityByPeriod({ ...input, minBads: 30 });
    // Levels are reported in value order: 2025-01 (code 1) first.
    expect(rows.map((row) => row.period)).toEqual(['2025-01', '2025-02']);
    const [january, february] = rows;
    expect(january.deltaGini!).toBeLessThan(0); // code 1: the champion ranks perfectly
    expect(february.deltaGini!).toBeGreaterThan(0);
    expect(january.championGini).toBeCloseTo(1, 12); // perfect separation, computed by hand
    expect(january.signChanged).toBe(true);
    expect(february.signChanged).toBe(false);
    expect(january.championPsiFromPrevious).toBeNull();
    expect(february.championPsiFromPrevious).not.toBeNull();
    const few = stabilityByPeriod({ ...input, minBads: 41 });
    expect(few.every((row) => !row.signChanged && !row.enoughBads)).toBe(true);
  });
});

describe('the policy criteria for calibration and stability', () => {
  const period = (name: string, bads: number, deltaGini: number | null) => ({ period: name, bads, deltaGini }) as Stability['periods'][number];
  const stability = (periods: Stability['periods']): Stability => ({ periodColumn: 'month', minBads: 100, periods, signChanges: [], psi: null });
  const policy = { ...defaultAdoptionPolicy, periodSignRule: { enabled: true, minBads: 100 }, psiRule: { enabled: true, threshold: 0.25 } };

  it('are absent while off (the default)', () => {
    expect(stabilityCriteria({ difference: { gini: 0.04 }, stability: stability([]) }, defaultAdoptionPolicy)).toEqual([]);
  });

  it('judge the sign rule from the period rows under the policy’s own N, and the PSI rule needs a reference', () => {
    const report = { difference: { gini: 0.04 }, stability: stability([period('a', 150, 0.05), period('b', 120, -0.01), period('c', 50, -0.2)]) };
    const [psi, sign] = stabilityCriteria(report, policy);
    expect(psi).toMatchObject({ id: 'psi', met: false });
    expect(psi.detail).toMatch(/no reference sample/);
    expect(sign).toMatchObject({ id: 'period-sign', met: false });
    expect(sign.detail).toBe('ΔGini changes sign in 1 of 2 periods with at least 100 bads: b (−1.0 points)');
    const [, relaxed] = stabilityCriteria(report, { ...policy, periodSignRule: { enabled: true, minBads: 130 } });
    expect(relaxed).toMatchObject({ met: true, detail: 'ΔGini has the overall sign in the one period with at least 130 bads' });
  });

  it('say so when the report predates the sections', () => {
    const criteria = stabilityCriteria({ difference: { gini: 0.04 } }, { ...policy, calibrationRule: { enabled: true, alpha: 0.05 } });
    expect(criteria.map((c) => c.met)).toEqual([false, false, false]);
    expect(criteria.every((c) => /made before/.test(c.detail))).toBe(true);
  });
});

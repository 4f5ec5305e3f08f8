import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { benchPolicyStages } from '../../../bench/policy-stages';
import { makeHoldout } from './policy-fixtures';

describe('benchPolicyStages', () => {
  it('times every decision-facing stage on a holdout (smoke test at 2,000 rows)', () => {
    // Not a timed test: only that the benchmark helper runs every stage and reports medians.
    const random = seedrandom('stages');
    const n = 2000;
    const latent = Array.from({ length: n }, () => random() * 4 - 2);
    const holdout = makeHoldout({
      champion: latent.map((x) => Math.round(600 + 40 * (x + random()))),
      challenger: latent.map((x) => 1 / (1 + Math.exp(2 + x + random() - 0.5))),
      bad: latent.map((x) => (random() < 1 / (1 + Math.exp(1.5 + x)) ? 1 : 0)),
      higherIs: { champion: 'safer', challenger: 'riskier' },
      exposure: latent.map(() => 1000 + random() * 5000),
    });
    const stages = benchPolicyStages(holdout, { runs: 3 });
    expect(stages.map((s) => s.stage)).toEqual(
      expect.arrayContaining([expect.stringMatching(/^policy: swap sets at a matched/), expect.stringMatching(/on demand/), expect.stringMatching(/economics/)]),
    );
    for (const stage of stages) {
      expect(stage.runsMs).toHaveLength(3);
      expect(Number.isFinite(stage.medianMs)).toBe(true);
    }
  });
});

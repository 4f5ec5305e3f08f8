import { describe, expect, it } from 'vitest';
import { describeUplift, relativeTo, upliftDomain, upliftTicks } from '@/features/comparisons/lib/uplift';

// Values in Gini fractions (0.041 = 4.1 points); expected values worked by hand.

describe('the uplift drawing', () => {
  it('spans the interval, zero and the materiality line with a margin', () => {
    const [lo, hi] = upliftDomain({ delta: 0.041, interval: [0.02, 0.062], materiality: 0.02 });
    expect(lo).toBeLessThan(0);
    expect(hi).toBeGreaterThan(0.062);
    // An interval far below zero still shows zero and the materiality line.
    const [lo2, hi2] = upliftDomain({ delta: -0.08, interval: [-0.1, -0.06], materiality: 0.02 });
    expect(lo2).toBeLessThan(-0.1);
    expect(hi2).toBeGreaterThan(0.02);
  });

  it('ticks in round steps of points', () => {
    expect(upliftTicks([-0.01, 0.07])).toEqual([-0.01, 0, 0.01, 0.02, 0.03, 0.04, 0.05, 0.06, 0.07]);
    expect(upliftTicks([-0.1, 0.06], 8)).toEqual([-0.1, -0.08, -0.06, -0.04, -0.02, 0, 0.02, 0.04, 0.06]);
  });

  it('places an interval above, across or below a line', () => {
    expect(relativeTo([0.01, 0.03], 0)).toBe('above');
    expect(relativeTo([-0.01, 0.03], 0)).toBe('straddles');
    expect(relativeTo([-0.03, -0.01], 0)).toBe('below');
  });

  it('says in words where the interval lies against zero and materiality', () => {
    const text = { delta: '+4.1', interval: '2.0 to 6.2', materiality: '2.0', confidence: '95%' };
    expect(describeUplift({ delta: 0.041, interval: [0.0205, 0.062], materiality: 0.02 }, text)).toBe(
      "The challenger's Gini is +4.1 points against the champion's, 95% interval 2.0 to 6.2. The whole interval lies above zero and above the materiality line of 2.0 points.",
    );
    expect(describeUplift({ delta: 0.03, interval: [0.01, 0.05], materiality: 0.02 }, text)).toContain(
      'The whole interval lies above zero; the estimate reaches the materiality line of 2.0 points but the lower bound does not.',
    );
    expect(describeUplift({ delta: -0.027, interval: [-0.081, 0.028], materiality: 0.02 }, text)).toContain(
      'The interval includes zero: no difference is consistent with the data; the estimate is below the materiality line',
    );
    expect(describeUplift({ delta: -0.05, interval: [-0.07, -0.03], materiality: 0.02 }, text)).toContain('the champion separates better and below the materiality line');
  });
});

import type { HigherIs } from '@shared/report';
import type { Holdout } from '@server/stats/holdout';

/** A holdout from plain arrays, for the policy-statistics tests. */
export function makeHoldout(options: {
  champion: number[];
  challenger: number[];
  bad: number[];
  higherIs?: { champion: HigherIs; challenger: HigherIs };
  exposure?: number[];
  ids?: string[];
}): Holdout {
  const n = options.bad.length;
  return {
    n,
    bad: Uint8Array.from(options.bad),
    champion: Float64Array.from(options.champion),
    challenger: Float64Array.from(options.challenger),
    higherIs: options.higherIs ?? { champion: 'safer', challenger: 'safer' },
    exposure: options.exposure ? Float64Array.from(options.exposure) : null,
    ids: options.ids ?? null,
    segments: [],
  };
}

/** Relative difference, with an absolute floor for values near 0. */
export function relativeError(actual: number, expected: number): number {
  if (expected === 0) return Math.abs(actual);
  return Math.abs(actual - expected) / Math.abs(expected);
}

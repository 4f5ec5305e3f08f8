import { describe, expect, it } from 'vitest';
import { recommendedChallenger } from '@shared/choose-challenger';

describe('the recommended challenger', () => {
  it('is the supported challenger with the highest Gini, not the highest Gini overall', () => {
    expect(
      recommendedChallenger([
        { outcome: 'not-proven', gini: 0.61, swapInBadRate: 0.05 },
        { outcome: 'supported', gini: 0.58, swapInBadRate: 0.07 },
        { outcome: 'supported', gini: 0.57, swapInBadRate: 0.02 },
      ]),
    ).toBe(1);
  });

  it('breaks a tie in Gini by the lower swap-in bad rate; an unknown rate loses the tie; then the listed order', () => {
    expect(
      recommendedChallenger([
        { outcome: 'supported', gini: 0.58, swapInBadRate: 0.07 },
        { outcome: 'supported', gini: 0.58, swapInBadRate: 0.06 },
      ]),
    ).toBe(1);
    expect(
      recommendedChallenger([
        { outcome: 'supported', gini: 0.58, swapInBadRate: null },
        { outcome: 'supported', gini: 0.58, swapInBadRate: 0.09 },
      ]),
    ).toBe(1);
    expect(
      recommendedChallenger([
        { outcome: 'supported', gini: 0.58, swapInBadRate: 0.06 },
        { outcome: 'supported', gini: 0.58, swapInBadRate: 0.06 },
      ]),
    ).toBe(0);
  });

  it('is none when no challenger is supported', () => {
    expect(
      recommendedChallenger([
        { outcome: 'not-proven', gini: 0.7, swapInBadRate: 0.01 },
        { outcome: 'champion-better', gini: 0.4, swapInBadRate: 0.2 },
      ]),
    ).toBeNull();
    expect(recommendedChallenger([])).toBeNull();
  });
});

import { describe, expect, it } from 'vitest';
import type { Criterion } from '@shared/report';
import { verdictExplanation } from '@shared/verdict-words';

const criterion = (id: Criterion['id'], met: boolean): Criterion => ({ id, label: id, met, detail: '' });

describe('verdict explanation', () => {
  it('names only the criteria that failed: materiality alone does not deny a significant uplift', () => {
    // issue 13: with p = 1e-8 and only materiality failing, the old words said the evidence
    // "does not establish that the challenger is better".
    const text = verdictExplanation({
      outcome: 'not-proven',
      criteria: [criterion('significance', true), criterion('materiality', false), criterion('interval', true), criterion('minimum-bads', true)],
    });
    expect(text).toBe(
      'One criterion is not met: the uplift is smaller than the policy requires. The challenger is significantly better overall, but the policy asks for more before adoption.',
    );
    expect(text).not.toMatch(/does not establish/);
  });

  it('lists several failures, and names the segment rule', () => {
    expect(
      verdictExplanation({ outcome: 'not-proven', criteria: [criterion('significance', false), criterion('segments', false), criterion('materiality', true)] }),
    ).toBe('2 criteria are not met: the uplift is not statistically significant; and the challenger is significantly worse in at least one segment value.');
    expect(verdictExplanation({ outcome: 'supported', criteria: [criterion('significance', true)] })).toMatch(/^Every criterion/);
    expect(verdictExplanation({ outcome: 'champion-better', criteria: [criterion('significance', false)] })).toMatch(/^The champion separates/);
  });
});

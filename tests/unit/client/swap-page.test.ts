import { describe, expect, it } from 'vitest';
import { type SwapQuery } from '@shared/comparisons';
import { type Report } from '@shared/report';
import { isUpdating, needsServer, reportSwapResult, scenarioQuery, swapSearchParams } from '@/features/swap-sets/lib/swap-page';

// The swap-sets page's control logic (src/features/swap-sets/lib/swap-page.ts); expected values
// worked out by hand from the rules in its header.

const atReport: SwapQuery = { approvalRate: 0.7 };
const other: SwapQuery = { cutoffs: { champion: 600, challenger: 610 } };

describe('the swap-sets page', () => {
  it("asks the server only for a settled choice other than the report's own", () => {
    expect(needsServer(atReport, atReport)).toBe(false);
    expect(needsServer(other, atReport)).toBe(true);
  });

  it('is updating while the choice is newer than the settled one, or the server is answering it', () => {
    expect(isUpdating({ draft: other, settled: atReport, fromReport: atReport, fetching: false })).toBe(true);
    expect(isUpdating({ draft: other, settled: other, fromReport: atReport, fetching: true })).toBe(true);
    expect(isUpdating({ draft: other, settled: other, fromReport: atReport, fetching: false })).toBe(false);
    // At the report's own choice a fetch in the background does not count: nothing is asked.
    expect(isUpdating({ draft: atReport, settled: atReport, fromReport: atReport, fetching: true })).toBe(false);
  });

  it("keeps the URL clean at the report's choice and carries any other", () => {
    expect(swapSearchParams(atReport, atReport)).toEqual({});
    expect(swapSearchParams(other, atReport)).toEqual({ champion: '600', challenger: '610' });
    expect(swapSearchParams({ approvalRate: 0.75 }, atReport)).toEqual({ rate: '0.75' });
  });

  it('shows a saved scenario by its approval rate, or by its cut-offs when it has none', () => {
    expect(scenarioQuery({ approvalRate: 0.75, cutoffs: { champion: 590, challenger: 588 } })).toEqual({ approvalRate: 0.75 });
    expect(scenarioQuery({ approvalRate: null, cutoffs: { champion: 600, challenger: 610 } })).toEqual({ cutoffs: { champion: 600, challenger: 610 } });
  });

  it("puts the report's own swap sets in the server's answer shape, with the strategy position at its approval rate", () => {
    const report = {
      swap: { champion: { approvalRate: 0.708 }, challenger: { approvalRate: 0.704 } },
      swapMatrix: { cells: [] },
      strategyCurve: { atApprovalRate: { approvalRate: 0.7, championBads: 244, challengerBads: 228, badsAvoided: 16, approvalsGainedAtEqualBadRate: 136 } },
    } as unknown as Report;
    expect(reportSwapResult(report)).toEqual({
      swap: report.swap,
      swapMatrix: report.swapMatrix,
      strategyPosition: { approvalRate: 0.7, championBads: 244, challengerBads: 228, badsAvoided: 16, approvalsGainedAtEqualBadRate: 136, championApprovalRate: 0.708, challengerApprovalRate: 0.704 },
    });
  });
});

/** @vitest-environment jsdom */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClientProvider } from '@tanstack/react-query';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { type ChallengersSwapResult } from '@shared/comparisons';
import { type ChallengerResult, type Report, reportSchema, type SwapSegmentRow } from '@shared/report';
import { SwapSegmentsSection } from '@/features/swap-sets/components/swap-segments-section';
import { furtherSwapQuery, furtherSwapRate, reportSwapResult } from '@/features/swap-sets/lib/swap-page';
import { chosenModelWords, jointTestSentence, modelsSummaryTable, pairwiseTable, reportChallengersSwap, swapSideBySideTable } from '@shared/challengers-words';
import { SeveralChallengersSections } from '@/features/comparisons/components/challengers-overview';
import { ChallengersSwapSection } from '@/features/swap-sets/components/challengers-swap-section';
import { adoptionAgainstRecord, challengerOptions, mostNamedChallenger } from '@/features/governance/lib/choosing';
import { challengersSwapRequest } from '@/features/swap-sets/lib/side-by-side';
import { DecisionForm } from '@/features/governance/components/decision-form';
import { VoteForm, VotesTally } from '@/features/governance/components/votes-panel';
import { CSRF_TOKEN, governanceAnswer, renderWithQueries, useFakeApi } from './forms/render';

/**
 * The pages of a comparison with three challengers, on a real report: the engine's output for
 * tests/reference/challengers/points-ties-3.csv with named challengers (fixtures/
 * make-three-challengers.ts). The summary of every model, the joint and pairwise tests, the
 * recommended challenger, the side-by-side swap sets, and the vote and decision naming one.
 */

const report = reportSchema.parse(JSON.parse(readFileSync(resolve(process.cwd(), 'tests/unit/client/fixtures/three-challengers-report.json'), 'utf8'))) as Report & {
  challengers: ChallengerResult[];
};
const api = useFakeApi();
const user = () => userEvent.setup({ delay: null });

describe('the words for several challengers', () => {
  it('summarises every model: the champion first, each challenger against it with the Holm p, the recommended one marked', () => {
    const table = modelsSummaryTable(report, report.settings.confidence);
    expect(table.rows.map((row) => row[0])).toEqual(['CF-2 scorecard', 'CF-3 bureau', 'CF-4 open banking', 'Refit 2025']);
    expect(table.rows[0]).toEqual(['CF-2 scorecard', 'Champion', '35.0', '0.675', '28.6', '—', '—', '—', '—']);
    expect(table.rows[2]).toEqual(['CF-4 open banking', 'Challenger 2 (recommended)', '40.7', '0.703', '29.4', '+5.7', '+2.1 to +9.3', '0.00259', 'Challenger supported']);
    // Holm (1979) by hand on the three one-sided p: sorted 8.63e-4, 0.102, 0.301 → ×3, ×2, ×1, kept monotone.
    const plain = report.challengers.map((challenger) => challenger.difference.pOneSided!);
    expect(plain[1]! < plain[0]! && plain[0]! < plain[2]!).toBe(true);
    expect(report.challengers[1]!.pOneSidedHolm).toBeCloseTo(3 * plain[1]!, 15);
    expect(report.challengers[0]!.pOneSidedHolm).toBeCloseTo(2 * plain[0]!, 15);
    expect(report.challengers[2]!.pOneSidedHolm).toBeCloseTo(Math.max(plain[2]!, 2 * plain[0]!), 15);
    expect(table.rows.map((row) => row[7])).toEqual(['—', '0.204', '0.00259', '0.301']);
  });

  it('states the Holm p the policy tests: two-sided under a two-sided policy', () => {
    const table = modelsSummaryTable({ ...report, policy: { ...report.policy, sided: 'two-sided' } }, report.settings.confidence);
    expect(table.head[7]).toBe('p, two-sided, Holm');
    // Every z is positive here, so each two-sided p is twice the one-sided one and Holm keeps the order: twice the values above.
    expect(table.rows.map((row) => row[7])).toEqual(['—', '0.408', '0.00518', '0.603']);
  });

  it('states the joint test and every pair, later minus earlier', () => {
    expect(jointTestSentence(report)).toBe(
      'Joint test that all 3 challengers equal the champion (DeLong, DeLong & Clarke-Pearson 1988): χ² = 11.19 on 3 degrees of freedom, p = 0.011.',
    );
    expect(pairwiseTable(report).rows).toEqual([
      ['CF-4 open banking − CF-3 bureau', '+3.2', '1.8', '1.76', '0.0782'],
      ['Refit 2025 − CF-3 bureau', '−1.5', '1.9', '−0.77', '0.439'],
      ['Refit 2025 − CF-4 open banking', '−4.7', '1.9', '−2.52', '0.0116'],
    ]);
    // The pair's ΔGini is the difference of the two Ginis of the summary.
    expect(report.pairwise![0]!.deltaGini).toBeCloseTo(report.challengers[1]!.metrics.gini - report.challengers[0]!.metrics.gini, 12);
  });

  it('puts each challenger in a column of the side-by-side swap sets', () => {
    const table = swapSideBySideTable(report.challengers);
    expect(table.head).toEqual(['', 'CF-3 bureau', 'CF-4 open banking', 'Refit 2025']);
    expect(table.rows[1]).toEqual(['Swap-in: applicants', '315', '288', '260']);
    expect(table.rows[2]).toEqual(['Swap-in bad rate', '16.5%', '13.9%', '15.8%']);
  });

  it('names the chosen model of a decision', () => {
    expect(chosenModelWords({ model: 'challenger', challenger: 1, name: 'CF-4 open banking' })).toBe('CF-4 open banking (challenger 2)');
    expect(chosenModelWords({ model: 'champion', challenger: null, name: 'CF-2 scorecard' })).toBe('the champion, CF-2 scorecard');
    expect(chosenModelWords(null)).toBeNull();
  });
});

describe('the verdict page with several challengers', () => {
  it('names the recommended challenger with the caution, shows every model, the joint test, the pairs and each verdict', () => {
    renderWithQueries(<SeveralChallengersSections report={report} />);
    expect(screen.getByText('Recommended: CF-4 open banking')).toBeTruthy();
    expect(screen.getByTestId('choice-summary').textContent).toBe(report.choice!.summary);
    expect(screen.getByText(/rests with the institution’s policy and its committee/)).toBeTruthy();
    const summary = within(screen.getByTestId('models-summary'));
    expect(summary.getAllByRole('row')).toHaveLength(5);
    expect(summary.getByRole('rowheader', { name: 'CF-4 open banking' }).closest('tr')!.className).toMatch(/bg-court-50/);
    expect(screen.getByTestId('joint-test').textContent).toMatch(/χ² = 11\.19 on 3 degrees of freedom, p = 0\.011/);
    expect(within(screen.getByTestId('pairwise')).getAllByRole('row')).toHaveLength(4);
    const verdicts = within(screen.getByTestId('challenger-verdicts'));
    expect(verdicts.getAllByText('Not proven')).toHaveLength(2);
    expect(verdicts.getByText('Challenger supported')).toBeTruthy();
    expect(verdicts.getByText('Recommended')).toBeTruthy();
  });

  it('says none is recommended when no challenger is supported', () => {
    renderWithQueries(<SeveralChallengersSections report={{ ...report, choice: { recommended: null, summary: 'None of the 3 challengers is supported.' } }} />);
    expect(screen.getByText('No challenger is recommended')).toBeTruthy();
    expect(screen.getByTestId('choice-summary').textContent).toBe('None of the 3 challengers is supported.');
  });
});

describe('the side-by-side swap sets', () => {
  it('reads the report at its own rate and asks the server only for another', async () => {
    expect(reportChallengersSwap(report)!.challengers.map((challenger) => challenger.name)).toEqual(['CF-3 bureau', 'CF-4 open banking', 'Refit 2025']);
    expect(challengersSwapRequest(0.7, report)).toBeNull();
    expect(challengersSwapRequest(Number.NaN, report)).toBeNull();
    expect(challengersSwapRequest(1, report)).toBeNull();
    expect(challengersSwapRequest(0.6, report)).toBe(0.6);

    const atSixty: ChallengersSwapResult = {
      ...reportChallengersSwap(report)!,
      approvalRate: 0.6,
      challengers: reportChallengersSwap(report)!.challengers.map((challenger, index) => ({
        ...challenger,
        swap: { ...challenger.swap, swapIn: { ...challenger.swap.swapIn, count: 100 + index, accounts: 100 + index } },
      })),
    };
    api.answer('POST /api/comparisons/12/challengers/swap', () => ({ status: 200, body: atSixty }));
    renderWithQueries(<ChallengersSwapSection comparisonId={12} runId={40} report={report} />);
    expect(within(screen.getByTestId('swap-side-by-side')).getByText('315')).toBeTruthy();
    expect(within(screen.getByTestId('approval-patterns')).getAllByRole('row')).toHaveLength(17);
    expect(api.sent).toEqual([]);
    const person = user();
    const rate = screen.getByLabelText('Approval rate for every challenger (%)');
    await person.clear(rate);
    await person.type(rate, '60');
    await waitFor(() => expect(within(screen.getByTestId('swap-side-by-side')).getByText('102')).toBeTruthy());
    expect(api.sent.filter((request) => request.path.endsWith('/challengers/swap'))).toEqual([
      { method: 'POST', path: '/api/comparisons/12/challengers/swap', csrf: CSRF_TOKEN, body: { approvalRate: 0.6 } },
    ]);
  });
});

describe('the swap sets by segment of each challenger', () => {
  // The fixture's holdout has no segment column: one row per value is made up here (the page, not the engine, is under test).
  const segmentRow = (value: string, swapIn: number): SwapSegmentRow => {
    const cell = { count: swapIn, bads: 10, badRate: 10 / swapIn, badRateCi: null, amount: null };
    const approval = { approved: 700, approvalRate: 0.7, approvedBadRate: 0.05 };
    return { column: 'region', value, accounts: 1000, bads: 80, champion: approval, challenger: approval, swapIn: cell, swapOut: cell };
  };
  const withRows = {
    ...report,
    swap: { ...report.swap, bySegment: [segmentRow('first', 111)] },
    challengers: report.challengers.map((challenger, k) => ({ ...challenger, swap: { ...challenger.swap, bySegment: [segmentRow(`stored ${k}`, 120 + k)] } })),
  };
  const shown = reportSwapResult(withRows);

  it('asks the server for a further challenger only at a rate the report does not hold', () => {
    expect(withRows.challengers[1]!.swap.requestedApprovalRate).toBe(0.7);
    expect(furtherSwapQuery(withRows, 0, 0.6)).toBeNull();
    expect(furtherSwapQuery(withRows, 1, 0.7)).toBeNull();
    expect(furtherSwapQuery(withRows, 1, 0.6)).toEqual({ approvalRate: 0.6, challenger: 1 });
    expect(furtherSwapRate({ approvalRate: 0.6 }, shown)).toBe(0.6);
    // At given cut-offs: the champion's approval rate there.
    expect(furtherSwapRate({ cutoffs: { champion: 1, challenger: 2 } }, shown)).toBe(shown.swap.champion.approvalRate);
  });

  it('offers each challenger, reads the report at its rate and asks the server { challenger: k } at another', async () => {
    const answer = { ...shown, swap: { ...shown.swap, bySegment: [segmentRow('from the server', 345)] } };
    api.answer('POST /api/comparisons/12/swap', () => ({ status: 200, body: answer }));
    const view = renderWithQueries(<SwapSegmentsSection comparisonId={12} runId={40} report={withRows} settled={{ approvalRate: 0.7 }} shown={shown} confidence="95%" />);
    const section = () => screen.getByTestId('swap-segments');
    expect(within(section()).getByText('first')).toBeTruthy();
    const person = user();
    await person.selectOptions(screen.getByLabelText('Challenger against the champion'), 'CF-4 open banking (challenger 2)');
    expect(within(section()).getByText('stored 1')).toBeTruthy();
    expect(document.body.textContent).toContain('CF-4 open banking against the champion within each value of each segment column, both at their cut-offs for a 70.0% approval rate');
    expect(api.sent).toEqual([]);
    // The page's choice moves to a 60% approval rate: the chosen challenger stays, asked of the server.
    view.rerender(
      <QueryClientProvider client={view.queryClient}>
        <SwapSegmentsSection comparisonId={12} runId={40} report={withRows} settled={{ approvalRate: 0.6 }} shown={shown} confidence="95%" />
      </QueryClientProvider>,
    );
    await waitFor(() => expect(within(section()).getByText('from the server')).toBeTruthy());
    expect(api.sent).toEqual([{ method: 'POST', path: '/api/comparisons/12/swap', csrf: CSRF_TOKEN, body: { approvalRate: 0.6, challenger: 1 } }]);
  });

  it('shows no choice with one challenger', () => {
    renderWithQueries(<SwapSegmentsSection comparisonId={12} runId={40} report={{ ...withRows, challengers: withRows.challengers.slice(0, 1) }} settled={{ approvalRate: 0.7 }} shown={shown} confidence="95%" />);
    expect(screen.queryByLabelText('Challenger against the champion')).toBeNull();
    expect(within(screen.getByTestId('swap-segments')).getByText('first')).toBeTruthy();
  });
});

describe('votes and the decision naming one challenger', () => {
  const options = challengerOptions(report);

  it('offers each challenger with its verdict; with one challenger there is nothing to choose', () => {
    expect(options.map((option) => [option.name, option.outcome, option.recommended])).toEqual([
      ['CF-3 bureau', 'not-proven', false],
      ['CF-4 open banking', 'supported', true],
      ['Refit 2025', 'not-proven', false],
    ]);
    expect(challengerOptions({ ...report, challengers: report.challengers.slice(0, 1) })).toEqual([]);
    expect(mostNamedChallenger([1, 2, 0])).toBe(1);
    expect(mostNamedChallenger([2, 2, 0])).toBeNull();
    expect(mostNamedChallenger([0, 0, 0])).toBeNull();
    expect(adoptionAgainstRecord(options, [0, 2, 0], 1)).toEqual([]);
    expect(adoptionAgainstRecord(options, [0, 2, 0], 0)).toEqual(['CF-3 bureau\'s verdict is “not proven”, not supported.', 'The adopt votes named CF-4 open banking most often.']);
  });

  it('a vote to adopt names the challenger; keep sends none', async () => {
    api.answer('POST /api/comparisons/12/votes', () => ({ status: 200, body: governanceAnswer() }));
    renderWithQueries(<VoteForm comparisonId={12} current={null} challengers={options} />);
    const person = user();
    expect(screen.queryByText('Which challenger to adopt')).toBeNull();
    await person.click(screen.getByLabelText('Adopt the challenger'));
    await person.click(screen.getByRole('button', { name: 'Cast my vote' }));
    expect(await screen.findByText('Choose the challenger to adopt')).toBeTruthy();
    expect(api.sent).toEqual([]);
    await person.click(screen.getByLabelText('CF-4 open banking (challenger supported, recommended)'));
    await person.click(screen.getByRole('button', { name: 'Cast my vote' }));
    await waitFor(() => expect(api.sent).toHaveLength(1));
    expect(api.sent[0]!.body).toEqual({ vote: 'adopt', comment: '', challenger: 1 });
    await person.click(screen.getByLabelText('Keep the champion'));
    await person.click(screen.getByRole('button', { name: 'Cast my vote' }));
    await waitFor(() => expect(api.sent).toHaveLength(2));
    expect(api.sent[1]!.body).toEqual({ vote: 'keep', comment: '' });
  });

  it('the tally says which challenger each adopt vote named', () => {
    const voter = (id: number, name: string) => ({ id, name });
    renderWithQueries(
      <VotesTally
        quorum={2}
        challengers={options}
        adoptVotesByChallenger={[0, 1, 1]}
        votes={[
          { id: 1, vote: 'adopt', challenger: 1, comment: '', voter: voter(5, 'Chidi Okafor'), createdAt: '2026-12-01T10:00:00.000Z' },
          { id: 2, vote: 'adopt', challenger: 2, comment: '', voter: voter(6, 'Dana Reyes'), createdAt: '2026-12-01T11:00:00.000Z' },
        ]}
      />,
    );
    expect(screen.getAllByTestId('vote').map((item) => item.textContent)).toEqual([expect.stringMatching(/^Chidi Okafor: adopt the challenger CF-4 open banking/), expect.stringMatching(/^Dana Reyes: adopt the challenger Refit 2025/)]);
    expect(screen.getByTestId('adopt-votes-by-challenger').textContent).toBe('Adopt CF-3 bureau: 0Adopt CF-4 open banking: 1Adopt Refit 2025: 1');
  });

  it('the decision adopts one challenger: against the record when it is not the supported one most votes named', async () => {
    api.answer('POST /api/comparisons/12/decision', () => ({ status: 200, body: governanceAnswer({ state: 'decided' }) }));
    const onDone = vi.fn();
    renderWithQueries(
      <DecisionForm
        comparisonId={12}
        runId={40}
        quorumMet
        tally={{ adopt: 2, keep: 0, defer: 0 }}
        majority="adopt"
        segmentValues={[]}
        recipients={['Ada Moreno']}
        onDone={onDone}
        challengers={options}
        adoptVotesByChallenger={[0, 2, 0]}
      />,
    );
    const person = user();
    await person.click(screen.getByLabelText(/^Adopt the challenger/));
    expect(screen.getByLabelText('CF-4 open banking (challenger supported, recommended) — 2 adopt votes')).toBeTruthy();
    await person.click(screen.getByLabelText('CF-3 bureau (not proven) — 0 adopt votes'));
    expect(screen.getByText('This decision goes against the record')).toBeTruthy();
    expect(screen.getByText(/CF-3 bureau's verdict is “not proven”, not supported\. The adopt votes named CF-4 open banking most often\./)).toBeTruthy();
    await person.click(screen.getByLabelText(/CF-4 open banking/));
    expect(screen.queryByText('This decision goes against the record')).toBeNull();
    await person.type(screen.getByLabelText('Rationale'), 'CF-4 carries the uplift.');
    await person.click(within(screen.getByRole('form', { name: 'Record the decision' })).getByRole('button', { name: 'Record the decision' }));
    const dialog = await screen.findByRole('dialog', { name: 'Record the committee’s decision?' });
    expect(within(dialog).getByText('CF-4 open banking')).toBeTruthy();
    await person.click(within(dialog).getByRole('button', { name: 'Record the decision' }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    expect(api.sent.map((request) => request.body)).toEqual([{ outcome: 'adopt', rationale: 'CF-4 carries the uplift.', acknowledgeAgainstRecord: false, challenger: 1 }]);
  });
});

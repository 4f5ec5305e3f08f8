/** @vitest-environment jsdom */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { flaggedSegmentsNote, flaggedSegmentsTable } from '@shared/challengers-words';
import { segmentFlagsText, segmentsTable } from '@shared/segments-words';
import { bandsOf, flaggedSegmentsOf, segmentsOf } from '@shared/challenger-sections';
import { type MixedStrategyResult } from '@shared/mixed-strategy';
import { type ChallengerResult, type Report, reportSchema, type SegmentRow } from '@shared/report';
import { FlaggedSegmentsByChallenger } from '@/features/comparisons/components/flagged-segments';
import { choiceLines } from '@/features/comparisons/lib/list-choice';
import { DecisionForm } from '@/features/governance/components/decision-form';
import { keepableValues } from '@/features/governance/components/keep-champion';
import { challengerOptions } from '@/features/governance/lib/choosing';
import { governanceAnswer, renderWithQueries, useFakeApi } from './forms/render';

/**
 * Segments for every challenger on the pages: the flagged values of each challenger on the
 * verdict page, the words the printable report and the pack share, the decision keeping the
 * champion in some values for whichever challenger is adopted, and the list's choice lines. The
 * report is the engine's for three challengers (fixtures/three-challengers-report.json); its
 * holdout has no segment column, so segment rows are added here (the pages, not the statistics,
 * are under test: the engine's rows are tested in tests/api/challenger-segments.test.ts).
 */
const base = reportSchema.parse(JSON.parse(readFileSync(resolve(process.cwd(), 'tests/unit/client/fixtures/three-challengers-report.json'), 'utf8'))) as Report & {
  challengers: ChallengerResult[];
};
const row = (value: string, deltaGini: number, flags: SegmentRow['flags']): SegmentRow => ({
  column: 'region',
  value,
  n: 1000,
  goods: 850,
  bads: 150,
  championGini: 0.4,
  challengerGini: 0.4 + deltaGini,
  deltaGini,
  giniSe: 0.03,
  p: flags.length > 0 ? 1e-6 : 0.4,
  pTwoSided: flags.length > 0 ? 1e-6 : 0.4,
  giniCi: [deltaGini - 0.06, deltaGini + 0.06],
  pHolm: flags.length > 0 ? 3e-6 : 0.8,
  tooFewBads: false,
  flags,
  note: null,
});
const report: Report & { challengers: ChallengerResult[] } = {
  ...base,
  segments: [row('A', 0.02, []), row('B', 0.01, [])],
  challengers: [
    base.challengers[0]!,
    { ...base.challengers[1]!, segments: [row('A', 0.05, []), row('B', -0.2, ['significantly-worse', 'materially-worse'])] },
    { ...base.challengers[2]!, segments: undefined },
  ],
};
const api = useFakeApi();
const user = () => userEvent.setup({ delay: null });

describe('each challenger’s own sections', () => {
  it('are the report’s for the first and each further challenger’s own after it', () => {
    expect(segmentsOf(report, 0)).toBe(report.segments);
    expect(segmentsOf(report, 1)).toBe(report.challengers[1]!.segments);
    expect(segmentsOf(report, 2)).toEqual([]);
    expect(flaggedSegmentsOf(report, 1).map((r) => r.value)).toEqual(['B']);
    expect(bandsOf(base, 0)).toBe(base.bands.challenger);
    // The fixture's engine gives every further challenger its band table, on its own score.
    expect(bandsOf(base, 2)!.rows).toHaveLength(base.settings.bands);
    expect(bandsOf(base, 2)!.giniTrapezoid).not.toBe(base.bands.challenger.giniTrapezoid);
  });

  it('list every challenger’s flagged values in words, and say which challenger was not checked', () => {
    expect(segmentFlagsText(['significantly-worse', 'materially-worse'])).toBe('Significantly worse; materially worse');
    expect(segmentFlagsText(['materially-worse'])).toBe('Materially worse');
    const table = flaggedSegmentsTable(report);
    expect(table.rows).toEqual([
      ['CF-4 open banking (challenger 2)', 'region = B', 'Significantly worse; materially worse', '−20.0', '−26.0 to −14.0', '3.0 × 10⁻⁶'],
      ['Refit 2025 (challenger 3)', 'not checked: run the analysis again', '—', '—', '—', '—'],
    ]);
    expect(flaggedSegmentsNote({ head: [], rows: [] })).toBe('No segment value is significantly or materially worse for any challenger.');
    expect(segmentsTable(report, 1)!.rows).toEqual([
      ['region = A', '1,000', '150', '40.0', '45.0', '+5.0', '−1.0 to +11.0', '0.400', '0.800', ''],
      ['region = B', '1,000', '150', '40.0', '20.0', '−20.0', '−26.0 to −14.0', '1.0 × 10⁻⁶', '3.0 × 10⁻⁶', 'Significantly worse; materially worse'],
    ]);
  });
});

describe('the verdict page’s segments with several challengers', () => {
  it('shows the flagged values under each challenger’s name, the same as for the first', () => {
    renderWithQueries(<FlaggedSegmentsByChallenger report={report} />);
    const blocks = screen.getAllByTestId('challenger-flagged-segments');
    expect(blocks.map((block) => within(block).getByRole('heading').textContent)).toEqual(['CF-3 bureau (challenger 1)', 'CF-4 open banking (challenger 2)', 'Refit 2025 (challenger 3)']);
    expect(blocks[0]!.textContent).toContain('No segment value is significantly or materially worse for CF-3 bureau.');
    const flagged = within(blocks[1]!).getByRole('list', { name: 'Flagged segment values of CF-4 open banking' });
    expect(flagged.textContent).toContain('region = B');
    expect(within(flagged).getByText('Significantly worse')).toBeTruthy();
    expect(within(flagged).getByText('Materially worse')).toBeTruthy();
    expect(blocks[2]!.textContent).toContain('run the analysis again');
  });
});

describe('keeping the champion in some values for the challenger adopted', () => {
  const strategy = (challenger: number): MixedStrategyResult => {
    const book = { accepted: 700, bads: 50, approvalRate: 0.7, badRate: 0.0714 };
    const swaps = { ...book, swapIn: { count: 80, bads: 10, badRate: 0.125 }, swapOut: { count: 80, bads: 14, badRate: 0.175 } };
    return {
      runId: 40,
      approvalRate: 0.7,
      cutoffs: { champion: 590, challenger: 600 },
      keepChampion: [{ column: 'region', value: 'B' }],
      keptAccounts: 1000,
      accounts: 3000,
      champion: book,
      pure: swaps,
      mixed: swaps,
      bySegment: [],
      challenger,
      challengerName: report.challengers[challenger]!.name,
    };
  };

  it('offers the adopted challenger’s values with its own flags, previews and sends the strategy for it', async () => {
    api.answer('POST /api/comparisons/12/mixed-strategy', (body) => ({ status: 200, body: strategy((body as { challenger: number }).challenger) }));
    api.answer('POST /api/comparisons/12/decision', () => ({ status: 200, body: governanceAnswer({ state: 'decided' }) }));
    const onDone = vi.fn();
    const options = challengerOptions(report);
    renderWithQueries(
      <DecisionForm
        comparisonId={12}
        runId={40}
        quorumMet
        tally={{ adopt: 2, keep: 0, defer: 0 }}
        majority="adopt"
        segmentValues={keepableValues(report.segments)}
        recipients={['Ada Moreno']}
        onDone={onDone}
        challengers={options}
        adoptVotesByChallenger={[0, 2, 0]}
        segmentValuesByChallenger={options.map((option) => keepableValues(segmentsOf(report, option.index)))}
      />,
    );
    const person = user();
    await person.click(screen.getByLabelText(/^Adopt the challenger/));
    // No exceptions before a challenger is chosen.
    expect(screen.queryByText('Keep the champion in some segment values (optional)')).toBeNull();
    await person.click(screen.getByLabelText(/^CF-3 bureau/));
    expect(screen.getByLabelText('region = B')).toBeTruthy(); // not flagged for CF-3
    await person.click(screen.getByLabelText(/^CF-4 open banking/));
    expect(screen.getByText(/Adopt CF-4 open banking everywhere except the values ticked here/)).toBeTruthy();
    await person.click(screen.getByLabelText('region = B — flagged: the challenger is worse here'));
    expect(await screen.findByText(/The challenger “CF-4 open banking” \(challenger 2\) decides every account except those in region = B/)).toBeTruthy();
    expect(api.sent.find((request) => request.path === '/api/comparisons/12/mixed-strategy')!.body).toEqual({ keepChampion: [{ column: 'region', value: 'B' }], challenger: 1 });
    await person.type(screen.getByLabelText('Rationale'), 'CF-4 except region B.');
    await person.click(within(screen.getByRole('form', { name: 'Record the decision' })).getByRole('button', { name: 'Record the decision' }));
    const dialog = await screen.findByRole('dialog', { name: 'Record the committee’s decision?' });
    await person.click(within(dialog).getByRole('button', { name: 'Record the decision' }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    expect(api.sent.find((request) => request.path === '/api/comparisons/12/decision')!.body).toEqual({
      outcome: 'adopt',
      rationale: 'CF-4 except region B.',
      acknowledgeAgainstRecord: false,
      strategy: { keepChampion: [{ column: 'region', value: 'B' }], challenger: 1 },
      challenger: 1,
    });
  });
});

describe('the list with several challengers', () => {
  const record = { id: 1, runId: 2, policyVersion: 2, outcome: 'not-proven' as const, criteria: [], summary: '', createdAt: '2026-01-01T00:00:00.000Z', choiceSummary: '' };
  const challengers = ['CF-3 bureau', 'CF-4 open banking'].map((name, challenger) => ({ challenger, column: `c${challenger + 1}`, name, outcome: 'supported' as const, criteria: [], summary: '' }));
  it('names the recommended model of the record and, once decided, the model chosen', () => {
    expect(choiceLines({ verdict: { ...record, challengers, recommended: 1 }, decided: null })).toEqual(['Recommended: CF-4 open banking']);
    expect(choiceLines({ verdict: { ...record, challengers, recommended: null }, decided: null })).toEqual(['Recommended: none (the champion stays)']);
    expect(
      choiceLines({
        verdict: { ...record, challengers, recommended: 1 },
        decided: { outcome: 'adopt', chosen: { model: 'challenger', challenger: 0, column: 'c1', name: 'CF-3 bureau' } },
      }),
    ).toEqual(['Recommended: CF-4 open banking', 'Adopted: CF-3 bureau']);
    expect(choiceLines({ verdict: { ...record, challengers, recommended: 1 }, decided: { outcome: 'keep', chosen: { model: 'champion', challenger: null, column: 'champion', name: 'AS-19' } } })).toEqual([
      'Recommended: CF-4 open banking',
      'Decided: keep the champion',
    ]);
    // One challenger: nothing new in the list.
    expect(choiceLines({ verdict: { ...record, challengers: [], recommended: null }, decided: null })).toEqual([]);
  });
});

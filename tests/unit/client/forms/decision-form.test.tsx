/** @vitest-environment jsdom */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { type MixedStrategyResult } from '@shared/mixed-strategy';
import { DecisionForm } from '@/features/governance/components/decision-form';
import { type KeepableValue } from '@/features/governance/components/keep-champion';
import { CSRF_TOKEN, apiError, governanceAnswer, renderWithQueries, useFakeApi } from './render';

/**
 * The committee's decision form as a member uses it: the tally beside each choice, the caution
 * when the choice goes against the votes or the quorum is not met, the checks before sending, the
 * confirmation that says what happens and who is told (Cancel sends nothing), the segment values
 * kept on the champion with the server's preview, and the body the server receives.
 */

const api = useFakeApi();
const decide = 'POST /api/comparisons/12/decision';
const preview = 'POST /api/comparisons/12/mixed-strategy';
const twoForAdopt = { adopt: 2, keep: 0, defer: 1 };
const segmentValues: KeepableValue[] = [
  { column: 'product', value: 'credit-card', flagged: true },
  { column: 'product', value: 'personal-loan', flagged: false },
  { column: 'channel', value: 'broker', flagged: false },
];

function renderForm(props: Partial<Parameters<typeof DecisionForm>[0]> = {}) {
  const onDone = vi.fn();
  renderWithQueries(
    <DecisionForm
      comparisonId={12}
      runId={40}
      quorumMet
      tally={twoForAdopt}
      majority="adopt"
      segmentValues={segmentValues}
      recipients={['Ada Moreno', 'Ben Osei']}
      onDone={onDone}
      {...props}
    />,
  );
  return { onDone, user: userEvent.setup({ delay: null }) };
}

// The form's own button; the dialog's confirm button has the same words.
const submit = () => within(screen.getByRole('form', { name: 'Record the decision' })).getByRole('button', { name: 'Record the decision' });
const confirmDialog = () => screen.findByRole('dialog', { name: 'Record the committee’s decision?' });

const book = (approvalRate: number, badRate: number) => ({ accepted: approvalRate * 60_000, bads: approvalRate * 60_000 * badRate, approvalRate, badRate });
const swaps = (swapIn: number, swapOut: number) => ({
  swapIn: { count: swapIn, bads: swapIn * 0.05, badRate: 0.05 },
  swapOut: { count: swapOut, bads: swapOut * 0.12, badRate: 0.12 },
});

/** The server's figures for keeping the champion on credit cards (invented, shaped by the shared schema). */
const creditCardsKept: MixedStrategyResult = {
  runId: 40,
  approvalRate: 0.7,
  cutoffs: { champion: 588, challenger: 0.064 },
  keepChampion: [{ column: 'product', value: 'credit-card' }],
  keptAccounts: 18_250,
  accounts: 60_000,
  champion: book(0.7, 0.061),
  pure: { ...book(0.7, 0.052), ...swaps(4_100, 4_100) },
  mixed: { ...book(0.7, 0.055), ...swaps(2_930, 2_930) },
  bySegment: [],
};

describe('the decision form', () => {
  it('shows each choice with its votes and the majority', () => {
    renderForm();
    expect(screen.getByLabelText('Adopt the challenger — 2 votes (majority)')).toBeTruthy();
    expect(screen.getByLabelText('Keep the champion — 0 votes')).toBeTruthy();
    expect(screen.getByLabelText('Defer — 1 vote')).toBeTruthy();
  });

  it('asks for a decision and a rationale before anything is confirmed or sent', async () => {
    const { user } = renderForm();
    await user.click(submit());
    expect(await screen.findByText('Choose the decision')).toBeTruthy();
    expect(screen.getByText('Record the rationale')).toBeTruthy();
    // A rationale of spaces only is none (the shared schema trims).
    await user.click(screen.getByLabelText(/^Adopt the challenger/));
    await user.type(screen.getByLabelText('Rationale'), '   ');
    await user.click(submit());
    expect(await screen.findByText('Record the rationale')).toBeTruthy();
    expect(screen.queryByText('Choose the decision')).toBeNull();
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(api.sent).toEqual([]);
  });

  it('asks before recording, says who is told, and Cancel sends nothing', async () => {
    const { onDone, user } = renderForm();
    await user.click(screen.getByLabelText(/^Adopt the challenger/));
    await user.type(screen.getByLabelText('Rationale'), 'The uplift holds.');
    await user.type(screen.getByLabelText(/^Effective from/), '2027-01-04');
    await user.click(submit());
    const dialog = await confirmDialog();
    expect(within(dialog).getByText(/is recorded with its rationale, applying from 2027-01-04\. The comparison becomes decided/)).toBeTruthy();
    expect(within(dialog).getByText('“Adopt the challenger”')).toBeTruthy();
    expect(within(dialog).getByText(/Ada Moreno and Ben Osei/)).toBeTruthy();
    await user.click(within(dialog).getByRole('button', { name: 'Cancel' }));
    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    expect(api.sent).toEqual([]);
    expect(onDone).not.toHaveBeenCalled();
    expect((screen.getByLabelText('Rationale') as HTMLTextAreaElement).value).toBe('The uplift holds.');
  });

  it('with the majority and the quorum: no caution, and Confirm sends the decision without the empty optional fields', async () => {
    api.answer(decide, () => ({ status: 200, body: governanceAnswer({ state: 'decided' }) }));
    const { onDone, user } = renderForm();
    await user.click(screen.getByLabelText(/^Adopt the challenger/));
    expect(screen.queryByText('This decision goes against the record')).toBeNull();
    await user.type(screen.getByLabelText('Rationale'), '  The uplift holds.  ');
    await user.click(submit());
    const dialog = await confirmDialog();
    expect(within(dialog).queryByText(/It goes against the record/)).toBeNull();
    expect(api.sent).toEqual([]);
    await user.click(within(dialog).getByRole('button', { name: 'Record the decision' }));
    await waitFor(() => expect(onDone).toHaveBeenCalledWith('The decision is recorded. Ada Moreno and Ben Osei have been told by e-mail.'));
    expect(api.sent).toEqual([{ method: 'POST', path: '/api/comparisons/12/decision', csrf: CSRF_TOKEN, body: { outcome: 'adopt', rationale: 'The uplift holds.', acknowledgeAgainstRecord: false } }]);
  });

  it('against the majority: names the majority, asks for the acknowledgement, and sends it with the conditions and date', async () => {
    api.answer(decide, () => ({ status: 200, body: governanceAnswer({ state: 'decided' }) }));
    const { onDone, user } = renderForm({ recipients: ['Ada Moreno'] });
    await user.click(screen.getByLabelText(/^Keep the champion/));
    expect(screen.getByText('This decision goes against the record')).toBeTruthy();
    expect(screen.getByText(/The majority voted “Adopt the challenger”\..*at least 80 characters/)).toBeTruthy();
    // Segment values to keep are for an adoption only.
    expect(screen.queryByLabelText(/^product = credit-card/)).toBeNull();
    await user.click(screen.getByLabelText(/^I record this decision against the votes/));
    await user.type(screen.getByLabelText('Rationale'), 'The swap-in bad rate is not yet observed over a full year.');
    await user.type(screen.getByLabelText(/^Conditions/), 'Review again in six months.');
    await user.type(screen.getByLabelText(/^Effective from/), '2027-01-04');
    await user.click(submit());
    const dialog = await confirmDialog();
    expect(within(dialog).getByText('It goes against the record (votes or quorum); your acknowledgement is stored with it.')).toBeTruthy();
    await user.click(within(dialog).getByRole('button', { name: 'Record the decision' }));
    await waitFor(() => expect(onDone).toHaveBeenCalledWith('The decision is recorded. Ada Moreno has been told by e-mail.'));
    expect(api.sent.map((request) => request.body)).toEqual([
      {
        outcome: 'keep',
        rationale: 'The swap-in bad rate is not yet observed over a full year.',
        conditions: 'Review again in six months.',
        effectiveDate: '2027-01-04',
        acknowledgeAgainstRecord: true,
      },
    ]);
  });

  it('without the quorum: says so for every choice, even the majority', async () => {
    const { user } = renderForm({ quorumMet: false, tally: { adopt: 1, keep: 0, defer: 0 } });
    expect(screen.getByText(/The quorum of votes is not met: a decision now needs the acknowledgement above/)).toBeTruthy();
    await user.click(screen.getByLabelText(/^Adopt the challenger/));
    expect(screen.getByText('This decision goes against the record')).toBeTruthy();
    expect(screen.getByText(/^The quorum of votes is not met\. /)).toBeTruthy();
  });

  it('adopting with exceptions: the ticked values are previewed by the server and sent as the strategy', async () => {
    const previews: unknown[] = [];
    api.answer(preview, (body) => {
      previews.push(body);
      return { status: 200, body: creditCardsKept };
    });
    api.answer(decide, () => ({ status: 200, body: governanceAnswer({ state: 'decided' }) }));
    const { onDone, user } = renderForm();
    expect(screen.queryByLabelText(/^product = credit-card/)).toBeNull();
    await user.click(screen.getByLabelText(/^Adopt the challenger/));
    expect(screen.getByLabelText('product = credit-card — flagged: the challenger is worse here')).toBeTruthy();
    expect(screen.getByLabelText('channel = broker')).toBeTruthy();
    // Nothing ticked: no preview asked for.
    expect(api.sent).toEqual([]);
    await user.click(screen.getByLabelText(/^product = credit-card/));
    expect(await screen.findByText(/^The challenger decides every account except those in product = credit-card \(18,250 accounts\)/)).toBeTruthy();
    expect(screen.getByText('Preview: the mixed strategy beside the champion and pure adoption')).toBeTruthy();
    expect(previews).toEqual([{ keepChampion: [{ column: 'product', value: 'credit-card' }] }]);
    expect(api.sent[0]).toMatchObject({ method: 'POST', path: '/api/comparisons/12/mixed-strategy', csrf: CSRF_TOKEN });
    // Ticking and unticking another value changes what is asked and sent.
    await user.click(screen.getByLabelText('channel = broker'));
    await waitFor(() => expect(previews).toHaveLength(2));
    expect(previews[1]).toEqual({ keepChampion: [{ column: 'product', value: 'credit-card' }, { column: 'channel', value: 'broker' }] });
    await user.click(screen.getByLabelText('channel = broker'));
    await user.type(screen.getByLabelText('Rationale'), 'The uplift holds except on credit cards.');
    await user.click(submit());
    const dialog = await confirmDialog();
    expect(within(dialog).getByText(/except in product = credit-card, where the champion is kept, is recorded/)).toBeTruthy();
    await user.click(within(dialog).getByRole('button', { name: 'Record the decision' }));
    await waitFor(() => expect(onDone).toHaveBeenCalled());
    const decisions = api.sent.filter((request) => request.path === '/api/comparisons/12/decision');
    expect(decisions).toEqual([
      {
        method: 'POST',
        path: '/api/comparisons/12/decision',
        csrf: CSRF_TOKEN,
        body: {
          outcome: 'adopt',
          rationale: 'The uplift holds except on credit cards.',
          acknowledgeAgainstRecord: false,
          strategy: { keepChampion: [{ column: 'product', value: 'credit-card' }] },
        },
      },
    ]);
  });

  it("shows the server's refusal and keeps what was typed", async () => {
    api.answer(decide, () => apiError(409, 'conflict', 'The quorum of 2 votes is not met.'));
    const { onDone, user } = renderForm();
    await user.click(screen.getByLabelText(/^Adopt the challenger/));
    await user.type(screen.getByLabelText('Rationale'), 'The uplift holds.');
    await user.click(submit());
    await user.click(within(await confirmDialog()).getByRole('button', { name: 'Record the decision' }));
    expect(await screen.findByText('The decision was not recorded')).toBeTruthy();
    expect(screen.getByText('The quorum of 2 votes is not met.')).toBeTruthy();
    expect(screen.queryByRole('dialog')).toBeNull();
    expect((screen.getByLabelText('Rationale') as HTMLTextAreaElement).value).toBe('The uplift holds.');
    expect(onDone).not.toHaveBeenCalled();
  });
});

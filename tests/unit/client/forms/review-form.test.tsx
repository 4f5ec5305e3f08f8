/** @vitest-environment jsdom */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { ReviewForm } from '@/features/governance/components/review-form';
import { CSRF_TOKEN, apiError, governanceAnswer, renderWithQueries, useFakeApi } from './render';

/**
 * The analyst's review form as a person uses it: what they type and choose, what they see, the
 * confirmation that says what happens and who is told (Cancel sends nothing), and what is sent.
 */

const api = useFakeApi();
const review = 'POST /api/comparisons/7/review';

function renderForm() {
  const onDone = vi.fn();
  renderWithQueries(<ReviewForm comparisonId={7} creator="Ada Moreno" onDone={onDone} />);
  return { onDone, user: userEvent.setup({ delay: null }) };
}

const submit = () => screen.getByRole('button', { name: 'Record the review' });

describe('the review form', () => {
  it('asks for findings and an outcome before anything is sent or confirmed', async () => {
    const { user } = renderForm();
    await user.click(submit());
    expect(await screen.findByText('Write your findings')).toBeTruthy();
    expect(screen.getByText('Choose validate or return')).toBeTruthy();
    expect(screen.getByLabelText('Findings').getAttribute('aria-invalid')).toBe('true');
    // Spaces only are no findings (the shared schema trims).
    await user.type(screen.getByLabelText('Findings'), '   ');
    await user.click(submit());
    expect(await screen.findByText('Write your findings')).toBeTruthy();
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(api.sent).toEqual([]);
  });

  it('asks before returning, names the creator who is told, and Cancel sends nothing', async () => {
    const { onDone, user } = renderForm();
    await user.type(screen.getByLabelText('Findings'), 'The brokered cards segment needs a second look.');
    await user.click(screen.getByLabelText(/^Return to the modeler/));
    await user.click(submit());
    const dialog = await screen.findByRole('dialog', { name: 'Return this comparison to the modeler?' });
    expect(within(dialog).getByText(/goes back to the modeler: it needs a new set-up and analysis/)).toBeTruthy();
    expect(within(dialog).getByText('Ada Moreno, who created the comparison')).toBeTruthy();
    await user.click(within(dialog).getByRole('button', { name: 'Cancel' }));
    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    expect(api.sent).toEqual([]);
    expect(onDone).not.toHaveBeenCalled();
    // What was typed stays for a second try.
    expect((screen.getByLabelText('Findings') as HTMLTextAreaElement).value).toBe('The brokered cards segment needs a second look.');
  });

  it('on Confirm sends the findings and the outcome with the CSRF token, and says who was told', async () => {
    api.answer(review, () => ({ status: 200, body: governanceAnswer({ state: 'returned' }) }));
    const { onDone, user } = renderForm();
    await user.type(screen.getByLabelText('Findings'), '  The brokered cards segment needs a second look.  ');
    await user.click(screen.getByLabelText(/^Return to the modeler/));
    await user.click(submit());
    const dialog = await screen.findByRole('dialog', { name: 'Return this comparison to the modeler?' });
    expect(api.sent).toEqual([]);
    await user.click(within(dialog).getByRole('button', { name: 'Return to the modeler' }));
    await waitFor(() => expect(onDone).toHaveBeenCalledWith('Returned to the modeler; Ada Moreno has been told by e-mail.'));
    expect(api.sent).toEqual([{ method: 'POST', path: '/api/comparisons/7/review', csrf: CSRF_TOKEN, body: { outcome: 'returned', findings: 'The brokered cards segment needs a second look.' } }]);
    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
  });

  it('validating: the dialog says the committee is told, and Validate sends it', async () => {
    api.answer(review, () => ({ status: 200, body: governanceAnswer({ state: 'validated' }) }));
    const { onDone, user } = renderForm();
    await user.type(screen.getByLabelText('Findings'), 'The uplift and its interval hold on every segment.');
    await user.click(screen.getByLabelText(/^Validate/));
    await user.click(submit());
    const dialog = await screen.findByRole('dialog', { name: 'Validate this comparison?' });
    expect(within(dialog).getByText(/every active committee member who did not shape the comparison/)).toBeTruthy();
    await user.click(within(dialog).getByRole('button', { name: 'Validate' }));
    await waitFor(() => expect(onDone).toHaveBeenCalledWith('Validated. The committee members have been told by e-mail.'));
    expect(api.sent.map((request) => request.body)).toEqual([{ outcome: 'validated', findings: 'The uplift and its interval hold on every segment.' }]);
  });

  it("shows the server's refusal above the form and its field message under the field", async () => {
    api.answer(review, () =>
      apiError(400, 'validation_failed', 'Check the highlighted fields.', [{ path: ['findings'], message: 'Findings are too long for the record' }]),
    );
    const { onDone, user } = renderForm();
    await user.type(screen.getByLabelText('Findings'), 'Fine.');
    await user.click(screen.getByLabelText(/^Validate/));
    await user.click(submit());
    await user.click(within(await screen.findByRole('dialog')).getByRole('button', { name: 'Validate' }));
    expect(await screen.findByText('The review was not recorded')).toBeTruthy();
    expect(screen.getByText('Check the highlighted fields.')).toBeTruthy();
    expect(screen.getByText('Findings are too long for the record')).toBeTruthy();
    expect(screen.queryByRole('dialog')).toBeNull();
    expect(onDone).not.toHaveBeenCalled();
    expect(api.sent.map((request) => request.body)).toEqual([{ outcome: 'validated', findings: 'Fine.' }]);
  });
});

/** @vitest-environment jsdom */
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { AnalysisSettingsForm, settingsDefaults } from '@/features/comparisons/components/analysis-settings-form';
import { renderWithQueries } from './render';

/** The analysis settings step as a modeler uses it: the defaults shown, the limits in words, what is handed on. */

function renderForm(props: Partial<Parameters<typeof AnalysisSettingsForm>[0]> = {}) {
  const onSubmit = vi.fn();
  const onBack = vi.fn();
  renderWithQueries(<AnalysisSettingsForm initial={settingsDefaults} onBack={onBack} onSubmit={onSubmit} {...props} />);
  return { onSubmit, onBack, user: userEvent.setup({ delay: null }) };
}

const field = (label: RegExp | string) => screen.getByLabelText(label) as HTMLInputElement;
const run = () => screen.getByRole('button', { name: 'Run the analysis' });

describe('the analysis settings form', () => {
  it('shows the defaults, the approval rate as a percentage, and hands them on unchanged', async () => {
    const { onSubmit, user } = renderForm();
    expect(field('Bootstrap replicates').value).toBe('2000');
    expect(field('Random seed').value).toBe('1');
    expect((screen.getByLabelText('Confidence of every interval') as HTMLSelectElement).value).toBe('0.95');
    expect(field('Approval rate for the swap sets (%)').value).toBe('70');
    // Without applicants of unknown outcome there is nothing to ask about reject inference.
    expect(screen.queryByText('Reject inference')).toBeNull();
    await user.click(run());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0]).toEqual({ bootstrap: 2000, seed: 1, confidence: 0.95, approvalRate: 0.7, rejectInference: { method: 'known-only', parcelFactor: 1 } });
  });

  it('names each limit in words and hands nothing on while one is broken', async () => {
    const { onSubmit, user } = renderForm();
    await user.clear(field('Bootstrap replicates'));
    await user.type(field('Bootstrap replicates'), '50000');
    await user.clear(field('Random seed'));
    await user.type(field('Random seed'), '1.5');
    await user.clear(field('Approval rate for the swap sets (%)'));
    await user.type(field('Approval rate for the swap sets (%)'), '100');
    await user.click(run());
    expect(await screen.findByText('Enter a whole number from 0 to 20,000')).toBeTruthy();
    expect(screen.getByText('Enter a whole number from 0 to 2,147,483,647')).toBeTruthy();
    expect(screen.getByText('Enter a percentage above 0 and below 100')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    // An empty rate is not a rate either.
    await user.clear(field('Approval rate for the swap sets (%)'));
    await user.clear(field('Bootstrap replicates'));
    await user.type(field('Bootstrap replicates'), '500');
    await user.clear(field('Random seed'));
    await user.type(field('Random seed'), '7');
    await user.click(run());
    expect(await screen.findByText('Enter a percentage above 0 and below 100')).toBeTruthy();
    expect(screen.queryByText('Enter a whole number from 0 to 20,000')).toBeNull();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('hands on what was typed: replicates, seed, confidence and the rate as a fraction', async () => {
    const { onSubmit, user } = renderForm();
    await user.clear(field('Bootstrap replicates'));
    await user.type(field('Bootstrap replicates'), '0');
    await user.clear(field('Random seed'));
    await user.type(field('Random seed'), '42');
    await user.selectOptions(screen.getByLabelText('Confidence of every interval'), '99%');
    await user.clear(field('Approval rate for the swap sets (%)'));
    await user.type(field('Approval rate for the swap sets (%)'), '62.5');
    await user.click(run());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ bootstrap: 0, seed: 42, confidence: 0.99, approvalRate: 0.625 });
  });

  it('with applicants of unknown outcome: asks how their bad rate is stated, the parcel factor only for parcelling', async () => {
    const { onSubmit, user } = renderForm({ withUnknown: true });
    const method = screen.getByLabelText("How to state the unknown applicants' bad rate") as HTMLSelectElement;
    // The inferred-bad column is offered only when the mapping names one.
    expect([...method.options].map((option) => option.value)).toEqual(['known-only', 'parcel']);
    expect(screen.queryByLabelText('Parcel factor')).toBeNull();
    await user.selectOptions(method, 'parcel');
    await user.clear(field('Parcel factor'));
    await user.type(field('Parcel factor'), '25');
    await user.click(run());
    expect(await screen.findByText('Enter a parcel factor above 0 and at most 20')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    await user.clear(field('Parcel factor'));
    await user.type(field('Parcel factor'), '3');
    await user.click(run());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ rejectInference: { method: 'parcel', parcelFactor: 3 } });
  });

  it('offers the inferred-bad column when the mapping has one; Back goes back without handing anything on', async () => {
    const { onSubmit, onBack, user } = renderForm({ withUnknown: true, withInferredColumn: true });
    const method = screen.getByLabelText("How to state the unknown applicants' bad rate") as HTMLSelectElement;
    expect([...method.options].map((option) => option.value)).toEqual(['known-only', 'parcel', 'column']);
    await user.click(screen.getByRole('button', { name: 'Back to the check' }));
    expect(onBack).toHaveBeenCalledTimes(1);
    expect(onSubmit).not.toHaveBeenCalled();
  });
});

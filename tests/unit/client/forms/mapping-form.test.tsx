/** @vitest-environment jsdom */
import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { type HoldoutInfo } from '@shared/comparisons';
import { MappingForm } from '@/features/holdouts/components/mapping-form';
import { pdGuess, pdGuessMapping } from '../pd-holdout';
import { renderWithQueries } from './render';

/**
 * The column-mapping step as a modeler uses it: it starts from the reader's guess, shows the hint
 * from the data beside each score, refuses a column given two roles, and hands the shared
 * ColumnMapping on.
 */

const holdout: HoldoutInfo = {
  id: 3,
  fileName: 'tallowmere-holdout-2025-pd.csv',
  sha256: '0'.repeat(64),
  bytes: 4_773_212,
  rowCount: 60_000,
  // A CSV file: no worksheet.
  sheet: null,
  columns: [
    { name: 'account_id', kind: 'text', distinct: 60_000, missing: 0 },
    { name: 'bad_12m', kind: 'numeric', distinct: 2, missing: 0 },
    { name: 'champion_points', kind: 'numeric', distinct: 412, missing: 0 },
    { name: 'challenger_pd', kind: 'numeric', distinct: 59_881, missing: 0 },
    { name: 'product', kind: 'categorical', distinct: 3, missing: 0 },
    { name: 'channel', kind: 'categorical', distinct: 3, missing: 0 },
    { name: 'loan_amount', kind: 'numeric', distinct: 5_210, missing: 0 },
  ],
  preview: [
    ['A-000001', '0', '612', '0.031', 'personal-loan', 'branch', '5000'],
    ['A-000002', '1', '540', '0.142', 'credit-card', 'broker', '1500'],
  ],
  guess: pdGuess,

  uploadedBy: { id: 1, name: 'Ada Moreno' },
  uploadedAt: '2026-11-30T09:00:00.000Z',
};

function renderForm() {
  const onSubmit = vi.fn();
  const onRolesChange = vi.fn();
  renderWithQueries(<MappingForm holdout={holdout} initial={null} initialDropMissing={false} onSubmit={onSubmit} onRolesChange={onRolesChange} />);
  return { onSubmit, onRolesChange, user: userEvent.setup({ delay: null }) };
}

const select = (label: RegExp | string) => screen.getByLabelText(label) as HTMLSelectElement;
const check = () => screen.getByRole('button', { name: 'Check the data' });

describe('the column-mapping form', () => {
  it("starts from the reader's guess, shows the data's hints, and hands the guess on as the shared mapping", async () => {
    const { onSubmit, onRolesChange, user } = renderForm();
    expect(select('Outcome column').value).toBe('bad_12m');
    expect(select('Value that means bad').value).toBe('1');
    expect(select('Champion score column').value).toBe('champion_points');
    expect(select('Challenger score column').value).toBe('challenger_pd');
    expect(screen.getByText('From the data: bads have lower scores.')).toBeTruthy();
    expect(screen.getByText('From the data: bads have higher scores.')).toBeTruthy();
    expect((screen.getByLabelText('product') as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText('channel') as HTMLInputElement).checked).toBe(false);
    // The exposure offers numeric columns only.
    expect([...select(/^Exposure or amount/).options].map((option) => option.value)).toEqual(['', 'bad_12m', 'champion_points', 'challenger_pd', 'loan_amount']);
    expect(onRolesChange).toHaveBeenLastCalledWith({ bad_12m: 'Outcome', champion_points: 'Champion', challenger_pd: 'Challenger', account_id: 'Account id', product: 'Segment' });
    await user.click(check());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit).toHaveBeenCalledWith(pdGuessMapping, false);
  });

  it('refuses a column given two roles and a missing outcome, in words under each field', async () => {
    const { onSubmit, user } = renderForm();
    await user.selectOptions(select('Challenger score column'), 'champion_points');
    await user.selectOptions(select('Outcome column'), '');
    await user.click(check());
    expect(await screen.findByText('"champion_points" is already the champion\'s score')).toBeTruthy();
    expect(screen.getByText('Choose the outcome column')).toBeTruthy();
    expect(select('Challenger score column').getAttribute('aria-invalid')).toBe('true');
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('warns when the chosen orientation goes against the data, and refuses a PD that is higher = safer', async () => {
    const { onSubmit, user } = renderForm();
    expect(screen.queryByText('The data point the other way')).toBeNull();
    // The champion's radios come first.
    await user.click(screen.getAllByLabelText('Higher is riskier')[0]!);
    expect(screen.getByText('The data point the other way')).toBeTruthy();
    expect(screen.getByText(/You chose higher is riskier, but the data suggest higher is safer/)).toBeTruthy();
    await user.click(screen.getAllByLabelText('Higher is safer')[0]!);
    expect(screen.queryByText('The data point the other way')).toBeNull();
    await user.click(screen.getAllByLabelText('This score is a probability of default')[0]!);
    await user.click(check());
    expect(await screen.findByText('A probability of default is higher = riskier: change the orientation or clear this box')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('hands on the optional columns, segments, applicants without an outcome and leaving out empty scores', async () => {
    const { onSubmit, onRolesChange, user } = renderForm();
    await user.selectOptions(select(/^Exposure or amount/), 'loan_amount');
    await user.click(screen.getByLabelText('channel'));
    await user.click(screen.getByLabelText('product'));
    await user.click(screen.getByLabelText('Leave out rows with an empty score'));
    expect(screen.queryByLabelText(/^Values that also mean no outcome/)).toBeNull();
    await user.click(screen.getByLabelText('Keep applicants without an outcome'));
    await user.type(screen.getByLabelText(/^Values that also mean no outcome/), 'R, reject');
    await waitFor(() => expect(onRolesChange).toHaveBeenLastCalledWith(expect.objectContaining({ loan_amount: 'Exposure', channel: 'Segment' })));
    await user.click(check());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const [mapping, dropMissing] = onSubmit.mock.calls[0]!;
    expect(mapping).toMatchObject({ exposure: 'loan_amount', segments: ['channel'], keepUnknown: true, unknownValues: ['R', 'reject'], inferredBad: null });
    expect(dropMissing).toBe(true);
  });
});

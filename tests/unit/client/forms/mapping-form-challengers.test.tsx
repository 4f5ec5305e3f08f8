/** @vitest-environment jsdom */
import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { type HoldoutInfo } from '@shared/comparisons';
import { mappingModelProblems } from '@shared/report';
import { MappingForm } from '@/features/holdouts/components/mapping-form';
import { toColumnMapping, mappingFormDefaults } from '@/features/holdouts/lib/mapping';
import { pdGuess, pdGuessMapping } from '../pd-holdout';
import { renderWithQueries } from './render';

/**
 * The mapping form with several challengers: named models, up to five challengers each with its
 * own orientation, the shared rule on the models (mappingModelProblems) said at the field of the
 * model that breaks it, and the shared mapping handed on (a two-model mapping unchanged).
 */

const holdout: HoldoutInfo = {
  id: 4,
  fileName: 'tallowmere-holdout-2025-three.csv',
  sha256: '0'.repeat(64),
  bytes: 5_000_000,
  rowCount: 60_000,
  sheet: null,
  columns: [
    { name: 'account_id', kind: 'text', distinct: 60_000, missing: 0 },
    { name: 'bad_12m', kind: 'numeric', distinct: 2, missing: 0 },
    { name: 'champion_points', kind: 'numeric', distinct: 412, missing: 0 },
    { name: 'challenger_pd', kind: 'numeric', distinct: 59_881, missing: 0 },
    { name: 'open_banking_points', kind: 'numeric', distinct: 500, missing: 0 },
    { name: 'refit_points', kind: 'numeric', distinct: 450, missing: 0 },
    { name: 'product', kind: 'categorical', distinct: 3, missing: 0 },
  ],
  preview: [
    ['A-000001', '0', '612', '0.031', '640', '615', 'personal-loan'],
    ['A-000002', '1', '540', '0.142', '520', '538', 'credit-card'],
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

const field = (label: RegExp | string) => screen.getByLabelText(label) as HTMLInputElement & HTMLSelectElement;
const check = () => screen.getByRole('button', { name: 'Check the data' });
const add = () => screen.getByRole('button', { name: 'Add a challenger' });

describe('the mapping form with several challengers', () => {
  it('names the models and adds two challengers with their own orientation; the shared mapping carries them in order', async () => {
    const { onSubmit, onRolesChange, user } = renderForm();
    await user.type(field(/^Champion name/), 'CF-2 scorecard');
    await user.type(field(/^Challenger name/), 'CF-3 bureau');
    await user.click(add());
    await user.click(add());
    await user.selectOptions(field('Challenger 2 score column'), 'open_banking_points');
    await user.type(field(/^Challenger 2 name/), 'CF-4 open banking');
    await user.selectOptions(field('Challenger 3 score column'), 'refit_points');
    // No name: the column name is used.
    const third = within(screen.getByTestId('challenger-3'));
    await user.click(third.getByLabelText('Higher is safer'));
    await waitFor(() =>
      expect(onRolesChange).toHaveBeenLastCalledWith(expect.objectContaining({ open_banking_points: 'Challenger 2', refit_points: 'Challenger 3', challenger_pd: 'Challenger' })),
    );
    await user.click(check());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const [mapping] = onSubmit.mock.calls[0]!;
    expect(mapping).toEqual({
      ...pdGuessMapping,
      championName: 'CF-2 scorecard',
      challengerName: 'CF-3 bureau',
      moreChallengers: [
        { column: 'open_banking_points', higherIs: 'safer', name: 'CF-4 open banking' },
        { column: 'refit_points', higherIs: 'safer' },
      ],
    });
    expect(mappingModelProblems(mapping)).toEqual([]);
  });

  it('says the shared rule at the field: a score column used twice and a name given twice', async () => {
    const { onSubmit, user } = renderForm();
    await user.type(field(/^Champion name/), 'CF-2');
    await user.click(add());
    await user.click(add());
    await user.selectOptions(field('Challenger 2 score column'), 'challenger_pd');
    await user.selectOptions(field('Challenger 3 score column'), 'refit_points');
    await user.type(field(/^Challenger 3 name/), 'cf-2 ');
    await user.click(check());
    // The sentences of mappingModelProblems, as the API would refuse the mapping.
    expect(await screen.findByText('Column "challenger_pd" is both the primary challenger and challenger 2; each model needs its own score column.')).toBeTruthy();
    expect(screen.getByText('The name "cf-2" is given to both the champion and challenger 3; give each model its own name.')).toBeTruthy();
    expect(field('Challenger 2 score column').getAttribute('aria-invalid')).toBe('true');
    expect(field(/^Challenger 3 name/).getAttribute('aria-invalid')).toBe('true');
    expect(field('Challenger 3 score column').getAttribute('aria-invalid')).toBeNull();
    expect(onSubmit).not.toHaveBeenCalled();
    // Removing the duplicate and renaming: the mapping goes.
    await user.click(screen.getByRole('button', { name: 'Remove challenger 2' }));
    await user.clear(field(/^Challenger 2 name/));
    await user.type(field(/^Challenger 2 name/), 'Refit 2025');
    await user.click(check());
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0].moreChallengers).toEqual([{ column: 'refit_points', higherIs: 'safer', name: 'Refit 2025' }]);
  });

  it('needs a column for every challenger added, refuses another role\'s column and stops adding at five challengers', async () => {
    const { onSubmit, user } = renderForm();
    await user.click(add());
    await user.click(check());
    expect(await screen.findByText("Choose this challenger's score column")).toBeTruthy();
    await user.selectOptions(field('Challenger 2 score column'), 'bad_12m');
    await user.click(check());
    expect(await screen.findByText('"bad_12m" is already the outcome')).toBeTruthy();
    for (let more = 0; more < 3; more += 1) await user.click(add());
    expect(screen.queryByRole('button', { name: 'Add a challenger' })).toBeNull();
    expect(screen.getByText('A comparison holds at most 5 challengers.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('a two-model mapping round-trips unchanged; a named one keeps its names and challengers', () => {
    expect(toColumnMapping(mappingFormDefaults(pdGuess))).toEqual(pdGuessMapping);
    const named = {
      ...pdGuessMapping,
      segments: [...pdGuessMapping.segments],
      championName: 'CF-2 scorecard',
      moreChallengers: [{ column: 'refit_points', higherIs: 'safer' as const, name: 'Refit' }],
    };
    expect(toColumnMapping(mappingFormDefaults(pdGuess, named))).toEqual(named);
  });
});

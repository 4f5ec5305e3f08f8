import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { type Scenario, type SwapQuery, scenarioInputSchema } from '@shared/comparisons';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { formatPercent, formatScore } from '@/lib/format';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Dialog } from '@/components/dialog';
import { FieldError, FieldHint, FieldLabel, controlClasses, describedBy, useFieldIds } from '@/components/field';
import { TextField } from '@/components/text-field';
import { useCreateScenario } from '@/features/swap-sets/api/create-scenario';

type SaveScenarioDialogProps = {
  open: boolean;
  onClose: () => void;
  comparisonId: number;
  /** The settings being saved. */
  query: SwapQuery;
  /** The cut-offs those settings reach (shown, and saved with an approval rate too). */
  cutoffs: { champion: number; challenger: number };
  onSaved: (scenario: Scenario) => void;
};

/** Saves the current cut-offs or approval rate as a named scenario with a note (policy role). */
export function SaveScenarioDialog(props: SaveScenarioDialogProps) {
  return (
    <Dialog open={props.open} onClose={props.onClose} title="Save as a scenario" description="A named setting the committee and analysts can come back to, with its swap-in and swap-out.">
      <ScenarioForm {...props} />
    </Dialog>
  );
}

function ScenarioForm({ onClose, comparisonId, query, cutoffs, onSaved }: SaveScenarioDialogProps) {
  const create = useCreateScenario();
  const note = useFieldIds();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(scenarioInputSchema),
    defaultValues: {
      name: '',
      note: '',
      cutoffs: query.cutoffs ?? null,
      approvalRate: query.approvalRate ?? null,
    },
  });
  const onSubmit = handleSubmit((values) =>
    create.mutate(
      { id: comparisonId, ...values },
      { onSuccess: (scenario) => onSaved(scenario), onError: (error) => applyServerFieldErrors(error, setError, ['name', 'note']) },
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {create.isError ? (
        <Alert tone="error" title="The scenario was not saved">
          <p>{errorMessage(create.error)}</p>
        </Alert>
      ) : null}
      <p className="rounded-md bg-paper px-3 py-2 text-sm text-ink-soft">
        {query.approvalRate !== undefined ? `Approval rate ${formatPercent(query.approvalRate)}: ` : 'Cut-offs: '}
        champion <span className="num font-medium text-ink">{formatScore(cutoffs.champion)}</span>, challenger{' '}
        <span className="num font-medium text-ink">{formatScore(cutoffs.challenger)}</span>.
      </p>
      <TextField label="Name" hint="e.g. “70% approval, current appetite”" autoComplete="off" error={errors.name?.message} {...register('name')} />
      <div className="space-y-1.5">
        <FieldLabel htmlFor={note.controlId} optional>
          Note
        </FieldLabel>
        <FieldHint id={note.hintId}>Why this setting: risk appetite, volume targets, what to watch.</FieldHint>
        <textarea
          id={note.controlId}
          rows={4}
          aria-invalid={errors.note ? true : undefined}
          aria-describedby={describedBy(note, true, errors.note?.message)}
          className={`${controlClasses} py-2`}
          {...register('note')}
        />
        <FieldError id={note.errorId}>{errors.note?.message}</FieldError>
      </div>
      <div className="flex justify-end gap-2 border-t border-line pt-4">
        <Button onClick={onClose} disabled={create.isPending}>
          Cancel
        </Button>
        <Button type="submit" variant="primary" loading={create.isPending} loadingText="Saving…">
          Save the scenario
        </Button>
      </div>
    </form>
  );
}

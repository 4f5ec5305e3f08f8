import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { type Scenario } from '@shared/comparisons';
import { type Note, noteInputSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Select } from '@/components/select';
import { TextAreaField } from '@/components/text-area-field';
import { useAddNote } from '@/features/governance/api/add-note';
import { useNotes } from '@/features/governance/api/get-notes';
import { NoteItem, anchorLabel } from '@/features/governance/components/discussion-thread';

const swapAnchors = ['swap-in', 'swap-out', 'both-accept', 'both-reject', 'swap-matrix'] as const;

/**
 * The credit policy role's annotations on the swap sets: everyone reads them; the policy role
 * writes them, optionally tied to one of the saved scenarios.
 */
export function SwapSetNotes({ comparisonId, canWrite, scenarios }: { comparisonId: number; canWrite: boolean; scenarios: Scenario[] }) {
  const notes = useNotes(comparisonId);
  const add = useAddNote(comparisonId);
  const {
    register,
    handleSubmit,
    reset,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(noteInputSchema),
    defaultValues: { anchor: 'swap-in' as Note['anchor'], body: '', scenarioId: null as number | null },
  });
  const annotations = (notes.data ?? []).filter((note) => note.anchor !== 'discussion');
  const scenarioName = new Map(scenarios.map((scenario) => [scenario.id, scenario.name]));
  const onSubmit = handleSubmit((values) => add.mutate(values, { onSuccess: () => reset({ anchor: values.anchor, body: '', scenarioId: values.scenarioId }) }));

  return (
    <div className="space-y-4" data-testid="swap-set-notes">
      {notes.isError ? <p className="text-sm text-bad">{errorMessage(notes.error)}</p> : null}
      {annotations.length > 0 ? (
        <ol className="divide-y divide-line rounded-md border border-line bg-paper-raised">
          {annotations.map((note) => (
            <NoteItem key={note.id} note={note} scenarioName={note.scenarioId !== null ? (scenarioName.get(note.scenarioId) ?? null) : null} />
          ))}
        </ol>
      ) : notes.isPending ? null : (
        <p className="text-sm text-ink-soft">No annotations on the swap sets yet.</p>
      )}
      {canWrite ? (
        <form onSubmit={onSubmit} noValidate className="space-y-3 print:hidden">
          {add.isError ? (
            <Alert tone="error" title="The annotation was not added">
              <p>{errorMessage(add.error)}</p>
            </Alert>
          ) : null}
          <div className="grid gap-3 sm:grid-cols-2">
            <Select label="About" options={swapAnchors.map((anchor) => ({ value: anchor, label: anchorLabel(anchor) }))} {...register('anchor')} />
            <Select
              label="Scenario"
              optional
              options={[{ value: '', label: 'None' }, ...scenarios.map((scenario) => ({ value: String(scenario.id), label: scenario.name }))]}
              {...register('scenarioId', { setValueAs: (value: unknown) => (value === '' || value === null || value === undefined ? null : Number(value)) })}
            />
          </div>
          <TextAreaField label="Annotation" error={errors.body?.message} rows={3} {...register('body')} />
          <Button type="submit" size="sm" loading={add.isPending} loadingText="Adding…">
            Add annotation
          </Button>
        </form>
      ) : null}
    </div>
  );
}

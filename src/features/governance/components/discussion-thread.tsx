import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { type Note, noteInputSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { StatusBadge } from '@/components/status-badge';
import { TextAreaField } from '@/components/text-area-field';
import { useAddNote } from '@/features/governance/api/add-note';

const anchorWords: Record<Note['anchor'], string> = {
  discussion: 'Discussion',
  'swap-in': 'On the swap-in',
  'swap-out': 'On the swap-out',
  'both-accept': 'On the accounts both accept',
  'both-reject': 'On the accounts both decline',
  'swap-matrix': 'On the swap matrix',
};

export function anchorLabel(anchor: Note['anchor']): string {
  return anchorWords[anchor];
}

/** Marks what was written after the committee's decision: not part of what the committee saw. */
export function AfterDecisionMark() {
  return (
    <span data-testid="after-decision">
      <StatusBadge tone="caution">After the decision</StatusBadge>
    </span>
  );
}

export function NoteItem({ note, scenarioName = null }: { note: Note; scenarioName?: string | null }) {
  return (
    <li className="break-inside-avoid px-4 py-3 text-sm" data-testid="note">
      <p className="text-ink-soft">
        <span className="font-medium text-ink">{note.author.name}</span> · <time dateTime={isoDateTime(note.createdAt)}>{formatDateTime(note.createdAt)}</time>
        {note.anchor !== 'discussion' ? <> · {anchorWords[note.anchor].toLowerCase()}</> : null}
        {note.scenarioId !== null ? <> · scenario “{scenarioName ?? note.scenarioId}”</> : null}
        {note.afterDecision ? (
          <>
            {' '}
            <AfterDecisionMark />
          </>
        ) : null}
      </p>
      <p className="prewrap mt-1 text-ink">{note.body}</p>
    </li>
  );
}

/** The comparison's discussion: everyone signed in reads and writes; notes are kept as written. */
export function DiscussionThread({ comparisonId, notes }: { comparisonId: number; notes: Note[] }) {
  const add = useAddNote(comparisonId);
  const discussion = notes.filter((note) => note.anchor === 'discussion');
  const {
    register,
    handleSubmit,
    reset,
    formState: { errors },
  } = useForm({ resolver: zodResolver(noteInputSchema), defaultValues: { anchor: 'discussion' as const, body: '', scenarioId: null } });
  const onSubmit = handleSubmit((values) => add.mutate(values, { onSuccess: () => reset() }));
  return (
    <div className="space-y-4">
      {discussion.length > 0 ? (
        <ol className="divide-y divide-line rounded-md border border-line bg-paper-raised">
          {discussion.map((note) => (
            <NoteItem key={note.id} note={note} />
          ))}
        </ol>
      ) : (
        <p className="text-sm text-ink-soft">No one has written here yet.</p>
      )}
      <form onSubmit={onSubmit} noValidate className="space-y-3 print:hidden">
        {add.isError ? (
          <Alert tone="error" title="The note was not added">
            <p>{errorMessage(add.error)}</p>
          </Alert>
        ) : null}
        <TextAreaField label="Add to the discussion" error={errors.body?.message} rows={3} {...register('body')} />
        <Button type="submit" size="sm" loading={add.isPending} loadingText="Adding…">
          Add note
        </Button>
      </form>
    </div>
  );
}

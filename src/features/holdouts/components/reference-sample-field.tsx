import { useState } from 'react';
import { type HoldoutInfo } from '@shared/comparisons';
import { formatCount } from '@/lib/format';
import { Button } from '@/components/button';
import { Callout } from '@/components/callout';
import { TextField } from '@/components/text-field';
import { useUploadHoldout } from '@/features/holdouts/api/upload-holdout';

export type ReferenceChoice = { kind: 'none' } | { kind: 'file'; holdout: Pick<HoldoutInfo, 'id' | 'fileName' | 'rowCount'> } | { kind: 'period'; period: string };

/**
 * The PSI's reference sample, chosen in the set-up: the development sample as a second uploaded
 * file (the same score columns; no outcome needed), or one value of the mapped period column.
 */
export function ReferenceSampleField({
  value,
  onChange,
  periodColumn,
  scoreColumns,
}: {
  value: ReferenceChoice;
  onChange: (next: ReferenceChoice) => void;
  periodColumn: string | null;
  scoreColumns: { champion: string; challenger: string };
}) {
  const upload = useUploadHoldout();
  const [period, setPeriod] = useState(value.kind === 'period' ? value.period : '');
  return (
    <fieldset className="space-y-3 rounded-lg border border-line p-4">
      <legend className="px-1 text-base font-semibold text-ink">Reference sample for the PSI (optional)</legend>
      <p className="text-sm text-ink-soft">
        The population stability index compares each model&apos;s scores with a reference: the development sample the model was built on (a CSV with
        the columns <code className="font-mono text-xs">{scoreColumns.champion}</code> and <code className="font-mono text-xs">{scoreColumns.challenger}</code>;
        no outcome needed), or one period of this holdout.
      </p>
      {value.kind === 'file' ? (
        <p className="text-sm">
          Reference: <span className="font-medium">{value.holdout.fileName}</span> ({formatCount(value.holdout.rowCount)} rows).{' '}
          <Button size="sm" variant="ghost" onClick={() => onChange({ kind: 'none' })}>
            Remove
          </Button>
        </p>
      ) : (
        <label className="block text-sm">
          <span className="font-medium text-ink">Development sample file</span>
          <input
            type="file"
            accept=".csv,text/csv,text/plain"
            className="mt-1 block text-sm"
            disabled={upload.isPending}
            onChange={(event) => {
              const file = event.target.files?.[0];
              if (!file) return;
              upload.mutate({ file }, { onSuccess: (holdout) => onChange({ kind: 'file', holdout }) });
            }}
          />
        </label>
      )}
      {upload.isPending ? <p className="text-sm text-ink-soft">Uploading…</p> : null}
      {upload.isError ? (
        <Callout tone="error" title="The file was not stored">
          <p>{upload.error.message}</p>
        </Callout>
      ) : null}
      {periodColumn && value.kind !== 'file' ? (
        <div className="flex flex-wrap items-end gap-3">
          <TextField
            label={`Or a value of ${periodColumn}`}
            optional
            hint="Its accounts are the reference; the other periods are compared with it."
            value={period}
            onChange={(event) => {
              setPeriod(event.target.value);
              onChange(event.target.value.trim() === '' ? { kind: 'none' } : { kind: 'period', period: event.target.value.trim() });
            }}
          />
        </div>
      ) : null}
    </fieldset>
  );
}

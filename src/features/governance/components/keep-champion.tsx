import { segmentValueLabel, type SegmentValueRef } from '@shared/mixed-strategy';
import { errorMessage } from '@/lib/api-client';
import { Alert } from '@/components/callout';
import { Checkbox } from '@/components/checkbox';
import { useMixedStrategy } from '@/features/governance/api/get-mixed-strategy';
import { MixedStrategyView } from '@/features/governance/components/mixed-strategy-view';

/** A segment value the committee can keep on the champion; `flagged` when the segment rule flags it. */
export type KeepableValue = SegmentValueRef & { flagged: boolean };

const keyOf = (ref: SegmentValueRef) => JSON.stringify([ref.column, ref.value]);

/** The report's segment values as choices, flagged ones said so. */
export function keepableValues(segments: readonly { column: string; value: string; flags: readonly string[] }[]): KeepableValue[] {
  return segments.map((row) => ({ column: row.column, value: row.value, flagged: row.flags.length > 0 }));
}

/** Ticks for the segment values that keep the champion under a conditional adoption. */
export function KeepChampionPicker({ values, kept, onChange }: { values: readonly KeepableValue[]; kept: readonly SegmentValueRef[]; onChange: (kept: SegmentValueRef[]) => void }) {
  const toggle = (ref: SegmentValueRef, on: boolean) => {
    const others = kept.filter((item) => keyOf(item) !== keyOf(ref));
    onChange(on ? [...others, ref] : others);
  };
  return (
    <div className="grid grid-cols-1 gap-1.5 sm:grid-cols-2">
      {values.map((ref) => (
        <Checkbox
          key={keyOf(ref)}
          label={`${segmentValueLabel(ref)}${ref.flagged ? ' — flagged: the challenger is worse here' : ''}`}
          checked={kept.some((item) => keyOf(item) === keyOf(ref))}
          onChange={(event) => toggle({ column: ref.column, value: ref.value }, event.target.checked)}
        />
      ))}
    </div>
  );
}

/** The server's figures for these exceptions on the current run, beside the champion and pure adoption. */
/** `challenger`: with several challengers, the one adopted outside the kept values (absent: the primary). */
export function MixedStrategyPreview({ comparisonId, runId, kept, challenger }: { comparisonId: number; runId: number | null; kept: readonly SegmentValueRef[]; challenger?: number }) {
  const preview = useMixedStrategy(comparisonId, runId, kept.length > 0 ? { keepChampion: [...kept], ...(challenger === undefined ? {} : { challenger }) } : null);
  if (kept.length === 0) return null;
  if (preview.isError) {
    return (
      <Alert tone="error" title="The strategy could not be computed">
        <p>{errorMessage(preview.error)}</p>
      </Alert>
    );
  }
  if (!preview.data) return <p className="text-sm text-ink-soft">Computing the mixed strategy…</p>;
  return <MixedStrategyView strategy={preview.data} caption="Preview: the mixed strategy beside the champion and pure adoption" />;
}

import { useEffect, useState } from 'react';
import { type ComparisonState, comparisonStates, type ListComparisonsQuery } from '@shared/comparisons';
import { Select } from '@/components/select';
import { TextField } from '@/components/text-field';
import { stateLabel } from '@/features/comparisons/lib/state-tone';

export type ComparisonSort = ListComparisonsQuery['sort'];

export const sortLabels: Record<ComparisonSort, string> = {
  'updated-desc': 'Recently changed first',
  'created-desc': 'Newest first',
  'name-asc': 'Name, A to Z',
  'delta-gini-desc': 'Largest uplift first',
};

export interface ComparisonFilterValues {
  state: ComparisonState | undefined;
  q: string;
  sort: ComparisonSort;
}

/**
 * Filter by state, search by name (applied after a pause in typing) and sort. The values live in
 * the page's URL; this form only reports changes.
 */
export function ComparisonFilters({ values, onChange }: { values: ComparisonFilterValues; onChange: (values: ComparisonFilterValues) => void }) {
  const [text, setText] = useState(values.q);
  // Follow the URL when it changes from outside (back button, a link).
  const [seen, setSeen] = useState(values.q);
  if (values.q !== seen) {
    setSeen(values.q);
    setText(values.q);
  }

  useEffect(() => {
    if (text.trim() === values.q) return;
    const timer = setTimeout(() => onChange({ ...values, q: text.trim() }), 350);
    return () => clearTimeout(timer);
  }, [text, values, onChange]);

  return (
    <form role="search" aria-label="Filter comparisons" onSubmit={(event) => {
      event.preventDefault();
      onChange({ ...values, q: text.trim() });
    }} className="grid gap-3 sm:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)]">
      <TextField label="Search by name" type="search" value={text} onChange={(event) => setText(event.target.value)} placeholder="e.g. cash-flow" />
      <Select
        label="State"
        value={values.state ?? ''}
        onChange={(event) => onChange({ ...values, state: (event.target.value || undefined) as ComparisonState | undefined })}
        options={[{ value: '', label: 'Every state' }, ...comparisonStates.map((state) => ({ value: state, label: stateLabel(state) }))]}
      />
      <Select
        label="Sort"
        value={values.sort}
        onChange={(event) => onChange({ ...values, sort: event.target.value as ComparisonSort })}
        options={Object.entries(sortLabels).map(([value, label]) => ({ value, label }))}
      />
    </form>
  );
}

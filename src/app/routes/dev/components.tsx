import { createColumnHelper } from '@tanstack/react-table';
import { useState } from 'react';
import { paths } from '@/config/paths';
import {
  formatAuc,
  formatCount,
  formatGini,
  formatGiniDelta,
  formatInterval,
  formatKs,
  formatPStatement,
  formatPercent,
} from '@/lib/format';
import { Button, ButtonLink } from '@/components/button';
import { Callout } from '@/components/callout';
import { Section } from '@/components/card';
import { Checkbox, CheckboxGroup } from '@/components/checkbox';
import { DataTable } from '@/components/data-table';
import { Dialog } from '@/components/dialog';
import { DocumentTitle } from '@/components/document-title';
import { EmptyState } from '@/components/empty-state';
import { ErrorState } from '@/components/error-state';
import { LoadingState } from '@/components/loading-state';
import { PageHeader } from '@/components/page-header';
import { ProgressBar } from '@/components/progress-bar';
import { Select } from '@/components/select';
import { Stat, StatGroup } from '@/components/stat';
import { StatusBadge } from '@/components/status-badge';
import { Tabs } from '@/components/tabs';
import { TextField } from '@/components/text-field';

// Development only (registered when import.meta.env.DEV): every shared component in its states,
// with made-up numbers, to check the look and keyboard use while building pages. Not in the build.

interface Band {
  band: number;
  accounts: number;
  bads: number;
  badRate: number;
}

const bands: Band[] = Array.from({ length: 10 }, (_, index) => {
  const accounts = 4000 + ((index * 377) % 900);
  const badRate = 0.18 * Math.exp(-index / 3);
  return { band: index + 1, accounts, bads: Math.round(accounts * badRate), badRate };
});

const column = createColumnHelper<Band>();
const columns = [
  column.accessor('band', { header: 'Band', meta: { rowHeader: true, numeric: true } }),
  column.accessor('accounts', { header: 'Accounts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('bads', { header: 'Bads', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
  column.accessor('badRate', { header: 'Bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
];

export function Component() {
  const [open, setOpen] = useState(false);
  return (
    <>
      <DocumentTitle>Components</DocumentTitle>
      <PageHeader
        eyebrow="Development"
        title="Components"
        subtitle="The shared components of src/components in their states. Numbers are invented."
        actions={
          <>
            <Button>Secondary</Button>
            <Button variant="primary">Primary</Button>
          </>
        }
      >
        <Tabs
          label="Comparison pages"
          items={[
            { to: paths.dev.components(), label: 'Verdict', end: true },
            { to: paths.comparisons.curves(1), label: 'Curves' },
            { to: paths.comparisons.swapSets(1), label: 'Swap sets' },
            { to: paths.comparisons.segments(1), label: 'Segments' },
            { to: paths.comparisons.bands(1), label: 'Bands' },
          ]}
        />
      </PageHeader>
      <div className="space-y-6">
        <Section title="Stats">
          <StatGroup>
            <Stat label="Gini, champion" value={formatGini(0.4213)} interval={formatInterval([0.4011, 0.4415])} intervalLabel="95%" adornment={<span className="size-2.5 rounded-full bg-champion" aria-hidden="true" />} />
            <Stat label="Gini, challenger" value={formatGini(0.4627)} interval={formatInterval([0.4431, 0.4823])} intervalLabel="95%" adornment={<span className="size-2.5 rounded-full bg-challenger" aria-hidden="true" />} />
            <Stat label="Gini uplift" value={formatGiniDelta(0.0414)} unit="points" interval={formatInterval([0.0203, 0.0625])} intervalLabel="95%" footnote={`DeLong, one-sided ${formatPStatement(0.00031)}`} />
            <Stat label="AUC, challenger" value={formatAuc(0.73135)} footnote="Mann–Whitney" />
            <Stat label="KS, challenger" value={formatKs(0.3381)} footnote="Bootstrap interval skipped" interval={null} />
          </StatGroup>
        </Section>
        <Section title="Badges and callouts" description="Each state has a word and a symbol; colour is the third cue.">
          <div className="flex flex-wrap gap-2">
            <StatusBadge tone="good">Met</StatusBadge>
            <StatusBadge tone="bad">Not met</StatusBadge>
            <StatusBadge tone="caution">Too few bads</StatusBadge>
            <StatusBadge tone="pending">Running</StatusBadge>
            <StatusBadge tone="info">In review</StatusBadge>
            <StatusBadge>Draft</StatusBadge>
          </div>
          <div className="mt-4 grid gap-3 md:grid-cols-2">
            <Callout tone="info" title="How to read this">The difference is challenger − champion throughout.</Callout>
            <Callout tone="caution" title="Statistical significance is not business approval">Defer to your model risk policy.</Callout>
            <Callout tone="error" title="The file could not be read">Row 1,204, column “score_challenger”: “n/a” is not a number.</Callout>
            <Callout tone="success">The analysis finished.</Callout>
          </div>
        </Section>
        <Section title="Table" description="Sortable headers are buttons; numbers are right-aligned in tabular figures.">
          <DataTable data={bands} columns={columns} caption="Bands of the challenger" showCaption pagination={{ pageSize: 5 }} density="compact" />
        </Section>
        <Section title="Forms">
          <div className="grid gap-5 md:grid-cols-2">
            <TextField label="Comparison name" hint="Shown in lists and the report." />
            <TextField label="Approval rate" hint="Between 1% and 99%." error="Enter a number between 1 and 99" defaultValue="140" inputMode="decimal" />
            <Select label="Orientation of the challenger's score" options={[{ value: 'safer', label: 'Higher is safer (points)' }, { value: 'riskier', label: 'Higher is riskier (PD)' }]} />
            <CheckboxGroup legend="Segments" hint="Columns to break the result down by.">
              <Checkbox label="product" defaultChecked />
              <Checkbox label="channel" />
            </CheckboxGroup>
          </div>
        </Section>
        <Section title="Progress and states">
          <div className="grid gap-5 md:grid-cols-2">
            <ProgressBar label="Uploading holdout.csv" value={0.42} valueText="21.0 MB of 50.0 MB" />
            <ProgressBar label="Analysing" value={null} />
            <LoadingState label="Loading comparisons…" variant="skeleton" rows={3} />
            <ErrorState error={new Error('The server had a problem (500). Try again in a moment.')} onRetry={() => undefined} />
            <EmptyState title="No comparisons yet" action={<ButtonLink to={paths.home()}>Back home</ButtonLink>}>
              A modeler starts one by uploading a holdout.
            </EmptyState>
            <div className="flex flex-wrap items-start gap-2">
              <Button loading loadingText="Saving…">Save</Button>
              <Button variant="danger">Deactivate</Button>
              <Button variant="ghost">Ghost</Button>
              <Button size="sm">Small</Button>
              <Button onClick={() => setOpen(true)}>Open dialog</Button>
            </div>
          </div>
        </Section>
      </div>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title="A dialog"
        description="Esc closes it; Tab stays inside."
        footer={
          <>
            <Button onClick={() => setOpen(false)}>Cancel</Button>
            <Button variant="primary" onClick={() => setOpen(false)}>
              Confirm
            </Button>
          </>
        }
      >
        <TextField label="A field inside" />
      </Dialog>
    </>
  );
}

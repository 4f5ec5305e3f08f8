import { hasSeveralChallengers } from '@shared/challengers-words';
import { segmentsOf } from '@shared/challenger-sections';
import { hasUnknownOrWeights } from '@shared/population';
import { useSearchParams } from 'react-router';
import { formatCount, formatGini, formatPercent } from '@/lib/format';
import { Section } from '@/components/card';
import { Select } from '@/components/select';
import { SegmentIntervalsChart } from '@/features/report-tables/components/segment-intervals-chart';
import { SegmentsTable } from '@/features/report-tables/components/segments-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/**
 * Both models within each segment value: is the uplift stable, and where does it reverse? With
 * several challengers, one challenger against the champion at a time (`?challenger=k`, 0 = the
 * first), its rows the ones its verdict was judged on.
 */
export function Component() {
  const { report } = useComparisonPage();
  const [params, setParams] = useSearchParams();
  const several = hasSeveralChallengers(report);
  const asked = Number(params.get('challenger') ?? 0);
  const challenger = several && Number.isInteger(asked) && asked >= 0 && asked < report.challengers.length ? asked : 0;
  const segments = segmentsOf(report, challenger);
  const { policy, settings } = report;
  const subject = several ? report.challengers[challenger]!.name : 'The challenger';
  const reversed = segments.filter((row) => row.deltaGini !== null && row.deltaGini < 0).length;
  const few = segments.filter((row) => row.tooFewBads).length;
  const worse = segments.filter((row) => row.flags.includes('significantly-worse')).length;
  const materiality = policy.materialityGiniPoints / 100;
  return (
    <Section
      title="Segments"
      description={`Two-sided DeLong test within each value (α = ${formatPercent(policy.alpha, 0)}), so harm shows as well as benefit; the Holm adjustment (Holm 1979) keeps the chance of any false finding across all ${formatCount(segments.length)} rows at α. A value is flagged significantly worse when its Holm-adjusted p is below α with ΔGini below 0, and materially worse when ΔGini is at or below −${formatGini(materiality)} points. ${
        reversed > 0 ? `${subject} is behind in ${formatCount(reversed)} of them${worse > 0 ? `, significantly in ${formatCount(worse)}` : ''}. ` : ''
      }${few > 0 ? `${formatCount(few)} ${few === 1 ? 'has' : 'have'} fewer than ${formatCount(policy.segmentRule.minBads)} bads: marked, and left out of the segment rule.` : ''}`}
    >
      <div className="space-y-4">
        {several ? (
          <Select
            label="Challenger against the champion"
            className="max-w-sm"
            value={String(challenger)}
            onChange={(event) => {
              const next = new URLSearchParams(params);
              if (event.target.value === '0') next.delete('challenger');
              else next.set('challenger', event.target.value);
              setParams(next, { replace: true });
            }}
            options={report.challengers.map((entry, index) => ({ value: String(index), label: `${entry.name} (challenger ${index + 1})` }))}
          />
        ) : null}
        {several && challenger > 0 && report.challengers[challenger]!.segments === undefined ? (
          <p className="text-sm text-ink-soft">This report has no segment rows for {subject}; run the analysis again to check its segments.</p>
        ) : (
          <>
            <SegmentIntervalsChart segments={segments} materiality={materiality} confidence={formatPercent(settings.confidence, 0)} />
            <SegmentsTable segments={segments} alpha={policy.alpha} population={hasUnknownOrWeights(report)} />
          </>
        )}
      </div>
    </Section>
  );
}

import { formatCount, formatGini, formatPercent } from '@/lib/format';
import { Section } from '@/components/card';
import { SegmentIntervalsChart } from '@/features/report-tables/components/segment-intervals-chart';
import { SegmentsTable } from '@/features/report-tables/components/segments-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** Both models within each segment value: is the uplift stable, and where does it reverse? */
export function Component() {
  const { report } = useComparisonPage();
  const { segments, policy, settings } = report;
  const reversed = segments.filter((row) => row.deltaGini !== null && row.deltaGini < 0).length;
  const few = segments.filter((row) => row.tooFewBads).length;
  const worse = segments.filter((row) => row.flags.includes('significantly-worse')).length;
  const materiality = policy.materialityGiniPoints / 100;
  return (
    <Section
      title="Segments"
      description={`Two-sided DeLong test within each value (α = ${formatPercent(policy.alpha, 0)}), so harm shows as well as benefit; the Holm adjustment (Holm 1979) keeps the chance of any false finding across all ${formatCount(segments.length)} rows at α. A value is flagged significantly worse when its Holm-adjusted p is below α with ΔGini below 0, and materially worse when ΔGini is at or below −${formatGini(materiality)} points. ${
        reversed > 0 ? `The challenger is behind in ${formatCount(reversed)} of them${worse > 0 ? `, significantly in ${formatCount(worse)}` : ''}. ` : ''
      }${few > 0 ? `${formatCount(few)} ${few === 1 ? 'has' : 'have'} fewer than ${formatCount(policy.segmentRule.minBads)} bads: marked, and left out of the segment rule.` : ''}`}
    >
      <div className="space-y-4">
        <SegmentIntervalsChart segments={segments} materiality={materiality} confidence={formatPercent(settings.confidence, 0)} />
        <SegmentsTable segments={segments} alpha={policy.alpha} />
      </div>
    </Section>
  );
}

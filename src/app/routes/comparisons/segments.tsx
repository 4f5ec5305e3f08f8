import { formatCount, formatPercent } from '@/lib/format';
import { Section } from '@/components/card';
import { SegmentsTable } from '@/features/report-tables/components/segments-table';
import { useComparisonPage } from '@/app/routes/comparisons/context';

/** Both models within each segment value: is the uplift stable, and where does it reverse? */
export function Component() {
  const { report } = useComparisonPage();
  const { segments, policy } = report;
  const reversed = segments.filter((row) => row.deltaGini !== null && row.deltaGini < 0).length;
  const flagged = segments.filter((row) => row.tooFewBads).length;
  return (
    <Section
      title="Segments"
      description={`DeLong test within each value (${policy.sided}, α = ${formatPercent(policy.alpha, 0)}); the Holm adjustment (Holm 1979) keeps the chance of any false finding across all ${formatCount(segments.length)} rows at α. ${
        reversed > 0 ? `The challenger is behind in ${formatCount(reversed)} of them. ` : ''
      }${flagged > 0 ? `${formatCount(flagged)} ${flagged === 1 ? 'has' : 'have'} too few bads for a reliable Gini.` : ''}`}
    >
      <SegmentsTable segments={segments} alpha={policy.alpha} />
    </Section>
  );
}

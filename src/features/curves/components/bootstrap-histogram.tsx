import { type BarCustomLayerProps, ResponsiveBar } from '@nivo/bar';
import { createColumnHelper } from '@tanstack/react-table';
import { type Histogram } from '@shared/report';
import { formatCount, formatGiniDelta } from '@/lib/format';
import { ChartFrame } from '@/components/charts/chart-frame';
import { chartTheme, colors } from '@/components/charts/chart-theme';
import { DataTable } from '@/components/data-table';
import { type HistogramBin, histogramBins, histogramTotal, positionInHistogram } from '@/features/curves/lib/chart-data';

const column = createColumnHelper<HistogramBin>();

/** A bin as nivo's bar chart takes it (string or number fields only). */
type BarBin = { [key: string]: string | number; id: string; count: number; from: number; to: number; inside: number };

type BootstrapHistogramProps = {
  title: string;
  /** The quantity in words ("ΔGini"). */
  quantity: string;
  histogram: Histogram;
  /** The bootstrap percentile interval, marked on the drawing. */
  interval: readonly [number, number] | null;
  /** The point estimate on the full holdout. */
  estimate: number;
  /** Another interval to compare with (DeLong's for ΔGini). */
  reference?: { label: string; interval: readonly [number, number] };
  confidence: string;
  /** Formats a value of the quantity (points, signed). */
  format?: (value: number) => string;
};

/**
 * The distribution of a bootstrap replicate statistic, with its percentile interval marked by
 * labelled lines (bars inside it are darker, a secondary cue), the full-sample estimate and zero.
 */
export function BootstrapHistogram({ title, quantity, histogram, interval, estimate, reference, confidence, format = formatGiniDelta }: BootstrapHistogramProps) {
  const bins = histogramBins(histogram, interval);
  const total = histogramTotal(histogram);
  const first = histogram.edges[0];
  const last = histogram.edges[histogram.edges.length - 1];

  function Marks({ innerWidth, innerHeight }: BarCustomLayerProps<BarBin>) {
    const x = (value: number) => positionInHistogram(histogram, value) * innerWidth;
    const marks: { value: number; label: string; color: string; dash?: string; y: number }[] = [];
    if (interval) {
      marks.push({ value: interval[0], label: `lower ${format(interval[0])}`, color: colors.court[800], y: 12 });
      marks.push({ value: interval[1], label: `upper ${format(interval[1])}`, color: colors.court[800], y: 12 });
    }
    marks.push({ value: estimate, label: `estimate ${format(estimate)}`, color: colors.ink.DEFAULT, dash: '4 3', y: 28 });
    if (first <= 0 && last >= 0) marks.push({ value: 0, label: 'zero', color: colors.bad.DEFAULT, dash: '2 3', y: 44 });
    return (
      <g>
        {marks.map((mark) => {
          const position = x(mark.value);
          const anchor = position > innerWidth * 0.8 ? 'end' : 'start';
          return (
            <g key={mark.label}>
              <line x1={position} x2={position} y1={0} y2={innerHeight} stroke={mark.color} strokeWidth={2} strokeDasharray={mark.dash} />
              <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={position + (anchor === 'start' ? 5 : -5)} y={mark.y} textAnchor={anchor} fontSize={11} fontWeight={600} fill={mark.color}>
                {mark.label}
              </text>
            </g>
          );
        })}
      </g>
    );
  }

  const columns = [
    column.accessor('from', { header: `${quantity} from`, meta: { numeric: true, rowHeader: true }, cell: ({ getValue }) => format(getValue()) }),
    column.accessor('to', { header: 'to', meta: { numeric: true }, cell: ({ getValue }) => format(getValue()) }),
    column.accessor('count', { header: 'Replicates', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
    column.accessor('inside', { header: 'Inside the interval', cell: ({ getValue }) => (getValue() ? 'yes' : 'no') }),
  ];
  const tickEvery = Math.max(1, Math.ceil(bins.length / 6));

  return (
    <ChartFrame
      title={title}
      caption={`${formatCount(total)} paired bootstrap replicates of ${quantity}, in ${bins.length} bins from ${format(first)} to ${format(last)} points. ${
        interval ? `The ${confidence} percentile interval is ${format(interval[0])} to ${format(interval[1])}` : 'No interval'
      }; the estimate on the whole holdout is ${format(estimate)}.${reference ? ` ${reference.label}: ${format(reference.interval[0])} to ${format(reference.interval[1])}.` : ''}`}
      table={<DataTable data={bins} columns={columns} caption={`${title}: replicates per bin`} density="compact" enableSorting={false} />}
      height={260}
    >
      <ResponsiveBar<BarBin>
        data={bins.map((bin) => ({ id: bin.id, count: bin.count, from: bin.from, to: bin.to, inside: bin.inside ? 1 : 0 }))}
        keys={['count']}
        indexBy="id"
        theme={chartTheme}
        margin={{ top: 8, right: 14, bottom: 44, left: 56 }}
        padding={0.08}
        colors={({ data }) => (data.inside ? colors.court[500] : colors.court[200])}
        enableLabel={false}
        enableGridY
        axisBottom={{
          legend: `${quantity} (points)`,
          legendOffset: 36,
          legendPosition: 'middle',
          tickValues: bins.filter((_, index) => index % tickEvery === 0).map((bin) => bin.id),
          format: (id) => format(bins.find((bin) => bin.id === id)?.from ?? 0),
        }}
        axisLeft={{ legend: 'Replicates', legendOffset: -46, legendPosition: 'middle', tickValues: 4 }}
        layers={['grid', 'axes', 'bars', Marks]}
        animate={false}
        isInteractive
        tooltip={({ data }) => (
          <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
            {format(data.from)} to {format(data.to)}: {formatCount(data.count)} replicates
          </div>
        )}
        role="presentation"
      />
    </ChartFrame>
  );
}

import { type LineCustomSvgLayerProps, ResponsiveLine } from '@nivo/line';
import { createColumnHelper } from '@tanstack/react-table';
import { type Curves, type ModelMetrics } from '@shared/report';
import { formatKs, formatPercent, formatScore } from '@/lib/format';
import { ChartFrame } from '@/components/charts/chart-frame';
import { ChartLegend } from '@/components/charts/chart-legend';
import { type SeriesStyle, chartTheme, colors, seriesStyles } from '@/components/charts/chart-theme';
import { styledLinesLayer } from '@/components/charts/styled-lines-layer';
import { DataTable } from '@/components/data-table';
import { ModelTag } from '@/components/model-tag';
import { ksMarker, ksTable, thin } from '@/features/curves/lib/chart-data';

type Model = 'champion' | 'challenger';
type Row = ReturnType<typeof ksTable>[number];
const column = createColumnHelper<Row>();

function stylesFor(model: Model): Record<'bads' | 'goods', SeriesStyle> {
  const base = seriesStyles[model];
  return {
    bads: { ...base, dash: undefined, label: 'Cumulative share of bads' },
    goods: { ...base, dash: '3 3', marker: 'none', width: 2, label: 'Cumulative share of goods' },
  };
}

/**
 * One model's KS chart: the cumulative shares of bads and of goods by score, riskiest scores
 * first (on the left), with the largest gap — the KS — marked and labelled.
 */
export function KsChart({ model, points, metrics, column: scoreColumn }: { model: Model; points: Curves['ks']['champion']; metrics: ModelMetrics; column: string }) {
  const styles = stylesFor(model);
  const marker = ksMarker(points, metrics.ksScore);
  const drawn = thin(points, 220);
  const data = [
    { id: 'bads', data: drawn.map((point) => ({ x: point.score, y: point.cumBad })) },
    { id: 'goods', data: drawn.map((point) => ({ x: point.score, y: point.cumGood })) },
  ];
  const riskiestFirst = metrics.higherIs === 'safer' ? 'lowest' : 'highest';

  function Gap({ xScale, yScale, innerWidth }: LineCustomSvgLayerProps<(typeof data)[number]>) {
    if (!marker) return null;
    const x = xScale(marker.score);
    const top = yScale(Math.max(marker.cumBad, marker.cumGood));
    const bottom = yScale(Math.min(marker.cumBad, marker.cumGood));
    // Near the right edge the label goes to the left of the gap.
    const left = x > innerWidth * 0.65;
    return (
      <g>
        <line x1={x} x2={x} y1={top} y2={bottom} stroke={colors.ink.DEFAULT} strokeWidth={2} />
        <line x1={x - 6} x2={x + 6} y1={top} y2={top} stroke={colors.ink.DEFAULT} strokeWidth={2} />
        <line x1={x - 6} x2={x + 6} y1={bottom} y2={bottom} stroke={colors.ink.DEFAULT} strokeWidth={2} />
        <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={left ? x - 8 : x + 8} textAnchor={left ? 'end' : 'start'} y={(top + bottom) / 2} fontSize={12} fontWeight={600} fill={colors.ink.DEFAULT}>
          {`KS ${formatKs(metrics.ks)} at ${formatScore(marker.score)}`}
        </text>
      </g>
    );
  }

  const rows = ksTable(points, metrics.ksScore, 20);
  const columns = [
    column.accessor('score', { header: 'Score', meta: { numeric: true, rowHeader: true }, cell: ({ getValue, row }) => `${formatScore(getValue())}${row.original.isKs ? ' (KS)' : ''}` }),
    column.accessor('cumBad', { header: 'Share of bads at or beyond', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
    column.accessor('cumGood', { header: 'Share of goods at or beyond', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
    column.accessor('gap', { header: 'Gap (points)', meta: { numeric: true }, cell: ({ getValue }) => formatKs(getValue()) }),
  ];
  const name = model === 'champion' ? 'Champion' : 'Challenger';

  return (
    <ChartFrame
      title={
        <span className="inline-flex flex-wrap items-center gap-2">
          KS chart <ModelTag model={model} column={scoreColumn} />
        </span>
      }
      caption={`${name}: the shares of bads and of goods with a score at or ${riskiestFirst === 'lowest' ? 'below' : 'above'} each value, ${riskiestFirst} scores first. The largest gap, the KS, is ${formatKs(metrics.ks)} points at score ${formatScore(metrics.ksScore)}${metrics.ksCi ? ` (bootstrap interval ${formatKs(metrics.ksCi[0])} to ${formatKs(metrics.ksCi[1])})` : ''}.`}
      legend={<ChartLegend items={[{ style: styles.bads }, { style: styles.goods }]} />}
      table={<DataTable data={rows} columns={columns} caption={`${name} KS chart: about 20 scores and the KS point`} density="compact" enableSorting={false} />}
      height={300}
    >
      <ResponsiveLine
        data={data}
        theme={chartTheme}
        margin={{ top: 12, right: 18, bottom: 48, left: 58 }}
        xScale={{ type: 'linear', min: 'auto', max: 'auto', reverse: metrics.higherIs === 'riskier' }}
        yScale={{ type: 'linear', min: 0, max: 1 }}
        axisBottom={{ legend: `Score (${riskiestFirst} = riskiest, on the left)`, legendOffset: 38, legendPosition: 'middle', tickValues: 6, format: (value) => formatScore(Number(value)) }}
        axisLeft={{ legend: 'Cumulative share', legendOffset: -48, legendPosition: 'middle', tickValues: 5, format: (value) => formatPercent(Number(value), 0) }}
        gridYValues={5}
        layers={['grid', 'axes', styledLinesLayer(styles), Gap, 'mesh']}
        useMesh
        animate={false}
        tooltip={({ point }) => (
          <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
            Score {formatScore(Number(point.data.x))}: {point.seriesId === 'bads' ? 'bads' : 'goods'} {formatPercent(Number(point.data.y))}
          </div>
        )}
      />
    </ChartFrame>
  );
}

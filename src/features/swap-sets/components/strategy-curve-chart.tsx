import { type LineCustomSvgLayerProps, ResponsiveLine } from '@nivo/line';
import { createColumnHelper } from '@tanstack/react-table';
import { equalApprovalSentence } from '@shared/equal-approval-words';
import { type StrategyCurve, type SwapSets } from '@shared/report';
import { formatPercent, formatScore } from '@/lib/format';
import { ChartFrame } from '@/components/charts/chart-frame';
import { ChartLegend } from '@/components/charts/chart-legend';
import { chartTheme, colors, seriesStyles } from '@/components/charts/chart-theme';
import { MarkerShape } from '@/components/charts/series-marker';
import { type XYSeries, styledLinesLayer } from '@/components/charts/styled-lines-layer';
import { DataTable } from '@/components/data-table';
import { approvedBooks } from '@/features/swap-sets/lib/swap-controls';

type Point = StrategyCurve['points'][number];
const column = createColumnHelper<Point>();
const tableColumns = [
  column.accessor('approvalRate', { header: 'Approval rate', meta: { numeric: true, rowHeader: true }, cell: ({ getValue }) => formatPercent(getValue(), 0) }),
  column.accessor((row) => row.champion.cutoff, { id: 'cc', header: 'Champion cut-off', meta: { numeric: true }, cell: ({ getValue }) => formatScore(getValue()) }),
  column.accessor((row) => row.champion.portfolioBadRate, { id: 'cp', header: 'Champion book bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  column.accessor((row) => row.champion.marginalBadRate, { id: 'cm', header: 'Champion marginal', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 1) }),
  column.accessor((row) => row.challenger.cutoff, { id: 'hc', header: 'Challenger cut-off', meta: { numeric: true }, cell: ({ getValue }) => formatScore(getValue()) }),
  column.accessor((row) => row.challenger.portfolioBadRate, { id: 'hp', header: 'Challenger book bad rate', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 2) }),
  column.accessor((row) => row.challenger.marginalBadRate, { id: 'hm', header: 'Challenger marginal', meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue(), 1) }),
];

const lines = styledLinesLayer<XYSeries>(seriesStyles, 7);


type StrategyCurveChartProps = {
  curve: StrategyCurve;
  swap: SwapSets;
  position: StrategyCurve['atApprovalRate'];
};

/**
 * The strategy curve: the bad rate of the approved book against the approval rate, for both
 * models, with the current cut-offs marked on each model's curve.
 */
export function StrategyCurveChart({ curve, swap, position }: StrategyCurveChartProps) {
  const data: XYSeries[] = (['champion', 'challenger'] as const).map((model) => ({
    id: model,
    data: curve.points
      .filter((point) => point[model].portfolioBadRate !== null)
      .map((point) => ({ x: point[model].achievedApprovalRate, y: point[model].portfolioBadRate as number })),
  }));
  const books = approvedBooks(swap);
  const current = {
    champion: { x: swap.champion.approvalRate, y: books.champion.badRate },
    challenger: { x: swap.challenger.approvalRate, y: books.challenger.badRate },
  };
  const maxY = Math.max(0.01, ...data.flatMap((series) => series.data.map((point) => point.y))) * 1.08;

  function Current({ xScale, yScale, innerWidth, innerHeight }: LineCustomSvgLayerProps<XYSeries>) {
    const models = (['champion', 'challenger'] as const).filter((model) => current[model].y !== null);
    return (
      <g>
        {models.map((model) => {
          const point = current[model];
          const x = xScale(point.x);
          const y = yScale(point.y as number);
          const style = seriesStyles[model];
          return (
            <g key={model}>
              <line x1={x} x2={x} y1={y} y2={yScale(0)} stroke={style.color} strokeDasharray="2 3" />
              <circle cx={x} cy={y} r={9} fill="none" stroke={colors.ink.DEFAULT} strokeWidth={1.5} />
              <MarkerShape x={x} y={y} style={style} size={9} />
            </g>
          );
        })}
        {/* The current points in words, in a key at the bottom right, where a strategy curve (rising
            to the right) leaves room; the two points themselves are often too close to label. */}
        <g transform={`translate(${Math.max(0, innerWidth - 314)}, ${Math.max(0, innerHeight - 22 - models.length * 18)})`}>
        <rect x={0} y={0} width={310} height={14 + models.length * 18} rx={4} fill={colors.paper.raised} stroke={colors.line.DEFAULT} />
        {models.map((model, index) => {
          const point = current[model];
          const style = seriesStyles[model];
          return (
            <g key={model} transform={`translate(12, ${16 + index * 18})`}>
              <circle cx={0} cy={-4} r={7} fill="none" stroke={colors.ink.DEFAULT} strokeWidth={1.2} />
              <MarkerShape x={0} y={-4} style={style} size={7} />
              <text x={14} y={0} fontSize={11} fill={colors.ink.DEFAULT}>
                {`${style.label} now: approves ${formatPercent(point.x)}, bad rate ${formatPercent(point.y, 2)}`}
              </text>
            </g>
          );
        })}
        </g>
      </g>
    );
  }

  const everyFive = curve.points.filter((point) => Math.round(point.approvalRate * 100) % 5 === 0);
  return (
    <ChartFrame
      title="Strategy curve"
      caption={`Bad rate of the approved book at each approval rate, both models. At the current cut-offs the champion approves ${formatPercent(swap.champion.approvalRate)} with a ${formatPercent(
        books.champion.badRate,
        2,
      )} bad rate and the challenger ${formatPercent(swap.challenger.approvalRate)} with ${formatPercent(books.challenger.badRate, 2)}. ${equalApprovalSentence(position)}`}
      legend={
        <ChartLegend
          items={[
            { style: seriesStyles.champion },
            { style: seriesStyles.challenger },
          ]}
        />
      }
      table={<DataTable data={everyFive} columns={tableColumns} caption="Strategy curve every 5 points of approval rate" density="compact" enableSorting={false} />}
      height={320}
    >
      <ResponsiveLine
        data={data}
        theme={chartTheme}
        margin={{ top: 16, right: 20, bottom: 48, left: 62 }}
        xScale={{ type: 'linear', min: 0, max: 1 }}
        yScale={{ type: 'linear', min: 0, max: maxY }}
        axisBottom={{ legend: 'Approval rate', legendOffset: 38, legendPosition: 'middle', tickValues: [0, 0.2, 0.4, 0.6, 0.8, 1], format: (value) => formatPercent(Number(value), 0) }}
        axisLeft={{ legend: 'Bad rate of the approved book', legendOffset: -52, legendPosition: 'middle', tickValues: 5, format: (value) => formatPercent(Number(value), 1) }}
        gridYValues={5}
        gridXValues={[0, 0.2, 0.4, 0.6, 0.8, 1]}
        layers={['grid', 'axes', lines, Current, 'mesh']}
        useMesh
        animate={false}
        tooltip={({ point }) => (
          <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
            <span className="font-medium">{seriesStyles[point.seriesId as 'champion' | 'challenger'].label}</span>: approves {formatPercent(Number(point.data.x))}, bad rate{' '}
            {formatPercent(Number(point.data.y), 2)}
          </div>
        )}
      />
    </ChartFrame>
  );
}

import { ResponsiveLine } from '@nivo/line';
import { createColumnHelper } from '@tanstack/react-table';
import { type Curves } from '@shared/report';
import { formatPercent } from '@/lib/format';
import { ChartFrame } from '@/components/charts/chart-frame';
import { ChartLegend, type LegendItem } from '@/components/charts/chart-legend';
import { chartTheme, seriesStyles } from '@/components/charts/chart-theme';
import { styledLinesLayer } from '@/components/charts/styled-lines-layer';
import { DataTable } from '@/components/data-table';
import { curveTable } from '@/features/curves/lib/chart-data';

type CurvePoints = Curves['roc'];
type Row = ReturnType<typeof curveTable>[number];
const column = createColumnHelper<Row>();

type ModelCurveChartProps = {
  title: string;
  caption: string;
  curve: CurvePoints;
  /** Reference lines drawn under the models (the random model's diagonal, a perfect model). */
  references: { key: 'reference' | 'perfect'; points: { x: number; y: number }[]; label?: string }[];
  xLabel: string;
  yLabel: string;
  /** Words for the table's first column ("Share of goods declined"). */
  tableX: string;
  legendDetail?: { champion?: string; challenger?: string };
};

const lines = styledLinesLayer(seriesStyles);

/** A curve of both models over shares (ROC, CAP) with reference lines, a legend and a table. */
export function ModelCurveChart({ title, caption, curve, references, xLabel, yLabel, tableX, legendDetail }: ModelCurveChartProps) {
  const data = [
    ...references.map((reference) => ({ id: reference.key, data: reference.points })),
    { id: 'champion', data: curve.champion },
    { id: 'challenger', data: curve.challenger },
  ];
  const legend: LegendItem[] = [
    { style: seriesStyles.champion, detail: legendDetail?.champion },
    { style: seriesStyles.challenger, detail: legendDetail?.challenger },
    ...references.map((reference) => ({ style: seriesStyles[reference.key], label: reference.label })),
  ];
  const rows = curveTable(curve, 0.05);
  const columns = [
    column.accessor('x', { header: tableX, meta: { numeric: true, rowHeader: true }, cell: ({ getValue }) => formatPercent(getValue(), 0) }),
    column.accessor('champion', { header: `Champion: ${yLabel.toLowerCase()}`, meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
    column.accessor('challenger', { header: `Challenger: ${yLabel.toLowerCase()}`, meta: { numeric: true }, cell: ({ getValue }) => formatPercent(getValue()) }),
  ];
  return (
    <ChartFrame
      title={title}
      caption={caption}
      legend={<ChartLegend items={legend} />}
      table={<DataTable data={rows} columns={columns} caption={`${title}: values every 5%`} density="compact" enableSorting={false} />}
    >
      <ResponsiveLine
        data={data}
        theme={chartTheme}
        margin={{ top: 12, right: 18, bottom: 48, left: 58 }}
        xScale={{ type: 'linear', min: 0, max: 1 }}
        yScale={{ type: 'linear', min: 0, max: 1 }}
        axisBottom={{ legend: xLabel, legendOffset: 38, legendPosition: 'middle', tickValues: 5, format: (value) => formatPercent(Number(value), 0) }}
        axisLeft={{ legend: yLabel, legendOffset: -48, legendPosition: 'middle', tickValues: 5, format: (value) => formatPercent(Number(value), 0) }}
        gridXValues={5}
        gridYValues={5}
        layers={['grid', 'axes', lines, 'crosshair', 'mesh']}
        useMesh
        animate={false}
        tooltip={({ point }) => (
          <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
            <span className="font-medium">{seriesStyles[point.seriesId as keyof typeof seriesStyles]?.label ?? String(point.seriesId)}</span>:{' '}
            {formatPercent(Number(point.data.x))} → {formatPercent(Number(point.data.y))}
          </div>
        )}
      />
    </ChartFrame>
  );
}

import { type LineCustomSvgLayerProps, ResponsiveLine } from '@nivo/line';
import { type PeriodRow } from '@shared/calibration';
import { formatGini, formatGiniDelta, formatInterval } from '@/lib/format';
import { ChartFrame } from '@/components/charts/chart-frame';
import { ChartLegend } from '@/components/charts/chart-legend';
import { chartTheme, colors, seriesStyles } from '@/components/charts/chart-theme';
import { MarkerShape } from '@/components/charts/series-marker';
import { styledLinesLayer } from '@/components/charts/styled-lines-layer';
import { StabilityTable } from './stability-table';

type Point = { x: number; y: number; low: number | null; high: number | null };
type Series = { id: string; data: Point[] };

/** Periods with a Gini (both classes present), in order. */
function usable(periods: readonly PeriodRow[]) {
  return periods.filter((row) => row.deltaGini !== null);
}

/** Both models' Gini by period, with their DeLong intervals as bars. */
export function GiniByPeriodChart({ periods, column }: { periods: readonly PeriodRow[]; column: string }) {
  const rows = usable(periods);
  const data: Series[] = (['champion', 'challenger'] as const).map((model) => ({
    id: model,
    data: rows.map((row, index) => ({
      x: index,
      y: row[`${model}Gini`]! * 100,
      low: row[`${model}GiniCi`] ? row[`${model}GiniCi`]![0] * 100 : null,
      high: row[`${model}GiniCi`] ? row[`${model}GiniCi`]![1] * 100 : null,
    })),
  }));
  const lines = styledLinesLayer<Series>(seriesStyles, 50);
  function Bars({ series, yScale }: LineCustomSvgLayerProps<Series>) {
    const y = yScale as unknown as (value: number) => number;
    return (
      <g>
        {series.map((serie) =>
          serie.data.map((datum, index) =>
            datum.data.low === null || datum.data.high === null ? null : (
              <line
                key={`${String(serie.id)}-${index}`}
                x1={datum.position.x + (serie.id === 'champion' ? -3 : 3)}
                x2={datum.position.x + (serie.id === 'champion' ? -3 : 3)}
                y1={y(datum.data.low)}
                y2={y(datum.data.high)}
                stroke={seriesStyles[serie.id as 'champion' | 'challenger'].color}
                strokeOpacity={0.55}
                strokeWidth={1.5}
              />
            ),
          ),
        )}
      </g>
    );
  }
  const all = data.flatMap((serie) => serie.data.flatMap((point) => [point.low ?? point.y, point.high ?? point.y]));
  return (
    <ChartFrame
      title={`Gini by ${column}`}
      caption={`Gini of each model within each value of ${column}, with its DeLong interval. ${rows.length} periods with both goods and bads.`}
      legend={<ChartLegend items={[{ style: seriesStyles.champion }, { style: seriesStyles.challenger }]} />}
      table={<StabilityTable periods={periods} />}
    >
      <ResponsiveLine
        data={data}
        theme={chartTheme}
        margin={{ top: 12, right: 18, bottom: 56, left: 58 }}
        xScale={{ type: 'linear', min: -0.5, max: rows.length - 0.5 }}
        yScale={{ type: 'linear', min: Math.floor(Math.min(...all) - 2), max: Math.ceil(Math.max(...all) + 2) }}
        axisBottom={{ tickValues: rows.map((_, index) => index), format: (value) => rows[Number(value)]?.period ?? '', tickRotation: -35 }}
        axisLeft={{ legend: 'Gini (points)', legendOffset: -46, legendPosition: 'middle', tickValues: 5 }}
        gridYValues={5}
        layers={['grid', 'axes', Bars, lines, 'mesh']}
        useMesh
        animate={false}
        tooltip={({ point }) => (
          <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
            <span className="font-medium">{seriesStyles[point.seriesId as 'champion' | 'challenger'].label}</span>, {rows[Number(point.data.x)]?.period}: Gini{' '}
            {formatGini(Number(point.data.y) / 100)}
          </div>
        )}
      />
    </ChartFrame>
  );
}

/** ΔGini by period with its paired DeLong interval, the zero line, and periods where the sign turned marked. */
export function DeltaGiniByPeriodChart({ periods, column, minBads }: { periods: readonly PeriodRow[]; column: string; minBads: number }) {
  const rows = usable(periods);
  const style = { ...seriesStyles.challenger, label: 'ΔGini (challenger − champion)' };
  const data: Series[] = [
    {
      id: 'delta',
      data: rows.map((row, index) => ({ x: index, y: row.deltaGini! * 100, low: row.deltaGiniCi![0] * 100, high: row.deltaGiniCi![1] * 100 })),
    },
  ];
  function Layer({ series, yScale, lineGenerator, innerWidth }: LineCustomSvgLayerProps<Series>) {
    const y = yScale as unknown as (value: number) => number;
    const points = series[0]?.data ?? [];
    return (
      <g>
        <line x1={0} x2={innerWidth} y1={y(0)} y2={y(0)} stroke={colors.ink.faint} strokeDasharray="2 4" strokeWidth={1.5} />
        <path d={lineGenerator(points.map((datum) => datum.position)) ?? undefined} fill="none" stroke={style.color} strokeWidth={style.width} strokeDasharray={style.dash} />
        {points.map((datum, index) => (
          <g key={index}>
            <line x1={datum.position.x} x2={datum.position.x} y1={y(datum.data.low!)} y2={y(datum.data.high!)} stroke={style.color} strokeWidth={1.5} />
            <MarkerShape x={datum.position.x} y={datum.position.y} style={style} size={rows[index].signChanged ? 12 : 8} />
            {rows[index].signChanged ? <circle cx={datum.position.x} cy={datum.position.y} r={10} fill="none" stroke={colors.bad.DEFAULT} strokeWidth={2} /> : null}
          </g>
        ))}
      </g>
    );
  }
  const changed = rows.filter((row) => row.signChanged);
  const all = data[0].data.flatMap((point) => [point.low!, point.high!, 0]);
  return (
    <ChartFrame
      title={`ΔGini by ${column}`}
      caption={`${
        changed.length === 0
          ? `The uplift keeps its sign in every period with at least ${minBads} bads.`
          : `The uplift changes sign in ${changed.map((row) => `${row.period} (${formatGiniDelta(row.deltaGini)} points, interval ${formatInterval(row.deltaGiniCi, formatGiniDelta)})`).join(', ')}: circled.`
      } Bars: paired DeLong intervals of ΔGini.`}
      legend={<ChartLegend items={[{ style }, { style: { ...seriesStyles.reference, label: 'No difference' } }]} />}
      table={<StabilityTable periods={periods} />}
    >
      <ResponsiveLine
        data={data}
        theme={chartTheme}
        margin={{ top: 12, right: 18, bottom: 56, left: 58 }}
        xScale={{ type: 'linear', min: -0.5, max: rows.length - 0.5 }}
        yScale={{ type: 'linear', min: Math.floor(Math.min(...all) - 1), max: Math.ceil(Math.max(...all) + 1) }}
        axisBottom={{ tickValues: rows.map((_, index) => index), format: (value) => rows[Number(value)]?.period ?? '', tickRotation: -35 }}
        axisLeft={{ legend: 'ΔGini (points)', legendOffset: -46, legendPosition: 'middle', tickValues: 5 }}
        gridYValues={5}
        layers={['grid', 'axes', Layer, 'mesh']}
        useMesh
        animate={false}
        tooltip={({ point }) => (
          <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
            {rows[Number(point.data.x)]?.period}: ΔGini {formatGiniDelta(Number(point.data.y) / 100)} points
          </div>
        )}
      />
    </ChartFrame>
  );
}

import { type LineCustomSvgLayerProps, ResponsiveLine } from '@nivo/line';
import { type ModelCalibration } from '@shared/calibration';
import { formatPercent } from '@/lib/format';
import { ChartFrame } from '@/components/charts/chart-frame';
import { ChartLegend } from '@/components/charts/chart-legend';
import { chartTheme, colors, seriesStyles } from '@/components/charts/chart-theme';
import { MarkerShape } from '@/components/charts/series-marker';
import { CalibrationTable } from './calibration-table';

type Point = { x: number; y: number; low: number; high: number; fails: boolean; label: string };
type Series = { id: string; data: Point[] };

/**
 * Observed bad rate against mean PD per band or grade, with each Wilson interval as a vertical bar
 * and the diagonal where the two agree. A group below the diagonal had fewer bads than its PD
 * said; one above it, more. Groups that fail the Jeffreys test are drawn larger and outlined.
 */
export function CalibrationChart({ model, calibration, alpha }: { model: 'champion' | 'challenger'; calibration: ModelCalibration; alpha: number }) {
  const style = seriesStyles[model];
  const rows = calibration.rows;
  const points: Point[] = rows.map((row) => ({
    x: row.meanPd,
    y: row.observedBadRate,
    low: row.observedBadRateCi?.[0] ?? row.observedBadRate,
    high: row.observedBadRateCi?.[1] ?? row.observedBadRate,
    fails: row.fails,
    label: row.label,
  }));
  const top = Math.min(1, Math.max(0.01, ...points.map((point) => Math.max(point.x, point.high))) * 1.08);
  const data: Series[] = [
    { id: 'diagonal', data: [{ x: 0, y: 0, low: 0, high: 0, fails: false, label: '' }, { x: top, y: top, low: top, high: top, fails: false, label: '' }] },
    { id: model, data: points },
  ];
  function Layer({ series, lineGenerator, yScale }: LineCustomSvgLayerProps<Series>) {
    const y = yScale as unknown as (value: number) => number;
    return (
      <g>
        {series.map((serie) =>
          serie.id === 'diagonal' ? (
            <path key="diagonal" d={lineGenerator(serie.data.map((d) => d.position)) ?? undefined} stroke={colors.ink.faint} strokeDasharray="2 4" strokeWidth={1.5} fill="none" />
          ) : (
            <g key={String(serie.id)}>
              {serie.data.map((datum, index) => (
                <g key={index}>
                  <line x1={datum.position.x} x2={datum.position.x} y1={y(datum.data.low)} y2={y(datum.data.high)} stroke={style.color} strokeWidth={1.5} />
                  <line x1={datum.position.x - 4} x2={datum.position.x + 4} y1={y(datum.data.low)} y2={y(datum.data.low)} stroke={style.color} strokeWidth={1.5} />
                  <line x1={datum.position.x - 4} x2={datum.position.x + 4} y1={y(datum.data.high)} y2={y(datum.data.high)} stroke={style.color} strokeWidth={1.5} />
                  <MarkerShape x={datum.position.x} y={datum.position.y} style={style} size={datum.data.fails ? 12 : 8} />
                  {datum.data.fails ? <circle cx={datum.position.x} cy={datum.position.y} r={10} fill="none" stroke={colors.ink.DEFAULT} strokeWidth={1.5} /> : null}
                </g>
              ))}
            </g>
          ),
        )}
      </g>
    );
  }
  const failing = rows.filter((row) => row.fails);
  const unit = calibration.groupedBy.kind === 'grades' ? 'grade' : 'band';
  const caption = `${rows.length} ${unit}s. ${
    failing.length === 0
      ? `No ${unit} has more bads than its PD allows at α = ${alpha} (Jeffreys test).`
      : `${failing.map((row) => row.label).join(', ')} ${failing.length === 1 ? 'has' : 'have'} more bads than ${failing.length === 1 ? 'its' : 'their'} PD allows at α = ${alpha} (Jeffreys test; circled).`
  } Portfolio: mean PD ${formatPercent(calibration.portfolio.meanPd, 2)}, observed ${formatPercent(calibration.portfolio.observedBadRate, 2)}.`;
  return (
    <ChartFrame
      title={`${model === 'champion' ? 'Champion' : 'Challenger'}: observed bad rate against mean PD`}
      caption={caption}
      legend={<ChartLegend items={[{ style, detail: 'observed, with its Wilson interval' }, { style: { ...seriesStyles.reference, label: 'Observed = PD' } }]} />}
      table={<CalibrationTable calibration={calibration} />}
    >
      <ResponsiveLine
        data={data}
        theme={chartTheme}
        margin={{ top: 12, right: 18, bottom: 48, left: 62 }}
        xScale={{ type: 'linear', min: 0, max: top }}
        yScale={{ type: 'linear', min: 0, max: top }}
        axisBottom={{ legend: 'Mean PD', legendOffset: 38, legendPosition: 'middle', tickValues: 5, format: (value) => formatPercent(Number(value), 0) }}
        axisLeft={{ legend: 'Observed bad rate', legendOffset: -52, legendPosition: 'middle', tickValues: 5, format: (value) => formatPercent(Number(value), 0) }}
        gridXValues={5}
        gridYValues={5}
        layers={['grid', 'axes', Layer, 'mesh']}
        useMesh
        animate={false}
        tooltip={({ point }) =>
          point.seriesId === 'diagonal' ? null : (
            <div className="rounded-md border border-line bg-paper-raised px-2 py-1 text-xs shadow">
              <span className="font-medium">{point.data.label}</span>: mean PD {formatPercent(Number(point.data.x), 2)}, observed {formatPercent(Number(point.data.y), 2)}
            </div>
          )
        }
      />
    </ChartFrame>
  );
}

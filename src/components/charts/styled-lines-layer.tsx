import { type LineCustomSvgLayerProps, type LineSeries } from '@nivo/line';
import { type SeriesStyle } from '@/components/charts/chart-theme';
import { MarkerShape } from '@/components/charts/series-marker';

/** The series shape the charts use: numeric x and y. */
export type XYSeries = { id: string; data: { x: number; y: number }[] };

/**
 * A nivo line layer that draws every series in its own style (dash pattern, width, markers every
 * `markerEvery` points), which nivo's own "lines" layer cannot do per series. Series ids must be
 * keys of `styles`.
 */
export function styledLinesLayer<Series extends LineSeries = XYSeries>(styles: Record<string, SeriesStyle>, markerCount = 9) {
  function StyledLines({ series, lineGenerator }: LineCustomSvgLayerProps<Series>) {
    return (
      <g>
        {series.map((serie) => {
          const style = styles[String(serie.id)];
          if (!style) return null;
          const points = serie.data.map((datum) => datum.position);
          const path = lineGenerator(points) ?? undefined;
          const every = Math.max(1, Math.floor(points.length / markerCount));
          return (
            <g key={String(serie.id)}>
              <path d={path} fill="none" stroke={style.color} strokeWidth={style.width} strokeDasharray={style.dash} strokeLinejoin="round" />
              {style.marker === 'none'
                ? null
                : points
                    .filter((_, index) => index % every === Math.floor(every / 2) && index > 0 && index < points.length - 1)
                    .map((point, index) => <MarkerShape key={index} x={point.x} y={point.y} style={style} />)}
            </g>
          );
        })}
      </g>
    );
  }
  return StyledLines;
}

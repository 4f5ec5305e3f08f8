import { type SeriesStyle } from '@/components/charts/chart-theme';
import { SeriesSwatch } from '@/components/charts/series-marker';

export interface LegendItem {
  style: SeriesStyle;
  /** Defaults to the style's label. */
  label?: string;
  /** A number after the label ("Gini 42.1"). */
  detail?: string;
}

/** A legend in HTML (readable, wraps on narrow screens): line sample, marker and words per series. */
export function ChartLegend({ items }: { items: LegendItem[] }) {
  return (
    <ul className="flex flex-wrap gap-x-5 gap-y-1.5 text-xs text-ink-soft" aria-label="Legend">
      {items.map((item) => (
        <li key={item.label ?? item.style.label} className="flex items-center gap-1.5">
          <SeriesSwatch style={item.style} />
          <span className="font-medium text-ink">{item.label ?? item.style.label}</span>
          {item.detail ? <span className="num">{item.detail}</span> : null}
        </li>
      ))}
    </ul>
  );
}

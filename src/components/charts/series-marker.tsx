import { type SeriesStyle } from '@/components/charts/chart-theme';

/** A marker shape centred on (x, y): the models' circle and triangle. */
export function MarkerShape({ x, y, style, size = 7 }: { x: number; y: number; style: SeriesStyle; size?: number }) {
  if (style.marker === 'none') return null;
  if (style.marker === 'circle') {
    return <circle cx={x} cy={y} r={size / 2} fill={style.color} stroke="#fff" strokeWidth={1} />;
  }
  const h = size * 0.95;
  const points = `${x},${y - h * 0.62} ${x + size * 0.58},${y + h * 0.42} ${x - size * 0.58},${y + h * 0.42}`;
  return <polygon points={points} fill={style.color} stroke="#fff" strokeWidth={1} />;
}

/** A short sample of a series' line and marker, for legends and labels beside numbers. */
export function SeriesSwatch({ style, width = 30 }: { style: SeriesStyle; width?: number }) {
  return (
    <svg width={width} height={12} viewBox={`0 0 ${width} 12`} aria-hidden="true" focusable="false" className="shrink-0">
      <line x1={1} y1={6} x2={width - 1} y2={6} stroke={style.color} strokeWidth={style.width} strokeDasharray={style.dash} />
      <MarkerShape x={width / 2} y={6} style={style} />
    </svg>
  );
}

import { type Chart, type Dash, inkColors, type Shape } from '@shared/pack/charts';

/**
 * A chart of the committee pack (shared/pack/charts.ts, the same drawing as the server's PDF) as
 * SVG. It scales with its box through the viewBox; below about 30rem the frame scrolls sideways
 * instead of shrinking the labels. The caption says the chart's message in words.
 */

const dashes: Record<Dash, string | undefined> = { solid: undefined, dashed: '5 3', dotted: '1.5 2.5' };

function ShapeSvg({ shape }: { shape: Shape }) {
  switch (shape.kind) {
    case 'line':
      return <line x1={shape.x1} y1={shape.y1} x2={shape.x2} y2={shape.y2} stroke={inkColors[shape.stroke]} strokeWidth={shape.width} strokeDasharray={dashes[shape.dash]} />;
    case 'polyline':
      return (
        <polyline
          points={shape.points.map(([x, y]) => `${x.toFixed(1)},${y.toFixed(1)}`).join(' ')}
          fill="none"
          stroke={inkColors[shape.stroke]}
          strokeWidth={shape.width}
          strokeDasharray={dashes[shape.dash]}
          strokeLinejoin="round"
        />
      );
    case 'rect':
      return (
        <rect
          x={shape.x}
          y={shape.y}
          width={shape.w}
          height={shape.h}
          fill={shape.fill ? inkColors[shape.fill] : 'none'}
          stroke={shape.stroke ? inkColors[shape.stroke] : undefined}
          strokeWidth={0.5}
        />
      );
    case 'marker': {
      const s = shape.size;
      const fill = inkColors[shape.fill];
      if (shape.shape === 'circle') return <circle cx={shape.x} cy={shape.y} r={s} fill={fill} />;
      const points =
        shape.shape === 'triangle'
          ? [[shape.x, shape.y - s * 1.15], [shape.x + s, shape.y + s * 0.75], [shape.x - s, shape.y + s * 0.75]]
          : [[shape.x, shape.y - s * 1.2], [shape.x + s, shape.y], [shape.x, shape.y + s * 1.2], [shape.x - s, shape.y]];
      return <polygon points={points.map(([x, y]) => `${x},${y}`).join(' ')} fill={fill} />;
    }
    case 'text':
      return (
        <text x={shape.x} y={shape.y} fontSize={shape.size} fontWeight={shape.bold ? 600 : 400} fill={inkColors[shape.fill]} textAnchor={shape.anchor === 'middle' ? 'middle' : shape.anchor}>
          {shape.text}
        </text>
      );
  }
}

export function PackChart({ chart }: { chart: Chart }) {
  const titleId = `pack-chart-${chart.id}`;
  return (
    <figure className="report-block space-y-1" aria-labelledby={titleId} data-chart={chart.id}>
      <h3 id={titleId} className="text-sm font-semibold text-ink">
        {chart.title}
      </h3>
      <div className="overflow-x-auto print:overflow-visible">
        <svg
          viewBox={`0 0 ${chart.width} ${chart.height}`}
          className="block h-auto w-full min-w-[30rem] print:min-w-0"
          style={{ maxWidth: `${chart.width * 1.5}px` }}
          role="img"
          aria-label={chart.caption}
          fontFamily='"Work Sans", system-ui, sans-serif'
        >
          {chart.shapes.map((shape, index) => (
            <ShapeSvg key={index} shape={shape} />
          ))}
        </svg>
      </div>
      <figcaption className="text-xs text-ink-soft">{chart.caption}</figcaption>
    </figure>
  );
}

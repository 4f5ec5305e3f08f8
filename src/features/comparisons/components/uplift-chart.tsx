import { type Report } from '@shared/report';
import { formatCount, formatGini, formatGiniDelta, formatInterval, formatPercent } from '@/lib/format';
import { useElementWidth } from '@/lib/use-element-width';
import { colors } from '@/components/charts/chart-theme';
import { describeUplift, upliftDomain, upliftTicks } from '@/features/comparisons/lib/uplift';

const LEFT = 200;
const RIGHT = 24;
const TOP = 40;
const ROW = 46;

/**
 * The uplift (ΔGini, challenger − champion) with its interval, drawn against zero (no difference)
 * and the adoption policy's materiality line; the bootstrap interval below it when there is one.
 * Every line is labelled in words on the drawing, and the caption says the same in a sentence.
 */
export function UpliftChart({ report }: { report: Report }) {
  const interval = report.difference.giniCi;
  if (interval === null) {
    return (
      <p className="text-sm text-ink-soft" role="note">
        No interval of the uplift: {report.difference.inference ?? 'the DeLong variance is undefined for this holdout'}.
      </p>
    );
  }
  return <UpliftDrawing report={report} interval={interval} />;
}

function UpliftDrawing({ report, interval }: { report: Report; interval: readonly [number, number] }) {
  const [ref, measured] = useElementWidth<HTMLDivElement>();
  const W = Math.max(420, measured);
  const { difference, policy, settings } = report;
  const materiality = policy.materialityGiniPoints / 100;
  const confidence = formatPercent(settings.confidence, 0);
  const rows: { label: string; sub: string; interval: readonly [number, number]; strong: boolean }[] = [
    { label: `DeLong ${confidence} interval`, sub: 'paired test, the verdict uses it', interval, strong: true },
  ];
  if (difference.giniBootstrapCi) {
    rows.push({ label: `Bootstrap ${confidence} interval`, sub: `${formatCount(report.bootstrap.replicates)} paired replicates, cross-check`, interval: difference.giniBootstrapCi, strong: false });
  }
  const all = rows.flatMap((row) => [...row.interval]);
  const domain = upliftDomain({ delta: difference.gini, interval: [Math.min(...all), Math.max(...all)], materiality });
  const ticks = upliftTicks(domain);
  const x = (value: number) => LEFT + ((value - domain[0]) / (domain[1] - domain[0])) * (W - LEFT - RIGHT);
  const height = TOP + rows.length * ROW + 52;
  const axisY = TOP + rows.length * ROW + 4;
  const caption = describeUplift(
    { delta: difference.gini, interval, materiality },
    { delta: formatGiniDelta(difference.gini), interval: formatInterval(interval), materiality: formatGini(materiality), confidence },
  );

  return (
    <figure className="space-y-2" aria-labelledby="uplift-title">
      <h3 id="uplift-title" className="text-sm font-semibold text-ink">
        Uplift in Gini points, challenger − champion
      </h3>
      <div ref={ref} className="w-full">
      {/* Drawn at least 420 wide; on a narrower screen the drawing scales down to fit (labels stay above 10 px). */}
      <svg viewBox={`0 0 ${W} ${height}`} className="block h-auto w-full" aria-hidden="true" focusable="false">
        {/* The material region: right of the materiality line. */}
        <rect x={x(materiality)} y={TOP - 8} width={Math.max(0, x(domain[1]) - x(materiality))} height={rows.length * ROW + 8} fill={colors.good.soft} opacity={0.55} />
        {ticks.map((tick) => (
          <g key={tick}>
            <line x1={x(tick)} x2={x(tick)} y1={TOP - 8} y2={axisY} stroke={colors.line.DEFAULT} />
            <line x1={x(tick)} x2={x(tick)} y1={axisY} y2={axisY + 5} stroke={colors.line.strong} />
            <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={x(tick)} y={axisY + 18} textAnchor="middle" fontSize={12} fill={colors.ink.soft}>
              {formatGiniDelta(tick)}
            </text>
          </g>
        ))}
        <line x1={LEFT} x2={W - RIGHT} y1={axisY} y2={axisY} stroke={colors.line.strong} />
        {/* Zero (no difference) labelled to its left, the policy's materiality line to its right, so the two never collide. */}
        <line x1={x(0)} x2={x(0)} y1={TOP - 14} y2={axisY} stroke={colors.ink.DEFAULT} strokeWidth={1.5} />
        <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={x(0) - 6} y={TOP - 20} textAnchor="end" fontSize={12} fontWeight={600} fill={colors.ink.DEFAULT}>
          {materiality === 0 ? '0 = no difference = materiality' : '0 = no difference'}
        </text>
        {materiality !== 0 ? (
          <>
            <line x1={x(materiality)} x2={x(materiality)} y1={TOP - 14} y2={axisY} stroke={colors.good.strong} strokeWidth={1.5} strokeDasharray="5 3" />
            <text
              paintOrder="stroke"
              stroke="#ffffff"
              strokeWidth={3}
              strokeLinejoin="round"
              // Near the right edge the label goes above the zero label's line, ending at the edge.
              x={x(materiality) + 190 > W ? W - RIGHT : x(materiality) + 6}
              y={x(materiality) + 190 > W ? TOP - 34 : TOP - 20}
              textAnchor={x(materiality) + 190 > W ? 'end' : 'start'}
              fontSize={12}
              fontWeight={600}
              fill={colors.good.strong}
            >
              {`materiality ${formatGiniDelta(materiality)} (policy v${policy.version})`}
            </text>
          </>
        ) : null}
        {rows.map((row, index) => {
          const y = TOP + index * ROW + ROW / 2 - 4;
          const [lo, hi] = row.interval;
          const stroke = row.strong ? colors.court[700] : colors.court[400];
          return (
            <g key={row.label}>
              <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={8} y={y - 3} fontSize={13} fontWeight={600} fill={colors.ink.DEFAULT}>
                {row.label}
              </text>
              <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={8} y={y + 13} fontSize={11} fill={colors.ink.soft}>
                {row.sub}
              </text>
              <line x1={x(lo)} x2={x(hi)} y1={y} y2={y} stroke={stroke} strokeWidth={row.strong ? 6 : 3} strokeLinecap="butt" />
              <line x1={x(lo)} x2={x(lo)} y1={y - 9} y2={y + 9} stroke={stroke} strokeWidth={2} />
              <line x1={x(hi)} x2={x(hi)} y1={y - 9} y2={y + 9} stroke={stroke} strokeWidth={2} />
              {x(hi) - x(lo) >= 36 ? (
                <>
                  <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={x(lo) - 6} y={y + 4} textAnchor="end" fontSize={12} fill={colors.ink.DEFAULT}>
                    {formatGiniDelta(lo)}
                  </text>
                  <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={x(hi) + 6} y={y + 4} textAnchor="start" fontSize={12} fill={colors.ink.DEFAULT}>
                    {formatGiniDelta(hi)}
                  </text>
                </>
              ) : (
                // Too narrow to label both ends apart: one label beside it.
                <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={x(hi) + 14} y={y + 4} textAnchor="start" fontSize={12} fill={colors.ink.DEFAULT}>
                  {formatInterval(row.interval, formatGiniDelta)}
                </text>
              )}
              {row.strong ? (
                <>
                  <path d={`M ${x(difference.gini)} ${y - 9} l 9 9 l -9 9 l -9 -9 z`} fill={colors.paper.raised} stroke={colors.court[800]} strokeWidth={2} />
                  <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={x(difference.gini)} y={y - 14} textAnchor="middle" fontSize={13} fontWeight={700} fill={colors.court[800]}>
                    {`estimate ${formatGiniDelta(difference.gini)}`}
                  </text>
                </>
              ) : null}
            </g>
          );
        })}
        <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={LEFT} y={height - 2} fontSize={11} fill={colors.ink.soft}>
          ← champion better
        </text>
        <text paintOrder="stroke" stroke="#ffffff" strokeWidth={3} strokeLinejoin="round" x={W - RIGHT} y={height - 2} textAnchor="end" fontSize={11} fill={colors.ink.soft}>
          challenger better →
        </text>
      </svg>
      </div>
      <figcaption className="max-w-prose text-sm text-ink-soft">{caption}</figcaption>
    </figure>
  );
}

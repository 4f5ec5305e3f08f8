import { type SegmentRow } from '@shared/report';
import { formatGiniDelta, formatInterval, formatPValue } from '@/lib/format';
import { useElementWidth } from '@/lib/use-element-width';
import { ChartFrame } from '@/components/charts/chart-frame';
import { colors } from '@/components/charts/chart-theme';

const ROW = 26;
const TOP = 16;
const LEFT = 210;
const RIGHT = 24;

/** "significantly worse, materially worse" — the flags in words. */
export function flagWords(row: Pick<SegmentRow, 'flags' | 'tooFewBads'>): string {
  const words: string[] = row.flags.map((flag) => (flag === 'significantly-worse' ? 'significantly worse' : 'materially worse'));
  if (row.tooFewBads) words.push('too few bads');
  return words.join(', ');
}

/**
 * Each segment value's ΔGini with its DeLong interval at the report's confidence, drawn against
 * zero and minus the materiality: a forest plot, so a value where the challenger is worse stands
 * out. Flagged values are drawn in the "bad" colour with a filled square and named in words.
 */
export function SegmentIntervalsChart({ segments, materiality, confidence }: { segments: SegmentRow[]; materiality: number; confidence: string }) {
  const [ref, measured] = useElementWidth<HTMLDivElement>();
  const rows = segments.filter((row) => row.deltaGini !== null);
  if (rows.length === 0) return null;
  const W = Math.max(480, measured);
  const values = rows.flatMap((row) => (row.giniCi ? [...row.giniCi] : [row.deltaGini!]));
  const lo = Math.min(0, -materiality, ...values);
  const hi = Math.max(0, ...values);
  const pad = (hi - lo) * 0.05 || 0.01;
  const domain: [number, number] = [lo - pad, hi + pad];
  const x = (v: number) => LEFT + ((v - domain[0]) / (domain[1] - domain[0])) * (W - LEFT - RIGHT);
  const height = TOP + rows.length * ROW + 30;
  const flagged = rows.filter((row) => row.flags.length > 0);
  const caption = `ΔGini within each segment value with its ${confidence} DeLong interval (two-sided). ${
    flagged.length === 0
      ? 'No value is flagged.'
      : `Flagged: ${flagged.map((row) => `${row.column} = ${row.value} (${formatGiniDelta(row.deltaGini)} points, ${flagWords(row)})`).join('; ')}.`
  }`;
  const table = (
    <table className="w-full text-sm">
      <caption className="sr-only">ΔGini and its interval per segment value</caption>
      <thead>
        <tr>
          <th scope="col" className="text-left">Segment value</th>
          <th scope="col" className="text-right">ΔGini</th>
          <th scope="col" className="text-right">{confidence} interval</th>
          <th scope="col" className="text-right">p, two-sided, Holm</th>
          <th scope="col" className="text-left">Flags</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((row) => (
          <tr key={`${row.column}=${row.value}`}>
            <th scope="row" className="text-left font-normal">{`${row.column} = ${row.value}`}</th>
            <td className="text-right">{formatGiniDelta(row.deltaGini)}</td>
            <td className="text-right">{formatInterval(row.giniCi, formatGiniDelta)}</td>
            <td className="text-right">{formatPValue(row.pHolm)}</td>
            <td>{flagWords(row) || 'none'}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
  return (
    <ChartFrame title="ΔGini by segment value, with intervals" caption={caption} table={table} height={height}>
      <div ref={ref} className="w-full">
        <svg width={W} height={height} viewBox={`0 0 ${W} ${height}`} className="block h-auto max-w-full" aria-hidden="true" focusable="false">
          <line x1={x(0)} x2={x(0)} y1={TOP - 8} y2={height - 24} stroke={colors.ink.faint} strokeDasharray="2 4" />
          {materiality > 0 ? <line x1={x(-materiality)} x2={x(-materiality)} y1={TOP - 8} y2={height - 24} stroke={colors.bad.DEFAULT} strokeDasharray="4 3" /> : null}
          <text x={x(0)} y={height - 8} textAnchor="middle" fontSize={12} fill={colors.ink.soft}>0</text>
          {materiality > 0 ? (
            <text x={x(-materiality)} y={height - 8} textAnchor="middle" fontSize={12} fill={colors.ink.soft}>{`−${formatGiniDelta(materiality).replace(/^[+−-]/, '')} materiality`}</text>
          ) : null}
          {rows.map((row, i) => {
            const y = TOP + i * ROW + ROW / 2;
            const bad = row.flags.length > 0;
            const stroke = bad ? colors.bad.DEFAULT : colors.court[800];
            return (
              <g key={`${row.column}=${row.value}`}>
                <text x={LEFT - 8} y={y + 4} textAnchor="end" fontSize={12} fill={colors.ink.DEFAULT} fontWeight={bad ? 700 : 400}>
                  {`${row.column} = ${row.value}${bad ? ' ⚑' : ''}`}
                </text>
                {row.giniCi ? <line x1={x(row.giniCi[0])} x2={x(row.giniCi[1])} y1={y} y2={y} stroke={stroke} strokeWidth={2} /> : null}
                <rect x={x(row.deltaGini!) - 4} y={y - 4} width={8} height={8} fill={bad ? stroke : colors.paper.raised} stroke={stroke} strokeWidth={2} />
              </g>
            );
          })}
        </svg>
      </div>
    </ChartFrame>
  );
}

import { type PartialTheme } from '@nivo/theming';
import tailwind from '../../../tailwind.config';

/**
 * The palette of tailwind.config.ts as plain colours for SVG charts (presentation attributes do
 * not read CSS variables), the look of each series, and the nivo theme. One source for colours.
 */
export const colors = tailwind.theme.extend.colors;

export type SeriesKey = 'champion' | 'challenger' | 'reference' | 'perfect';

export interface SeriesStyle {
  label: string;
  color: string;
  /** SVG stroke-dasharray; undefined for a solid line. */
  dash?: string;
  width: number;
  /** The marker drawn along the line, so the models differ in shape as well as colour. */
  marker: 'circle' | 'triangle' | 'none';
}

/**
 * Champion: violet, solid, circles. Challenger: copper, dashed, triangles. Reference lines
 * (random model, perfect model): grey, dotted, no markers. Colour is never the only difference.
 */
export const seriesStyles: Record<SeriesKey, SeriesStyle> = {
  champion: { label: 'Champion', color: colors.champion.DEFAULT, width: 2.25, marker: 'circle' },
  challenger: { label: 'Challenger', color: colors.challenger.DEFAULT, dash: '7 4', width: 2.25, marker: 'triangle' },
  reference: { label: 'Random (no separation)', color: colors.ink.faint, dash: '2 4', width: 1.5, marker: 'none' },
  perfect: { label: 'Perfect separation', color: colors.court[300], dash: '2 4', width: 1.5, marker: 'none' },
};

export const chartTheme: PartialTheme = {
  background: 'transparent',
  text: { fontFamily: '"Work Sans", system-ui, sans-serif', fontSize: 12, fill: colors.ink.soft },
  axis: {
    domain: { line: { stroke: colors.line.strong, strokeWidth: 1 } },
    ticks: { line: { stroke: colors.line.strong, strokeWidth: 1 }, text: { fill: colors.ink.soft, fontSize: 11 } },
    legend: { text: { fill: colors.ink.DEFAULT, fontSize: 12, fontWeight: 500 } },
  },
  grid: { line: { stroke: colors.line.DEFAULT, strokeWidth: 1 } },
  crosshair: { line: { stroke: colors.court[500], strokeWidth: 1, strokeOpacity: 0.6 } },
  tooltip: {
    container: {
      background: colors.paper.raised,
      color: colors.ink.DEFAULT,
      fontSize: 12,
      borderRadius: 6,
      border: `1px solid ${colors.line.DEFAULT}`,
      boxShadow: '0 2px 8px rgb(0 0 0 / 0.12)',
      padding: '6px 9px',
    },
  },
};

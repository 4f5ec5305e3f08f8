import type { Calibration, ModelCalibration, Psi, Stability } from '@shared/calibration';
import { formatCount, formatDecimal, formatFixed, formatGini, formatGiniDelta, formatKs, formatPercent, formatPValue } from '@shared/format';

/**
 * The CLI's readable summary of the calibration and stability sections (shared/calibration.ts).
 * Lines only; compare.ts places them. Nothing when the report has neither section to show.
 */

// Numbers as everywhere else (shared/format.ts): rates as percentages with two decimals here,
// p-values by the one p rule, Gini and KS in points.
const pct = (value: number | null) => formatPercent(value, 2);
const pValue = (p: number) => formatPValue(p);
const signed = formatGiniDelta;
const int = formatCount;
const pad = (text: string, width: number) => text.padEnd(width);

function modelLines(name: string, model: ModelCalibration, calibration: Calibration): string[] {
  const lines: string[] = [];
  const by = model.groupedBy.kind === 'grades' ? `grades of ${model.groupedBy.column}` : 'quantile bands';
  lines.push(`  ${name}, by ${by}${calibration.weighted ? ' (weighted; tests on effective counts)' : ''}`);
  lines.push(`    ${pad('', 12)}${pad('accounts', 10)}${pad('mean PD', 9)}${pad('bad rate', 10)}${pad('Wilson CI', 20)}${pad('exp. bads', 11)}${pad('obs. bads', 11)}${pad('Jeffreys p', 14)}binomial p`);
  for (const row of [...model.rows, model.portfolio]) {
    const ci = row.observedBadRateCi === null ? '—' : `[${pct(row.observedBadRateCi[0])}, ${pct(row.observedBadRateCi[1])}]`;
    lines.push(
      `    ${pad(row.label, 12)}${pad(int(row.accounts), 10)}${pad(pct(row.meanPd), 9)}${pad(pct(row.observedBadRate), 10)}${pad(ci, 20)}${pad(int(row.expectedBads), 11)}${pad(int(row.observedBads), 11)}${pad(pValue(row.jeffreysP), 14)}${pValue(row.binomialP)}${row.fails ? '  FAILS' : ''}`,
    );
  }
  const b = model.brier;
  lines.push(`    Brier ${formatFixed(b.brier, 5)} = reliability ${formatFixed(b.reliability, 5)} − resolution ${formatFixed(b.resolution, 5)} + uncertainty ${formatFixed(b.uncertainty, 5)} + within groups ${formatFixed(b.withinGroup, 5)}`);
  return lines;
}

function psiLine(name: string, value: Psi): string {
  return `  ${pad(name, 12)}PSI ${formatFixed(value.psi, 4)} (${value.rating}; 0.1 / 0.25 common practice, no source), critical value ${formatFixed(value.criticalValue, 4)} at α = ${formatDecimal(value.criticalAlpha, 3)} for ${value.bands.length} bands: ${value.significant ? 'the populations differ' : 'no significant shift'}${value.emptyBandsAdjusted > 0 ? ` (${value.emptyBandsAdjusted} empty bands taken as 0.5)` : ''}`;
}

export function calibrationStabilityLines(calibration: Calibration | undefined, stability: Stability | undefined): string[] {
  const lines: string[] = [];
  if (calibration && (calibration.champion || calibration.challenger)) {
    lines.push('');
    lines.push(
      `Calibration of the probabilities of default (Jeffreys and exact binomial tests, one-sided, H0: the PD is not underestimated; FAILS: Jeffreys p < ${calibration.alpha})`,
    );
    if (calibration.champion) lines.push(...modelLines('Champion', calibration.champion, calibration));
    if (calibration.challenger) lines.push(...modelLines('Challenger', calibration.challenger, calibration));
  }
  if (stability && stability.periods.length > 0) {
    lines.push('');
    lines.push(`Stability by ${stability.periodColumn} (Gini and ΔGini in points, DeLong intervals; PSI against the previous period)`);
    lines.push(`  ${pad('period', 10)}${pad('accounts', 10)}${pad('bads', 7)}${pad('champion', 10)}${pad('challenger', 12)}${pad('ΔGini', 8)}${pad('ΔGini CI', 18)}${pad('KS ch/cl', 12)}PSI ch/cl`);
    for (const row of stability.periods) {
      const gini = formatGini;
      const ci = row.deltaGiniCi === null ? '—' : `[${signed(row.deltaGiniCi[0])}, ${signed(row.deltaGiniCi[1])}]`;
      const ksText = row.championKs === null ? '—' : `${formatKs(row.championKs)}/${formatKs(row.challengerKs)}`;
      const psi = (value: number | null | undefined) => (value === null || value === undefined ? '—' : formatFixed(value, 3));
      const psiText = row.championPsiFromPrevious === null ? '—' : `${psi(row.championPsiFromPrevious)}/${psi(row.challengerPsiFromPrevious)}`;
      lines.push(
        `  ${pad(row.period, 10)}${pad(int(row.accounts), 10)}${pad(int(row.bads), 7)}${pad(gini(row.championGini), 10)}${pad(gini(row.challengerGini), 12)}${pad(signed(row.deltaGini), 8)}${pad(ci, 18)}${pad(ksText, 12)}${psiText}${
          row.signChanged ? '  SIGN CHANGE' : row.enoughBads ? '' : '  (few bads)'
        }`,
      );
    }
    lines.push(
      stability.signChanges.length > 0
        ? `  The uplift changes sign in ${stability.signChanges.join(', ')} (periods with at least ${stability.minBads} bads).`
        : `  The uplift keeps its sign in every period with at least ${stability.minBads} bads.`,
    );
  }
  if (stability?.psi) {
    const { reference } = stability.psi;
    lines.push('');
    lines.push(
      `Population stability against ${reference.kind === 'file' ? `the reference sample ${reference.fileName} (${int(reference.rows)} accounts)` : `period ${reference.period} (${int(reference.rows)} accounts)`}, compared: ${stability.psi.actual}`,
    );
    lines.push(psiLine('Champion', stability.psi.champion));
    lines.push(psiLine('Challenger', stability.psi.challenger));
  }
  return lines;
}

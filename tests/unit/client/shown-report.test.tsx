import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { type CurrentVerdict, currentVerdictSchema } from '@shared/comparisons';
import { type Report, reportSchema } from '@shared/report';
import { challengerOptions } from '@/features/governance/lib/choosing';
import { shownReport } from '@/features/comparisons/lib/shown-report';

// A real engine report with three challengers (tests/unit/client/fixtures/make-three-challengers.ts):
// CF-4 open banking supported and recommended, the other two not proven, under policy version 2.
const report = reportSchema.parse(JSON.parse(readFileSync(resolve(process.cwd(), 'tests/unit/client/fixtures/three-challengers-report.json'), 'utf8'))) as Report;

/** The record after a re-evaluation under a stricter policy (version 3): no challenger supported. */
function reEvaluated(overrides: Partial<CurrentVerdict> = {}): CurrentVerdict {
  return currentVerdictSchema.parse({
    id: 7,
    runId: 1,
    policyVersion: 3,
    outcome: 'not-proven',
    criteria: [],
    summary: 'Not proven under version 3.',
    createdAt: '2026-12-02T10:00:00.000Z',
    challengers: report.challengers!.map((challenger, index) => ({
      challenger: index,
      column: challenger.column,
      name: challenger.name,
      outcome: 'not-proven',
      criteria: [{ id: 'materiality', label: 'Materiality', met: false, detail: 'Below the version 3 threshold.' }],
      summary: `${challenger.name}: not proven under version 3.`,
    })),
    recommended: null,
    choiceSummary: 'No challenger is recommended: none of the 3 is supported under the adoption policy (version 3).',
    ...overrides,
  });
}

describe('the report as the current verdict record shows it (several challengers)', () => {
  it('takes each challenger’s verdict and the recommended one from the record, not from the run', () => {
    expect(report.choice!.recommended).toBe(1);
    const shown = shownReport(report, reEvaluated());
    expect(shown.choice).toEqual({ recommended: null, summary: 'No challenger is recommended: none of the 3 is supported under the adoption policy (version 3).' });
    expect(shown.challengers!.map((challenger) => [challenger.verdict.outcome, challenger.verdict.policyVersion, challenger.verdict.summary])).toEqual([
      ['not-proven', 3, 'CF-3 bureau: not proven under version 3.'],
      ['not-proven', 3, 'CF-4 open banking: not proven under version 3.'],
      ['not-proven', 3, 'Refit 2025: not proven under version 3.'],
    ]);
    // The committee's forms read the shown report: none is offered as recommended any more.
    expect(challengerOptions(shown).map((option) => [option.name, option.outcome, option.recommended])).toEqual([
      ['CF-3 bureau', 'not-proven', false],
      ['CF-4 open banking', 'not-proven', false],
      ['Refit 2025', 'not-proven', false],
    ]);
    // Figures stay the run's.
    expect(shown.challengers!.map((challenger) => challenger.difference)).toEqual(report.challengers!.map((challenger) => challenger.difference));
  });

  it('leaves the report as it is without a record, with a record of other challengers, or one stored before several challengers', () => {
    expect(shownReport(report, null)).toBe(report);
    expect(shownReport(report, reEvaluated({ challengers: [] }))).toBe(report);
    const renamed = reEvaluated();
    renamed.challengers[2] = { ...renamed.challengers[2], column: 'another_score' };
    expect(shownReport(report, renamed)).toBe(report);
  });
});

import { equalApprovalSentence } from '@shared/equal-approval-words';
import { keptValuesText } from '@shared/mixed-strategy-words';
import { comparisonStateLabels, type ComparisonState } from '@shared/comparisons';
import {
  formatCount,
  formatDateTime,
  formatGini,
  formatKs,
  formatNumber,
  formatPercent,
  formatScore,
} from '@shared/format';
import { voteChoiceLabels, type AuditEvent, type Governance, type Note } from '@shared/governance';
import { type Chart, ksChart, rocChart, segmentIntervalsChart, strategyChart, swapGridChart, upliftChart } from '@shared/pack/charts';
import { noSegmentsSentence, segmentsTable } from '@shared/segments-words';
import { dataFacts, metricsTable, settingsFacts, swapBasisSentence, swapSegmentsTable, swapSetsTable, testsTable } from '@shared/pack/evidence-words';
import { committeeDecidesNote, criteriaTable, noDecisionSentence, notDecidedSentence, policyInOneSentence, shortenedHashesNote, verdictHeading, verdictRecordsNote } from '@shared/pack/record-words';
import { type BandTable, type Report } from '@shared/report';
import { strategyBlocks } from './strategy-blocks';
import { calibrationStability } from './calibration-section';
import { severalChallengers } from './challengers-section';
import { chosenModelWords, hasSeveralChallengers } from '@shared/challengers-words';

/**
 * The committee pack's content, from the stored report and the governance record, as a list of
 * sections of plain blocks (headings, paragraphs, facts, tables of formatted text, charts). The
 * PDF renderer (pdf.ts) lays them out; it knows nothing of reports. A new part of the report is
 * one more section function in `packSections`. Every number goes through shared/format.ts, the
 * format module the pages use, so the PDF reads as the screen does.
 */

export interface PackComparison {
  id: number;
  name: string;
  description: string;
  state: ComparisonState;
  createdBy: string;
  createdAt: string;
  runId: number | null;
}

export interface PackInput {
  report: Report;
  comparison: PackComparison;
  governance: Governance;
  audit: { events: AuditEvent[]; chainValid: boolean };
  notes: Note[];
  generatedAt: Date;
  /** Who the pack was made for: the person downloading it, or the committee member deciding. */
  generatedFor: string | null;
  /** Set when this is the pack archived with the decision. */
  archivedWithDecision: boolean;
}

export interface PackTable {
  kind: 'table';
  title: string;
  note?: string;
  head: string[];
  rows: string[][];
  /** Columns holding numbers: right-aligned, never wrapped. */
  numeric: number[];
}

export type Block =
  | { kind: 'subheading'; text: string }
  | { kind: 'paragraph'; text: string; muted?: boolean }
  | { kind: 'facts'; rows: [string, string][] }
  | PackTable
  | { kind: 'chart'; chart: Chart };

export interface Section {
  title: string;
  blocks: Block[];
}

const utc = (value: string | Date) => `${formatDateTime(value, 'UTC')} UTC`;

function summary(input: PackInput): Section {
  const { report, comparison, governance } = input;
  const { verdict } = report;
  const blocks: Block[] = [
    { kind: 'paragraph', text: comparison.name },
    ...(comparison.description ? [{ kind: 'paragraph' as const, text: comparison.description, muted: true }] : []),
    {
      kind: 'paragraph',
      muted: true,
      text: `Comparison ${comparison.id} · ${comparisonStateLabels[comparison.state]} · created by ${comparison.createdBy} on ${utc(comparison.createdAt)} · pack made ${utc(input.generatedAt)}${input.generatedFor ? ` for ${input.generatedFor}` : ''} by Scorecourt${input.archivedWithDecision ? ' · the pack archived with the committee’s decision' : ''}`,
    },
    { kind: 'subheading', text: `${verdictHeading(verdict)}: ${verdictLabel(verdict.outcome)}` },
    { kind: 'paragraph', text: verdict.summary },
    { kind: 'table', title: 'Adoption criteria', ...criteriaTable(verdict) },
    governance.decision
      ? {
          kind: 'paragraph',
          text: `Decision: ${voteChoiceLabels[governance.decision.outcome]}${hasSeveralChallengers(report) && governance.decision.chosen ? ` — ${chosenModelWords(governance.decision.chosen)}` : ''}${governance.decision.strategy ? `, except in ${keptValuesText(governance.decision.strategy)}, which keep the champion` : ''}, recorded by ${governance.decision.decidedBy.name} on ${utc(governance.decision.createdAt)}. ${governance.decision.rationale}`,
        }
      : { kind: 'paragraph', muted: true, text: noDecisionSentence(comparison.state) },
    { kind: 'subheading', text: 'Data' },
    { kind: 'facts', rows: dataFacts(report) },
    { kind: 'subheading', text: 'Settings and engine' },
    { kind: 'facts', rows: settingsFacts(report, comparison.runId === null ? '—' : String(comparison.runId)) },
    {
      kind: 'paragraph',
      muted: true,
      text:
        'Cautions: these statistics describe one holdout of past applicants whose outcomes were observed; accounts the champion declined have no outcome, so the swap-in’s bad rate rests on the accounts that were approved. ' +
        'A decision to change the model changes who is offered credit: check it for fair treatment and against the lending rules that apply before it takes effect, and monitor it after.',
    },
  ];
  return { title: 'Champion–challenger comparison: committee pack', blocks };
}

function verdictLabel(outcome: Report['verdict']['outcome']): string {
  return outcome === 'supported' ? 'challenger supported' : outcome === 'champion-better' ? 'champion better' : 'not proven';
}

function metrics(input: PackInput): Section {
  const { report } = input;
  return {
    title: 'Evidence: metrics and tests',
    blocks: [
      { kind: 'table', title: 'Metrics', ...metricsTable(report) },
      { kind: 'chart', chart: upliftChart(report) },
      { kind: 'table', title: 'Tests', ...testsTable(report) },
      { kind: 'chart', chart: rocChart(report) },
      { kind: 'chart', chart: ksChart(report) },
    ],
  };
}

function bandTable(title: string, table: BandTable): PackTable {
  return {
    kind: 'table',
    title,
    note: `Band 1 is the riskiest. Trapezoid Gini over the bands ${formatGini(table.giniTrapezoid)}.`,
    head: ['Band', 'Score from', 'Score to', 'Accounts', 'Goods', 'Bads', 'Bad rate', 'Cum. bads', 'Cum. goods', 'KS', 'Odds'],
    numeric: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10],
    rows: table.rows.map((row) => [
      String(row.band),
      formatScore(row.scoreMin),
      formatScore(row.scoreMax),
      formatCount(row.count),
      formatCount(row.goods),
      formatCount(row.bads),
      formatPercent(row.badRate, 2),
      formatPercent(row.cumBadShare),
      formatPercent(row.cumGoodShare),
      formatKs(row.ks),
      row.odds === null ? '—' : formatNumber(row.odds, 1),
    ]),
  };
}

function bands(input: PackInput): Section {
  return {
    title: 'Band tables',
    blocks: [bandTable('Champion bands', input.report.bands.champion), bandTable('Challenger bands', input.report.bands.challenger)],
  };
}


function swapSets(input: PackInput): Section {
  const { report } = input;
  const bySegment = swapSegmentsTable(report);
  const blocks: Block[] = [
    { kind: 'paragraph', text: swapBasisSentence(report.swap) },
    { kind: 'table', title: 'Swap sets at the report’s cut-offs', ...swapSetsTable(report) },
    { kind: 'chart', chart: swapGridChart(report) },
    ...(bySegment ? [{ kind: 'table' as const, title: 'Swap sets by segment', ...bySegment }] : []),
    { kind: 'subheading', text: 'Strategy curve' },
    { kind: 'paragraph', text: equalApprovalSentence(report.strategyCurve.atApprovalRate) },
    { kind: 'chart', chart: strategyChart(report) },
    {
      kind: 'table',
      title: 'Strategy curve',
      note: 'Bad rate of the approved book at each approval rate, and of the accounts added since the previous rate.',
      head: ['Approval rate', 'Champion cut-off', 'Champion bad rate', 'Champion marginal', 'Challenger cut-off', 'Challenger bad rate', 'Challenger marginal'],
      numeric: [0, 1, 2, 3, 4, 5, 6],
      rows: report.strategyCurve.points.map((point) => [
        formatPercent(point.approvalRate, 0),
        formatScore(point.champion.cutoff),
        formatPercent(point.champion.portfolioBadRate, 2),
        formatPercent(point.champion.marginalBadRate, 2),
        formatScore(point.challenger.cutoff),
        formatPercent(point.challenger.portfolioBadRate, 2),
        formatPercent(point.challenger.marginalBadRate, 2),
      ]),
    },
  ];
  return { title: 'Who changes sides: swap sets and the strategy curve', blocks };
}

function segments(input: PackInput): Section {
  const { report } = input;
  const table = segmentsTable(report);
  if (!table) return { title: 'Segments', blocks: [{ kind: 'paragraph', text: noSegmentsSentence }] };
  const chart = segmentIntervalsChart(report);
  return {
    title: 'Segments',
    blocks: [{ kind: 'table', title: 'Segments', ...table }, ...(chart ? [{ kind: 'chart' as const, chart }] : [])],
  };
}

function swapMatrix(input: PackInput): Section {
  const matrix = input.report.swapMatrix;
  const head = ['Champion band', ...matrix.challengerBands.map((band) => `C${band.band}`), 'All'];
  const rows = matrix.cells.map((row, i) => {
    const band = matrix.championBands[i];
    return [`${band.band} (${formatScore(band.scoreMin)}–${formatScore(band.scoreMax)})`, ...row.map((cell) => formatCount(cell.count)), formatCount(row.reduce((sum, cell) => sum + cell.count, 0))];
  });
  return {
    title: 'Swap matrix',
    blocks: [
      {
        kind: 'table',
        title: 'Accounts by champion band (rows) and challenger band (columns)',
        note: `Band 1 is each model’s riskiest. Challenger bands: ${matrix.challengerBands.map((band) => `C${band.band} ${formatScore(band.scoreMin)}–${formatScore(band.scoreMax)}`).join('; ')}.`,
        head,
        numeric: head.map((_, index) => index).slice(1),
        rows,
      },
      {
        kind: 'table',
        title: 'Bad rate by champion band (rows) and challenger band (columns)',
        head: head.slice(0, -1),
        numeric: head.map((_, index) => index).slice(1, -1),
        rows: matrix.cells.map((row, i) => [String(matrix.championBands[i].band), ...row.map((cell) => formatPercent(cell.badRate))]),
      },
    ],
  };
}

function dataQuality(input: PackInput): Section {
  const quality = input.report.dataQuality;
  const summaryRow = (label: string, s: typeof quality.champion) => [label, formatScore(s.min), formatScore(s.max), formatScore(s.mean), formatCount(s.distinct)];
  return {
    title: 'Data quality',
    blocks: [
      {
        kind: 'facts',
        rows: [
          ['Rows read', formatCount(quality.rowsRead)],
          ['Rows used', formatCount(quality.rowsUsed)],
          ['Left out for a missing score', formatCount(quality.rowsDroppedMissingScore)],
          ['Duplicate ids', quality.duplicateIds === null ? 'no id column' : formatCount(quality.duplicateIds)],
          ['Score correlation (Pearson)', formatNumber(quality.scoreCorrelation.pearson, 3)],
          ['Score correlation (Spearman)', formatNumber(quality.scoreCorrelation.spearman, 3)],
        ],
      },
      {
        kind: 'table',
        title: 'Scores as given',
        head: ['Model', 'Lowest', 'Highest', 'Mean', 'Distinct values'],
        numeric: [1, 2, 3, 4],
        rows: [summaryRow('Champion', quality.champion), summaryRow('Challenger', quality.challenger)],
      },
      {
        kind: 'table',
        title: 'Empty cells by column',
        head: ['Column', 'Empty cells'],
        numeric: [1],
        rows: Object.entries(quality.missingByColumn).map(([column, count]) => [column, formatCount(count)]),
      },
      quality.warnings.length > 0
        ? { kind: 'paragraph', text: `Warnings: ${quality.warnings.join(' ')}` }
        : { kind: 'paragraph', muted: true, text: 'No data-quality warnings.' },
    ],
  };
}

function governanceRecord(input: PackInput): Section {
  const { governance, report, notes } = input;
  const blocks: Block[] = [
    { kind: 'paragraph', muted: true, text: policyInOneSentence(report.policy) },
    {
      kind: 'table',
      title: 'Verdict records',
      note: verdictRecordsNote,
      head: ['When', 'Run', 'Policy', 'Verdict', 'By', 'Summary'],
      numeric: [1, 2],
      rows: governance.verdicts.map((record) => [utc(record.createdAt), String(record.runId), String(record.policyVersion), verdictLabel(record.outcome), record.createdBy?.name ?? 'Scorecourt', record.summary]),
    },
    {
      kind: 'table',
      title: 'Review findings',
      head: ['When', 'Analyst', 'Outcome', 'Findings'],
      numeric: [],
      rows: governance.reviews.map((review) => [utc(review.createdAt), review.reviewer.name, review.outcome === 'validated' ? 'Validated' : 'Returned', review.findings]),
    },
    {
      kind: 'table',
      title: `Committee votes (quorum ${governance.quorum || 'none'})`,
      head: ['When', 'Member', 'Vote', 'Comment'],
      numeric: [],
      rows: governance.votes.map((vote) => [
        utc(vote.createdAt),
        vote.voter.name,
        `${voteChoiceLabels[vote.vote]}${hasSeveralChallengers(report) && vote.vote === 'adopt' && vote.challenger !== null ? `: ${report.challengers[vote.challenger]?.name ?? `challenger ${vote.challenger + 1}`}` : ''}`,
        vote.comment,
      ]),
    },
  ];
  const decision = governance.decision;
  blocks.push({ kind: 'subheading', text: 'Decision' });
  if (decision) {
    blocks.push({
      kind: 'facts',
      rows: [
        ['Outcome', voteChoiceLabels[decision.outcome]],
        ...(hasSeveralChallengers(report) && decision.chosen ? ([['Model chosen', chosenModelWords(decision.chosen)!]] as [string, string][]) : []),
        ['Recorded by', decision.decidedBy.name],
        ['When', utc(decision.createdAt)],
        ['Analysis run', String(decision.runId)],
        ['Policy version', String(decision.policyVersion)],
        ['Effective', decision.effectiveDate ?? '—'],
        ['Rationale', decision.rationale],
        ['Conditions', decision.conditions ?? 'none'],
        ...(decision.strategy ? ([['Champion kept in', keptValuesText(decision.strategy)]] as [string, string][]) : []),
      ],
    });
    if (decision.strategy) blocks.push(...strategyBlocks(decision.strategy));
  } else {
    blocks.push({ kind: 'paragraph', muted: true, text: notDecidedSentence });
  }
  if (notes.length > 0) {
    blocks.push({
      kind: 'table',
      title: 'Notes and discussion',
      head: ['When', 'Who', 'About', 'Note'],
      numeric: [],
      rows: notes.map((note) => [utc(note.createdAt), note.author.name, note.afterDecision ? `${note.anchor} (after the decision)` : note.anchor, note.body]),
    });
  }
  blocks.push({ kind: 'paragraph', muted: true, text: committeeDecidesNote });
  return { title: 'Verdict, review and decision', blocks };
}

function auditTrail(input: PackInput): Section {
  const { events, chainValid } = input.audit;
  return {
    title: 'Audit trail',
    blocks: [
      {
        kind: 'paragraph',
        text: `${formatCount(events.length)} events; the hash chain ${chainValid ? 'verifies' : 'does NOT verify'}. ${shortenedHashesNote}`,
      },
      {
        kind: 'table',
        title: 'Audit trail',
        head: ['When (UTC)', 'Who', 'What', 'Hash'],
        numeric: [],
        rows: events.map((event) => [formatDateTime(event.createdAt, 'UTC'), event.actor ? `${event.actor.name}${event.actor.email ? ` (${event.actor.email})` : ''}` : 'Scorecourt', event.action, `${event.hash.slice(0, 16)}…`]),
      },
    ],
  };
}

/** The pack's sections in order; null: the report has nothing for it. A new section of the report is added here, in one place. */
export const packSections: ((input: PackInput) => Section | null)[] = [
  summary,
  severalChallengers,
  metrics,
  swapSets,
  segments,
  calibrationStability,
  bands,
  swapMatrix,
  dataQuality,
  governanceRecord,
  auditTrail,
];

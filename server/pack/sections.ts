import { comparisonStateLabels, type ComparisonState } from '@shared/comparisons';
import {
  formatAuc,
  formatAucDelta,
  formatBytes,
  formatCount,
  formatDateTime,
  formatGini,
  formatGiniDelta,
  formatInterval,
  formatKs,
  formatKsDelta,
  formatMoney,
  formatNumber,
  formatPercent,
  formatPValue,
  formatScore,
  formatSignedNumber,
} from '@shared/format';
import { voteChoiceLabels, type AuditEvent, type Governance, type Note } from '@shared/governance';
import { type Chart, ksChart, rocChart, segmentIntervalsChart, strategyChart, swapGridChart, upliftChart } from '@shared/pack/charts';
import { type BandTable, type Report, swapInRiskier } from '@shared/report';

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

const orientation = { safer: 'higher is safer', riskier: 'higher is riskier' } as const;
const utc = (value: string | Date) => `${formatDateTime(value, 'UTC')} UTC`;

function summary(input: PackInput): Section {
  const { report, comparison, governance } = input;
  const { settings, mapping, verdict } = report;
  const blocks: Block[] = [
    { kind: 'paragraph', text: comparison.name },
    ...(comparison.description ? [{ kind: 'paragraph' as const, text: comparison.description, muted: true }] : []),
    {
      kind: 'paragraph',
      muted: true,
      text: `Comparison ${comparison.id} · ${comparisonStateLabels[comparison.state]} · created by ${comparison.createdBy} on ${utc(comparison.createdAt)} · pack made ${utc(input.generatedAt)}${input.generatedFor ? ` for ${input.generatedFor}` : ''} by Scorecourt${input.archivedWithDecision ? ' · the pack archived with the committee’s decision' : ''}`,
    },
    { kind: 'subheading', text: `Verdict under adoption policy version ${verdict.policyVersion}: ${verdictLabel(verdict.outcome)}` },
    { kind: 'paragraph', text: verdict.summary },
    {
      kind: 'table',
      title: 'Adoption criteria',
      head: ['Criterion', 'Result', 'Why'],
      numeric: [],
      rows: verdict.criteria.map((criterion) => [criterion.label, criterion.met ? 'Met' : 'Not met', criterion.detail]),
    },
    governance.decision
      ? {
          kind: 'paragraph',
          text: `Decision: ${voteChoiceLabels[governance.decision.outcome]}, recorded by ${governance.decision.decidedBy.name} on ${utc(governance.decision.createdAt)}. ${governance.decision.rationale}`,
        }
      : { kind: 'paragraph', muted: true, text: `No committee decision is recorded yet: this comparison is ${comparisonStateLabels[comparison.state].toLowerCase()}.` },
    { kind: 'subheading', text: 'Data' },
    {
      kind: 'facts',
      rows: [
        ['File', report.input.fileName],
        ['SHA-256', report.input.sha256],
        ['Size', formatBytes(report.input.bytes)],
        ['Rows read / used', `${formatCount(report.dataQuality.rowsRead)} / ${formatCount(report.rows)}`],
        ['Goods / bads', `${formatCount(report.goods)} / ${formatCount(report.bads)}`],
        ['Bad rate', formatPercent(report.badRate, 2)],
        ['Outcome', `${mapping.outcome} (bad = “${mapping.badValue}”)`],
        ['Champion', `${mapping.champion} (${orientation[mapping.higherIs.champion]})`],
        ['Challenger', `${mapping.challenger} (${orientation[mapping.higherIs.challenger]})`],
        ['Segments', mapping.segments && mapping.segments.length > 0 ? mapping.segments.join(', ') : 'none'],
        ['Exposure', mapping.exposure ?? 'none'],
      ],
    },
    { kind: 'subheading', text: 'Settings and engine' },
    {
      kind: 'facts',
      rows: [
        ['Random seed', String(settings.seed)],
        ['Bootstrap', settings.bootstrap > 0 ? `${formatCount(settings.bootstrap)} paired, stratified replicates` : 'not run'],
        ['Confidence', formatPercent(settings.confidence, 0)],
        [
          'Swap sets at',
          settings.cutoffs
            ? `cut-offs ${formatScore(settings.cutoffs.champion)} (champion) and ${formatScore(settings.cutoffs.challenger)} (challenger)`
            : `a ${formatPercent(settings.approvalRate, 1)} approval rate for both models`,
        ],
        ['Bands', formatCount(settings.bands)],
        ['Engine version', report.engineVersion],
        ['Analysis run', comparison.runId === null ? '—' : String(comparison.runId)],
        ['Adoption policy', `version ${report.policy.version}`],
      ],
    },
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
  const level = formatPercent(report.settings.confidence, 0);
  const { champion, challenger, difference, swap, segments } = report;
  const ks = (interval: [number, number] | null, format = formatKs) => (interval ? formatInterval(interval, format) : 'no bootstrap');
  const holmSignificant = segments.filter((row) => row.pHolm !== null && row.pHolm < report.policy.alpha).length;
  return {
    title: 'Evidence: metrics and tests',
    blocks: [
      {
        kind: 'table',
        title: 'Metrics',
        note: `Point estimates with ${level} intervals: DeLong for AUC and Gini, paired bootstrap percentiles for KS. Gini and KS in points.`,
        head: ['', 'Champion', 'Challenger', 'Challenger − champion'],
        numeric: [1, 2, 3],
        rows: [
          ['AUC', formatAuc(champion.auc), formatAuc(challenger.auc), formatAucDelta(difference.auc)],
          [`AUC ${level} interval`, formatInterval(champion.aucCi, formatAuc), formatInterval(challenger.aucCi, formatAuc), formatInterval(difference.aucCi, formatAucDelta)],
          ['Gini', formatGini(champion.gini), formatGini(challenger.gini), formatGiniDelta(difference.gini)],
          [`Gini ${level} interval`, formatInterval(champion.giniCi), formatInterval(challenger.giniCi), formatInterval(difference.giniCi, formatGiniDelta)],
          ['ΔGini bootstrap interval', '', '', difference.giniBootstrapCi ? formatInterval(difference.giniBootstrapCi, formatGiniDelta) : 'no bootstrap'],
          ['KS', formatKs(champion.ks), formatKs(challenger.ks), formatKsDelta(difference.ks)],
          [`KS ${level} interval`, ks(champion.ksCi), ks(challenger.ksCi), ks(difference.ksCi, formatKsDelta)],
          ['KS reached at score', formatScore(champion.ksScore), formatScore(challenger.ksScore), ''],
        ],
      },
      { kind: 'chart', chart: upliftChart(report) },
      {
        kind: 'table',
        title: 'Tests',
        head: ['Test', 'Statistic', 'p-value', 'Result'],
        numeric: [],
        rows: [
          [
            'DeLong paired test of ΔAUC (DeLong, DeLong & Clarke-Pearson 1988)',
            `z = ${formatSignedNumber(difference.z)}`,
            `${formatPValue(difference.pOneSided)} one-sided, ${formatPValue(difference.pTwoSided)} two-sided`,
            `se(ΔGini) = ${formatGini(difference.giniSe)} points; correlation of the AUCs ${difference.correlation === null ? '—' : formatNumber(difference.correlation, 3)}`,
          ],
          [
            `Swap-in vs swap-out bad rate (${swap.test.method === 'fisher-exact' ? 'Fisher’s exact test' : 'two-proportion z test'})`,
            swap.test.z === null ? '—' : `z = ${formatSignedNumber(swap.test.z)}`,
            swap.test.p === null ? '—' : `${formatPValue(swap.test.p)} two-sided`,
            swap.test.reason ?? `swap-in ${formatPercent(swap.swapIn.badRate)} vs swap-out ${formatPercent(swap.swapOut.badRate)}`,
          ],
          [
            'Segments: DeLong per value, Holm-adjusted (Holm 1979)',
            `${formatCount(segments.length)} rows`,
            '',
            segments.length === 0 ? 'no segment columns' : `${formatCount(holmSignificant)} with Holm-adjusted p below α = ${report.policy.alpha}`,
          ],
        ],
      },
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

const swapCells = [
  ['bothAccept', 'Both accept'],
  ['swapIn', 'Swap-in (champion declines, challenger accepts)'],
  ['swapOut', 'Swap-out (champion accepts, challenger declines)'],
  ['bothReject', 'Both decline'],
] as const;

const rateWithInterval = (cell: { badRate: number | null; badRateCi: [number, number] | null }) =>
  cell.badRateCi ? `${formatPercent(cell.badRate)} (${formatInterval(cell.badRateCi, (v) => formatPercent(v))})` : formatPercent(cell.badRate);

function swapSets(input: PackInput): Section {
  const { report } = input;
  const { swap } = report;
  const level = formatPercent(report.settings.confidence, 0);
  const hasAmount = !!report.mapping.exposure;
  const at = report.strategyCurve.atApprovalRate;
  const blocks: Block[] = [
    {
      kind: 'paragraph',
      text:
        swap.basis === 'approval-rate'
          ? `Both models at a ${formatPercent(swap.requestedApprovalRate, 1)} approval rate: cut-offs ${formatScore(swap.champion.cutoff)} (champion, ${formatPercent(swap.champion.approvalRate)} achieved) and ${formatScore(swap.challenger.cutoff)} (challenger, ${formatPercent(swap.challenger.approvalRate)}).`
          : `Cut-offs ${formatScore(swap.champion.cutoff)} (champion, ${formatPercent(swap.champion.approvalRate)} approved) and ${formatScore(swap.challenger.cutoff)} (challenger, ${formatPercent(swap.challenger.approvalRate)} approved).`,
    },
    {
      kind: 'table',
      title: 'Swap sets at the report’s cut-offs',
      note: `Bad rates with ${level} Wilson intervals.`,
      head: ['', 'Accounts', 'Share', 'Bads', 'Bad rate', `${level} interval`, ...(hasAmount ? ['Amount'] : [])],
      numeric: [1, 2, 3, 4, 5, 6],
      rows: swapCells.map(([key, label]) => {
        const cell = swap[key];
        return [
          label,
          formatCount(cell.count),
          formatPercent(cell.share),
          formatCount(cell.bads),
          formatPercent(cell.badRate),
          formatInterval(cell.badRateCi, (value) => formatPercent(value)),
          ...(hasAmount ? [formatMoney(cell.amount)] : []),
        ];
      }),
    },
    { kind: 'chart', chart: swapGridChart(report) },
  ];
  if (swap.bySegment.length > 0) {
    blocks.push({
      kind: 'table',
      title: 'Swap sets by segment',
      note: `The same cut-offs within each segment value; champion → challenger. Swap-in and swap-out bad rates with ${level} Wilson intervals. “Swap-in riskier” flags a value where the challenger trades in riskier accounts than it turns away.`,
      head: ['Segment', 'Accounts', 'Approval rate', 'Net approvals', 'Bad rate of the approved book', 'Swap-in', 'Swap-in bad rate', 'Swap-out', 'Swap-out bad rate', 'Flag'],
      numeric: [1, 3, 5, 7],
      rows: swap.bySegment.map((row) => [
        `${row.column} = ${row.value}`,
        formatCount(row.accounts),
        `${formatPercent(row.champion.approvalRate)} → ${formatPercent(row.challenger.approvalRate)}`,
        formatSignedNumber(row.challenger.approved - row.champion.approved, 0),
        `${formatPercent(row.champion.approvedBadRate)} → ${formatPercent(row.challenger.approvedBadRate)}`,
        formatCount(row.swapIn.count),
        rateWithInterval(row.swapIn),
        formatCount(row.swapOut.count),
        rateWithInterval(row.swapOut),
        swapInRiskier(row) ? 'Swap-in riskier' : '',
      ]),
    });
  }
  blocks.push(
    { kind: 'subheading', text: 'Strategy curve' },
    {
      kind: 'paragraph',
      text: `At a ${formatPercent(at.approvalRate, 1)} approval rate the champion approves ${formatCount(at.championBads)} bads and the challenger ${formatCount(at.challengerBads)}: ${at.badsAvoided >= 0 ? `${formatCount(at.badsAvoided)} bads avoided` : `${formatCount(-at.badsAvoided)} more bads`}.${at.approvalsGainedAtEqualBadRate === null ? '' : ` At the champion’s bad rate the challenger could approve ${formatCount(at.approvalsGainedAtEqualBadRate)} more accounts.`}`,
    },
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
  );
  return { title: 'Who changes sides: swap sets and the strategy curve', blocks };
}

function segments(input: PackInput): Section {
  const { report } = input;
  if (report.segments.length === 0) return { title: 'Segments', blocks: [{ kind: 'paragraph', text: 'No segment columns were mapped.' }] };
  const sided = report.policy.sided === 'one-sided' ? 'one-sided' : 'two-sided';
  const chart = segmentIntervalsChart(report);
  return {
    title: 'Segments',
    blocks: [
      {
        kind: 'table',
        title: 'Segments',
        note: `ΔGini per segment value with its DeLong p (${sided}) and the Holm-adjusted p across all rows. “Few bads” marks values with too few bads to read.`,
        head: ['Segment', 'Accounts', 'Bads', 'Champion Gini', 'Challenger Gini', 'ΔGini', 'p', 'Holm p', 'Note'],
        numeric: [1, 2, 3, 4, 5, 6, 7],
        rows: report.segments.map((row) => [
          `${row.column} = ${row.value}`,
          formatCount(row.n),
          formatCount(row.bads),
          formatGini(row.championGini),
          formatGini(row.challengerGini),
          formatGiniDelta(row.deltaGini),
          formatPValue(row.p),
          formatPValue(row.pHolm),
          [row.tooFewBads ? 'few bads' : null, row.note].filter(Boolean).join('; '),
        ]),
      },
      ...(chart ? [{ kind: 'chart' as const, chart }] : []),
    ],
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
  const policy = report.policy;
  const blocks: Block[] = [
    {
      kind: 'paragraph',
      muted: true,
      text: `Policy version ${policy.version}: α = ${policy.alpha} (${policy.sided}), materiality ${policy.materialityGiniPoints} Gini points, interval above zero ${policy.requireIntervalAboveZero ? 'required' : 'not required'}, swap rule ${policy.swapRule.enabled ? `at a ${formatPercent(policy.swapRule.approvalRate, 1)} approval rate` : 'off'}, at least ${policy.minBads} bads, quorum ${policy.quorum || 'none'}.`,
    },
    {
      kind: 'table',
      title: 'Verdict records',
      note: 'Every verdict given, newest first, each under the policy version it used; a stored verdict never changes.',
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
      rows: governance.votes.map((vote) => [utc(vote.createdAt), vote.voter.name, voteChoiceLabels[vote.vote], vote.comment]),
    },
  ];
  const decision = governance.decision;
  blocks.push({ kind: 'subheading', text: 'Decision' });
  if (decision) {
    blocks.push({
      kind: 'facts',
      rows: [
        ['Outcome', voteChoiceLabels[decision.outcome]],
        ['Recorded by', decision.decidedBy.name],
        ['When', utc(decision.createdAt)],
        ['Analysis run', String(decision.runId)],
        ['Policy version', String(decision.policyVersion)],
        ['Effective', decision.effectiveDate ?? '—'],
        ['Rationale', decision.rationale],
        ['Conditions', decision.conditions ?? 'none'],
      ],
    });
  } else {
    blocks.push({ kind: 'paragraph', muted: true, text: 'Not decided yet.' });
  }
  if (notes.length > 0) {
    blocks.push({
      kind: 'table',
      title: 'Notes and discussion',
      head: ['When', 'Who', 'About', 'Note'],
      numeric: [],
      rows: notes.map((note) => [utc(note.createdAt), note.author.name, note.anchor, note.body]),
    });
  }
  blocks.push({ kind: 'paragraph', muted: true, text: 'The verdict advises and the committee decides; the cautions on the first page apply to every decision recorded here.' });
  return { title: 'Verdict, review and decision', blocks };
}

function auditTrail(input: PackInput): Section {
  const { events, chainValid } = input.audit;
  return {
    title: 'Audit trail',
    blocks: [
      {
        kind: 'paragraph',
        text: `${formatCount(events.length)} events; the hash chain ${chainValid ? 'verifies' : 'does NOT verify'}. Hashes are shortened; the evidence pack holds them in full.`,
      },
      {
        kind: 'table',
        title: 'Audit trail',
        head: ['When (UTC)', 'Who', 'What', 'Hash'],
        numeric: [],
        rows: events.map((event) => [formatDateTime(event.createdAt, 'UTC'), event.actor?.name ?? 'Scorecourt', event.action, `${event.hash.slice(0, 16)}…`]),
      },
    ],
  };
}

/** The pack's sections in order. A new section of the report is added here, in one place. */
export const packSections: ((input: PackInput) => Section)[] = [summary, metrics, swapSets, segments, bands, swapMatrix, dataQuality, governanceRecord, auditTrail];

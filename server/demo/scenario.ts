import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { createComparisonInputSchema, scenarioInputSchema, type ComparisonState } from '@shared/comparisons';
import { decisionInputSchema, noteInputSchema, reviewInputSchema, submitInputSchema, voteInputSchema } from '@shared/governance';
import { mixedStrategyQuerySchema } from '@shared/mixed-strategy';
import type { ColumnMapping, Report } from '@shared/report';
import { mixedStrategyPreview } from '../comparisons/mixed-strategy';
import { saveScenario } from '../comparisons/scenarios';
import { createComparison, currentReportJson, getComparisonDetail } from '../comparisons/service';
import type { AppContext } from '../context';
import type { User } from '../db/entities/index';
import { castVote, recordDecision, reviewComparison, submitComparison } from '../governance/service';
import { uploadHoldout } from '../holdouts/service';
import { addNote } from '../notes/service';
import { projectRoot } from '../runtime';
import * as words from './wording';

/**
 * The demo scenario of the first start: three comparisons of Tallowmere Credit Cooperative,
 * made step by step through the same services the API calls (uploads, comparison creation, the
 * analysis queue, submission, review, scenarios, notes, votes, decision), each step by the demo
 * person whose role it is and at its moment of the past weeks (the seed replays the clock):
 *
 * 1. decided (adopted): the through-the-door holdout of 2025 (58,699 rows standing for 120,001
 *    applicants; declined ones without an outcome, goods weighted 4, the swap-in's bad rate
 *    inferred from the bureau's column), points against points, two challengers (the cash-flow
 *    model CF-3, and a refit of the champion on recent data, which the verdict recommends since
 *    CF-3 fails the segment rule; the committee adopts CF-3 except brokered cards, acknowledging
 *    that this goes against the record), with its whole
 *    history — submitted, validated with findings that name the brokered-cards weakness, the
 *    policy role's saved scenarios and swap-set annotations, discussion, two votes, the decision
 *    with conditions, and the e-mails each step sends;
 * 2. in review: the first 60,000 applications, every outcome observed, with the challenger as a PD (its calibration by band, stability
 *    by month, and the PSI against the 2023 development sample uploaded beside it), submitted,
 *    waiting for the analyst;
 * 3. a draft waiting for its mapping: the 2,000-account sample, uploaded and named.
 *
 * The analyses really run (the worker threads of the queue) and finish before a comparison moves
 * on. Same code and data, same numbers: the bootstrap is seeded and the ids follow from the order.
 */

export const sampleDataDir = join(projectRoot, 'sample-data');

export const demoFiles = {
  full: 'tallowmere-holdout-2025.csv',
  pd: 'tallowmere-holdout-2025-pd.csv',
  /** The 2023 development sample (scores only): the PD comparison's PSI reference. */
  development: 'tallowmere-development-2023.csv',
  sample: 'tallowmere-holdout-2025-sample-2k.csv',
} as const;

const baseMapping = {
  outcome: 'bad_12m',
  badValue: '1',
  champion: 'champion_points',
  id: 'account_id',
  segments: ['product', 'channel', 'product_channel', 'application_month'],
  exposure: 'loan_amount',
} as const;

export const demoMappings: { full: ColumnMapping; pd: ColumnMapping } = {
  // The through-the-door holdout (sample-data/through-the-door.ts): declined applicants have no
  // outcome, goods are sampled one in four (sample_weight 4), the bureau's probability of bad
  // states the swap-in's bad rate.
  full: {
    ...baseMapping,
    segments: [...baseMapping.segments],
    challenger: 'challenger_points',
    higherIs: { champion: 'safer', challenger: 'safer' },
    weight: 'sample_weight',
    keepUnknown: true,
    inferredBad: 'bureau_pd_12m',
    // Two challengers: the cash-flow model, and a refit of the champion on recent data (sample-data/refit.ts).
    championName: 'AS-19 application scorecard',
    challengerName: 'CF-3 cash-flow',
    moreChallengers: [{ column: 'refit_points', higherIs: 'safer', name: 'AS-19 refit 2024' }],
  },
  pd: {
    ...baseMapping,
    segments: [...baseMapping.segments],
    challenger: 'challenger_pd',
    higherIs: { champion: 'safer', challenger: 'riskier' },
    // Calibration of the PD, stability by month.
    probabilityOfDefault: { champion: false, challenger: true },
    period: 'application_month',
  },
};

/** The analysis settings of both analysed comparisons (the defaults, written out). */
export const demoSettings = { bootstrap: 2000, seed: 1, confidence: 0.95, approvalRate: 0.7 } as const;
/** The decided comparison states the unknown applicants' bad rate through the bureau's column. */
export const demoInference = { method: 'column', parcelFactor: 1 } as const;

export interface DemoPeople {
  admin: User;
  modeler: User;
  analyst: User;
  policy: User;
  committee: User;
  committee2: User;
}

export interface DemoComparison {
  id: number;
  name: string;
  state: ComparisonState;
}

/**
 * The scenario's calendar: each step's moment as days before today and a time of day (UTC).
 * The first start happens at any hour, so the newest step is on the day before.
 */
export const calendar = {
  people: [42, 8, 30],
  uploadFull: [30, 9, 12],
  createFull: [30, 9, 20],
  submitFull: [29, 15, 5],
  validateFull: [24, 14, 30],
  currentScenario: [22, 10, 40],
  growthScenario: [22, 10, 52],
  swapInNote: [22, 11, 5],
  swapOutNote: [22, 11, 14],
  modelerNote: [21, 9, 50],
  committeeQuestion: [20, 16, 15],
  analystAnswer: [20, 17, 2],
  policyNote: [18, 11, 30],
  firstVote: [16, 10, 5],
  secondVote: [16, 14, 45],
  decision: [15, 15, 30],
  uploadPd: [6, 9, 30],
  createPd: [6, 9, 41],
  submitPd: [5, 11, 15],
  uploadSample: [1, 16, 38],
  createSample: [1, 16, 44],
} as const satisfies Record<string, readonly [number, number, number]>;

export type CalendarStep = keyof typeof calendar;

/** The moment of a calendar step, counted back from `today` (the real date the seed runs). */
export function momentOf(step: CalendarStep, today: Date): Date {
  const [daysBefore, hour, minute] = calendar[step];
  const midnight = Date.UTC(today.getUTCFullYear(), today.getUTCMonth(), today.getUTCDate());
  return new Date(midnight - daysBefore * 86_400_000 + (hour * 60 + minute) * 60_000);
}

/** ISO date (YYYY-MM-DD) `days` after a moment. */
function dateAfter(moment: Date, days: number): string {
  return new Date(moment.getTime() + days * 86_400_000).toISOString().slice(0, 10);
}

export interface ScenarioOptions {
  /** The real date the calendar counts back from. */
  today: Date;
  /** Moves the replayed clock to a calendar step's moment (see clock.ts `replay`). */
  at: (step: CalendarStep) => void;
  /** How long to wait for one analysis (default 10 minutes). */
  analysisTimeoutMs?: number;
  /** Bootstrap replicates of the analyses (default: demoSettings'). */
  replicates?: number;
  /**
   * The folder holding demoFiles (default: sample-data/). The unit and API suite plays the
   * scenario on smaller files of the same names (every twentieth row of each).
   */
  dataDir?: string;
}

export async function playScenario(ctx: AppContext, people: DemoPeople, options: ScenarioOptions): Promise<DemoComparison[]> {
  const { at } = options;
  const settings = { ...demoSettings, bootstrap: options.replicates ?? demoSettings.bootstrap };
  const dataDir = options.dataDir ?? sampleDataDir;
  for (const name of Object.values(demoFiles)) {
    if (!existsSync(join(dataDir, name))) throw new Error(`the demo scenario needs ${join(dataDir, name)}, which is missing (npm run sample-data writes the demo's files)`);
  }
  const upload = (person: User, name: string) => uploadHoldout(ctx, person, { path: join(dataDir, name), originalname: name });

  /** Runs the queue until the comparison's analysis is done; the e-mail it sends is delivered too. */
  const analysed = async (id: number): Promise<Report> => {
    await ctx.jobs.whenIdle(options.analysisTimeoutMs ?? 10 * 60_000);
    const detail = await getComparisonDetail(ctx.dataSource, id);
    if (detail.state !== 'analysed') {
      const run = detail.runs[0];
      throw new Error(`the demo analysis of comparison ${id} did not finish: ${run ? `${run.status}${run.error ? ` (${run.error})` : ''}` : 'no run'}`);
    }
    await delivered();
    return JSON.parse((await currentReportJson(ctx.dataSource, id)).json) as Report;
  };
  /** Delivers what the last step queued (to the local sink, or SMTP_URL), so each e-mail is sent at its step's moment. */
  const delivered = () => ctx.mailer.deliverDue();

  // 1. The decided comparison.
  at('uploadFull');
  const fullHoldout = await upload(people.modeler, demoFiles.full);
  at('createFull');
  const full = await createComparison(
    ctx,
    people.modeler,
    createComparisonInputSchema.parse({
      ...words.comparisons.decided,
      holdoutId: fullHoldout.id,
      mapping: demoMappings.full,
      settings: { ...settings, rejectInference: demoInference },
    }),
  );
  const report = await analysed(full.id);

  at('submitFull');
  await submitComparison(ctx, people.modeler, full.id, submitInputSchema.parse({ message: words.submissionMessage(report) }));
  await delivered();

  at('validateFull');
  await reviewComparison(ctx, people.analyst, full.id, reviewInputSchema.parse({ outcome: 'validated', findings: words.analystFindings(report) }));
  await delivered();

  at('currentScenario');
  const current = await saveScenario(
    ctx,
    people.policy,
    full.id,
    scenarioInputSchema.parse({ name: words.scenarioNames.current, approvalRate: 0.7, note: words.scenarioNote('current') }),
  );
  at('growthScenario');
  const growth = await saveScenario(
    ctx,
    people.policy,
    full.id,
    scenarioInputSchema.parse({ name: words.scenarioNames.growth, approvalRate: 0.75, note: words.scenarioNote('growth') }),
  );
  at('swapInNote');
  await addNote(ctx, people.policy, full.id, noteInputSchema.parse({ anchor: 'swap-in', body: words.swapInAnnotation(current, growth), scenarioId: current.id }));
  at('swapOutNote');
  await addNote(ctx, people.policy, full.id, noteInputSchema.parse({ anchor: 'swap-out', body: words.swapOutAnnotation(current), scenarioId: current.id }));

  at('modelerNote');
  await addNote(ctx, people.modeler, full.id, noteInputSchema.parse({ body: words.discussion.modelerOnBrokers }));
  at('committeeQuestion');
  await addNote(ctx, people.committee2, full.id, noteInputSchema.parse({ body: words.discussion.committeeQuestion }));
  at('analystAnswer');
  await addNote(ctx, people.analyst, full.id, noteInputSchema.parse({ body: words.analystAnswer(report) }));
  at('policyNote');
  await addNote(ctx, people.policy, full.id, noteInputSchema.parse({ body: words.discussion.policyOnCompliance }));

  at('firstVote');
  await castVote(ctx, people.committee, full.id, voteInputSchema.parse(words.votes.first));
  at('secondVote');
  await castVote(ctx, people.committee2, full.id, voteInputSchema.parse(words.votes.second));

  at('decision');
  const decidedAt = momentOf('decision', options.today);
  // Adoption except brokered cards: the committee previews the mixed strategy (the route the
  // decision form calls), words its rationale from those figures, and the decision stores them.
  const exception = { keepChampion: [{ column: words.brokeredCards.column, value: words.brokeredCards.value }] };
  const strategy = await mixedStrategyPreview(ctx, full.id, mixedStrategyQuerySchema.parse(exception));
  await recordDecision(
    ctx,
    people.committee,
    full.id,
    decisionInputSchema.parse({
      outcome: 'adopt',
      challenger: 0,
      ...words.decision(report, strategy),
      effectiveDate: dateAfter(decidedAt, 14),
      strategy: exception,
      // CF-3 is not the recommended challenger (the refit is): a decision against the record.
      acknowledgeAgainstRecord: true,
    }),
  );
  await delivered();

  // 2. In review: the PD-scored variant.
  at('uploadPd');
  const pdHoldout = await upload(people.modeler, demoFiles.pd);
  const developmentSample = await upload(people.modeler, demoFiles.development);
  at('createPd');
  const pd = await createComparison(
    ctx,
    people.modeler,
    createComparisonInputSchema.parse({
      ...words.comparisons.inReview,
      holdoutId: pdHoldout.id,
      mapping: demoMappings.pd,
      settings,
      referenceHoldoutId: developmentSample.id,
    }),
  );
  await analysed(pd.id);
  at('submitPd');
  await submitComparison(ctx, people.modeler, pd.id, submitInputSchema.parse({ message: words.pdSubmissionMessage() }));
  await delivered();

  // 3. A draft waiting for its mapping.
  at('uploadSample');
  const sampleHoldout = await upload(people.modeler, demoFiles.sample);
  at('createSample');
  const draft = await createComparison(ctx, people.modeler, createComparisonInputSchema.parse({ ...words.comparisons.draft, holdoutId: sampleHoldout.id }));

  const made: DemoComparison[] = [];
  for (const id of [full.id, pd.id, draft.id]) {
    const detail = await getComparisonDetail(ctx.dataSource, id);
    made.push({ id, name: detail.name, state: detail.state });
  }
  return made;
}

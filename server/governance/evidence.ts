import { createHash } from 'node:crypto';
import type { AuditEvent, Governance, Note, PolicyVersion as PolicyVersionBody, VerdictRecord } from '@shared/governance';
import type { AnalysisRun as AnalysisRunBody, Scenario } from '@shared/comparisons';
import type { AnalysisSettings, ColumnMapping, Report } from '@shared/report';
import type { Response } from 'express';
import { In } from 'typeorm';
import { attachment, downloadName } from '../comparisons/csv';
import { presentRun } from '../comparisons/present';
import { listScenarios } from '../comparisons/scenarios';
import { currentRun, findComparison } from '../comparisons/service';
import type { AppContext } from '../context';
import { AnalysisRun, PolicyVersion, User, Vote } from '../db/entities/index';
import { listNotes } from '../notes/service';
import { presentPolicyVersion } from '../policy/service';
import { comparisonAuditTrail } from './audit-trail';
import { iso, personRef } from './people';
import { presentVote } from './present';
import { getGovernance } from './service';
import { now } from '../clock';

/**
 * The evidence pack: one JSON file a model-risk file can keep — the comparison, its input's
 * identity and hash, every run with its mapping, settings, engine version and report hash, the
 * current run's report, the policy versions its verdicts and decision used, the verdict records,
 * reviews, every vote cast (replaced ones too), the decision, the notes and scenarios, and the
 * audit trail with the chain check. Read-only; assembled on request.
 */

export const cautions = [
  'Statistical significance is not business approval: the verdict advises, the committee decides.',
  'A new model changes who is approved and who is declined, so fair-lending and adverse-action duties apply.',
  "Defer to the institution's model risk policy, local regulation and licensed advice.",
];

export interface EvidencePack {
  format: 'scorecourt-evidence-pack';
  formatVersion: 1;
  generatedAt: string;
  generatedBy: { id: number; name: string };
  comparison: {
    id: number;
    name: string;
    description: string | null;
    state: Governance['state'];
    createdBy: { id: number; name: string };
    createdAt: string;
    updatedAt: string;
  };
  holdout: { id: number; fileName: string; sha256: string; bytes: number; rowCount: number; uploadedBy: { id: number; name: string }; uploadedAt: string };
  currentRunId: number | null;
  runs: (AnalysisRunBody & {
    holdoutId: number;
    input: { fileName: string; sha256: string; bytes: number; rowsRead: number; rowsUsed: number; goods: number; bads: number };
    mapping: ColumnMapping;
    settings: AnalysisSettings;
    /** SHA-256 of the stored report as GET /api/comparisons/:id/report serves it; null until done. */
    reportSha256: string | null;
  })[];
  /** The current run's report; null while no run is done. */
  report: Report | null;
  /** The current run's settings (seed, bootstrap replicates, confidence, cut-offs or approval rate…). */
  settings: AnalysisSettings | null;
  hashes: {
    /** SHA-256 of the holdout file as uploaded. */
    inputSha256: string | null;
    /** SHA-256 of the current run's stored report JSON. */
    reportSha256: string | null;
    /** Hash of the newest event in this comparison's audit trail. */
    lastAuditEventHash: string | null;
  };
  policyVersions: PolicyVersionBody[];
  verdicts: VerdictRecord[];
  reviews: Governance['reviews'];
  /** Every vote cast, oldest first; `replacesId` names the earlier vote of the same person it replaced. */
  votes: (Governance['votes'][number] & { reviewId: number; replacesId: number | null })[];
  /** The votes that count in the current round (each member's newest). */
  countingVotes: Governance['votes'];
  decision: Governance['decision'];
  notes: Note[];
  scenarios: Scenario[];
  audit: { events: AuditEvent[]; chainValid: boolean; chain: { events: number; brokenAt?: number; reason?: string } };
  cautions: string[];
}

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex');

export async function buildEvidencePack(ctx: AppContext, actor: User, comparisonId: number): Promise<EvidencePack> {
  const source = ctx.dataSource;
  const comparison = await findComparison(source, comparisonId);
  const holdout = comparison.holdout;
  const uploader = await source.getRepository(User).findOneBy({ id: holdout.uploadedById });
  const runs = await source
    .getRepository(AnalysisRun)
    .createQueryBuilder('run')
    .addSelect('run.report')
    .where('run.comparisonId = :comparisonId', { comparisonId })
    .orderBy('run.id', 'ASC')
    .getMany();
  const current = await currentRun(source, comparisonId);
  const currentWithReport = current ? runs.find((run) => run.id === current.id) ?? null : null;
  const report = currentWithReport?.report ? (JSON.parse(currentWithReport.report) as Report) : null;

  const governance = await getGovernance(ctx, comparisonId);
  const allVotes = await source.getRepository(Vote).find({ where: { comparisonId }, order: { id: 'ASC' }, relations: { voter: true } });
  const versions = [...new Set([...governance.verdicts.map((record) => record.policyVersion), ...(governance.decision ? [governance.decision.policyVersion] : [])])];
  const policyRows = versions.length
    ? await source.getRepository(PolicyVersion).find({ where: { version: In(versions) }, order: { version: 'ASC' }, relations: { createdBy: true } })
    : [];
  const notes = await listNotes(source, comparisonId);
  const { scenarios } = await listScenarios(ctx, comparisonId);
  const audit = await comparisonAuditTrail(source, comparisonId);
  const chain = audit.chain.ok ? { events: audit.chain.events } : { events: audit.chain.events, brokenAt: audit.chain.brokenAt, reason: audit.chain.reason };

  return {
    format: 'scorecourt-evidence-pack',
    formatVersion: 1,
    generatedAt: now().toISOString(),
    generatedBy: personRef(actor),
    comparison: {
      id: comparison.id,
      name: comparison.name,
      description: comparison.description,
      state: comparison.state,
      createdBy: personRef(comparison.createdBy),
      createdAt: iso(comparison.createdAt),
      updatedAt: iso(comparison.updatedAt),
    },
    holdout: {
      id: holdout.id,
      fileName: holdout.fileName,
      sha256: holdout.sha256,
      bytes: holdout.bytes,
      rowCount: holdout.rowCount,
      uploadedBy: uploader ? personRef(uploader) : { id: holdout.uploadedById, name: 'unknown' },
      uploadedAt: iso(holdout.uploadedAt),
    },
    currentRunId: current?.id ?? null,
    runs: runs.map((run) => ({
      ...presentRun(run),
      holdoutId: run.holdoutId,
      input: {
        fileName: run.input.fileName,
        sha256: run.input.sha256,
        bytes: run.input.bytes,
        rowsRead: run.input.read.rowsRead,
        rowsUsed: run.input.read.rowsUsed,
        goods: run.input.read.goods,
        bads: run.input.read.bads,
      },
      mapping: run.mapping,
      settings: run.settings,
      reportSha256: run.report ? sha256(run.report) : null,
    })),
    report,
    settings: currentWithReport?.settings ?? null,
    hashes: {
      inputSha256: currentWithReport?.input.sha256 ?? holdout.sha256,
      reportSha256: currentWithReport?.report ? sha256(currentWithReport.report) : null,
      lastAuditEventHash: audit.events.at(-1)?.hash ?? null,
    },
    policyVersions: policyRows.map(presentPolicyVersion),
    verdicts: governance.verdicts,
    reviews: governance.reviews,
    votes: allVotes.map((vote) => ({ ...presentVote(vote), reviewId: vote.reviewId, replacesId: vote.replacesId })),
    countingVotes: governance.votes,
    decision: governance.decision,
    notes,
    scenarios,
    audit: { events: audit.events, chainValid: audit.chainValid, chain },
    cautions,
  };
}

export async function sendEvidencePack(ctx: AppContext, actor: User, comparisonId: number, res: Response): Promise<void> {
  const pack = await buildEvidencePack(ctx, actor, comparisonId);
  attachment(res, downloadName(pack.comparison, 'evidence.json'));
  res.setHeader('Cache-Control', 'no-store');
  res.status(200).type('application/json').send(`${JSON.stringify(pack, null, 2)}\n`);
}

import { AnalysisRun } from './analysis-run';
import { AppSetting } from './app-setting';
import { AuditEvent } from './audit-event';
import { Comparison } from './comparison';
import { CutoffScenario } from './cutoff-scenario';
import { Decision } from './decision';
import { DecisionPack } from './decision-pack';
import { Holdout } from './holdout';
import { HoldoutChunk } from './holdout-chunk';
import { MailMessage } from './mail-message';
import { Note } from './note';
import { OneTimeToken } from './one-time-token';
import { PolicyVersion } from './policy-version';
import { RateLimitHit } from './rate-limit-hit';
import { Review } from './review';
import { RunColumn } from './run-column';
import { Session } from './session';
import { StagedUpload } from './staged-upload';
import { User } from './user';
import { VerdictRecord } from './verdict-record';
import { Vote } from './vote';

export {
  AnalysisRun,
  AppSetting,
  AuditEvent,
  Comparison,
  CutoffScenario,
  Decision,
  DecisionPack,
  Holdout,
  HoldoutChunk,
  MailMessage,
  Note,
  OneTimeToken,
  PolicyVersion,
  RateLimitHit,
  Review,
  RunColumn,
  Session,
  StagedUpload,
  User,
  VerdictRecord,
  Vote,
};
export type { StoredPolicy } from './policy-version';
export type { RunInput } from './analysis-run';
export type { StoredHoldoutColumn } from './holdout';

/** Every entity, listed by hand: the server is bundled by esbuild, so there are no globs. */
export const entities = [
  User,
  OneTimeToken,
  AuditEvent,
  MailMessage,
  Session,
  AppSetting,
  Holdout,
  HoldoutChunk,
  Comparison,
  AnalysisRun,
  RunColumn,
  CutoffScenario,
  PolicyVersion,
  VerdictRecord,
  Review,
  Vote,
  Decision,
  Note,
  DecisionPack,
  RateLimitHit,
  StagedUpload,
];

import { AnalysisRun } from './analysis-run';
import { AppSetting } from './app-setting';
import { AuditEvent } from './audit-event';
import { Comparison } from './comparison';
import { CutoffScenario } from './cutoff-scenario';
import { Holdout } from './holdout';
import { HoldoutChunk } from './holdout-chunk';
import { MailMessage } from './mail-message';
import { OneTimeToken } from './one-time-token';
import { RunColumn } from './run-column';
import { Session } from './session';
import { User } from './user';

export { AnalysisRun, AppSetting, AuditEvent, Comparison, CutoffScenario, Holdout, HoldoutChunk, MailMessage, OneTimeToken, RunColumn, Session, User };
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
];

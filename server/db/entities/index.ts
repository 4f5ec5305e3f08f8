import { AppSetting } from './app-setting';
import { AuditEvent } from './audit-event';
import { MailMessage } from './mail-message';
import { OneTimeToken } from './one-time-token';
import { Session } from './session';
import { User } from './user';

export { AppSetting, AuditEvent, MailMessage, OneTimeToken, Session, User };

/** Every entity, listed by hand: the server is bundled by esbuild, so there are no globs. */
export const entities = [User, OneTimeToken, AuditEvent, MailMessage, Session, AppSetting];

import { z } from 'zod';
import type { MailMessage as MailMessageBody } from '@shared/users';
import type { AppContext } from '../context';
import { MailMessage } from '../db/entities/index';
import { recordAudit } from '../audit/audit';
import { currentUser } from '../auth/guards';
import { inTransaction } from '../db/transaction';
import { defineRoute, type RouteDefinition } from '../http/routes';

const outboxQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

/** A one-time link's path in a message's text (auth/tokens.ts tokenLink): /accept/ and 43 base64url characters. */
const oneTimeLink = /\/accept\/[A-Za-z0-9_-]{20,}/g;

/**
 * A message as the outbox shows it. With a real SMTP server (`SMTP_URL` set) a one-time link is
 * withheld: the e-mail carries it, and no one reading the outbox can use a colleague's invitation
 * or password reset. With the local sink the outbox is everyone's mailbox, so links stay readable,
 * and are marked so.
 */
export function present(message: MailMessage, localSink: boolean): MailMessageBody {
  const hasLink = oneTimeLink.test(message.text);
  oneTimeLink.lastIndex = 0;
  const text = hasLink && !localSink ? message.text.replace(oneTimeLink, '/accept/[one-time link withheld: it is in the e-mail only]') : message.text;
  return {
    id: message.id,
    to: message.to,
    subject: message.subject,
    text,
    status: message.status,
    attempts: message.attempts,
    lastError: message.lastError,
    createdAt: message.createdAt.toISOString(),
    sentAt: message.sentAt ? message.sentAt.toISOString() : null,
    ...(hasLink ? { oneTimeLinks: localSink ? ('shown' as const) : ('withheld' as const) } : {}),
  };
}

export function outboxRoutes({ dataSource, config }: AppContext): RouteDefinition[] {
  const localSink = !config.smtpUrl;
  return [
    defineRoute({
      method: 'get',
      path: '/outbox',
      access: ['admin'],
      summary: 'The outbox, newest first: ?page=&pageSize= → { messages, total, localSink }; one-time links withheld unless the local sink is used; each read is audited',
      validate: { query: outboxQuery },
      handler: async (req) => {
        const { page, pageSize } = req.query;
        const [messages, total] = await dataSource.getRepository(MailMessage).findAndCount({
          order: { createdAt: 'DESC', id: 'DESC' },
          skip: (page - 1) * pageSize,
          take: pageSize,
        });
        const shown = messages.map((message) => present(message, localSink));
        // Who read which messages (and whether links were readable) is in the audit trail.
        await inTransaction(dataSource, (manager) =>
          recordAudit(manager, {
            actor: currentUser(req),
            action: 'outbox.read',
            target: { type: 'outbox', id: null },
            details: { page, messageIds: shown.map((message) => message.id), linksShown: localSink && shown.some((message) => message.oneTimeLinks === 'shown') },
          }),
        );
        return { messages: shown, total, localSink };
      },
    }),
  ];
}

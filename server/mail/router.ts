import { z } from 'zod';
import type { MailMessage as MailMessageBody } from '@shared/users';
import type { AppContext } from '../context';
import { MailMessage } from '../db/entities/index';
import { defineRoute, type RouteDefinition } from '../http/routes';

const outboxQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

export function present(message: MailMessage): MailMessageBody {
  return {
    id: message.id,
    to: message.to,
    subject: message.subject,
    text: message.text,
    status: message.status,
    attempts: message.attempts,
    lastError: message.lastError,
    createdAt: message.createdAt.toISOString(),
    sentAt: message.sentAt ? message.sentAt.toISOString() : null,
  };
}

export function outboxRoutes({ dataSource }: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/outbox',
      access: ['admin'],
      summary: 'The outbox, newest first: ?page=&pageSize= → { messages, total }',
      validate: { query: outboxQuery },
      handler: async (req) => {
        const { page, pageSize } = req.query;
        const [messages, total] = await dataSource.getRepository(MailMessage).findAndCount({
          order: { createdAt: 'DESC', id: 'DESC' },
          skip: (page - 1) * pageSize,
          take: pageSize,
        });
        return { messages: messages.map(present), total };
      },
    }),
  ];
}

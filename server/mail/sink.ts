import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { DataSource } from 'typeorm';
import { now } from '../clock';
import { MailMessage } from '../db/entities/index';
import { withWriteLock } from '../db/transaction';
import type { Logger } from '../log';
import { outboxIdHeader } from './mailer';

/**
 * The local SMTP sink, used when no SMTP_URL is configured: a real SMTP server on the loopback
 * interface (ephemeral port, no authentication, no TLS) that parses each message it receives
 * (mailparser) and stores what it captured on the matching outbox record. Mail reaches it over
 * SMTP like any other server, so the whole path is exercised.
 */
export interface SmtpSink {
  host: string;
  port: number;
  close(): Promise<void>;
}

export async function startSmtpSink(dataSource: DataSource, log: Logger, maxBytes = 10 * 1024 * 1024): Promise<SmtpSink> {
  const host = '127.0.0.1';
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    banner: 'Scorecourt local mail sink',
    size: maxBytes,
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          if ((stream as { sizeExceeded?: boolean }).sizeExceeded) throw new Error('message too large for the sink');
          const header = parsed.headers.get(outboxIdHeader.toLowerCase());
          const id = Number(typeof header === 'string' ? header : NaN);
          const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : null;
          const envelopeTo = session.envelope.rcptTo.map((recipient) => recipient.address);
          if (!Number.isInteger(id)) {
            log.warn(`mail sink received a message without an outbox id (to ${envelopeTo.join(', ')}); not stored`);
            return;
          }
          await withWriteLock(dataSource, () =>
            dataSource
              .getRepository(MailMessage)
              .update({ id }, { receivedAt: now(), envelopeFrom, envelopeTo, receivedText: parsed.text ?? '' }),
          );
        })
        .then(() => callback())
        .catch((error: unknown) => {
          log.warn('mail sink could not store a message', error);
          callback(error instanceof Error ? error : new Error(String(error)));
        });
    },
  });
  server.on('error', (error) => log.warn('mail sink error', error));
  const port = await new Promise<number>((resolve, reject) => {
    server.once('error', reject);
    server.listen(0, host, () => {
      const address = server.server.address();
      if (address && typeof address === 'object') resolve(address.port);
      else reject(new Error('mail sink did not get a port'));
    });
  });
  return {
    host,
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

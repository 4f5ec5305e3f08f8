import nodemailer, { type Transporter } from 'nodemailer';
import type { DataSource } from 'typeorm';
import type { Config } from '../config';
import type { Logger } from '../log';
import { startSmtpSink, type SmtpSink } from './sink';

/**
 * The SMTP transport for the configuration: SMTP_URL when set, otherwise a local sink started
 * here (and returned, so the caller can close it).
 */
export async function createMailTransport(
  config: Pick<Config, 'smtpUrl'>,
  dataSource: DataSource,
  log: Logger,
): Promise<{ transport: Transporter; sink: SmtpSink | null; description: string }> {
  if (config.smtpUrl) {
    const url = new URL(config.smtpUrl);
    return { transport: nodemailer.createTransport(config.smtpUrl), sink: null, description: `SMTP server ${url.host}` };
  }
  const sink = await startSmtpSink(dataSource, log);
  const transport = nodemailer.createTransport({ host: sink.host, port: sink.port, secure: false, ignoreTLS: true });
  return { transport, sink, description: `local mail sink on ${sink.host}:${sink.port} (messages appear in the outbox)` };
}

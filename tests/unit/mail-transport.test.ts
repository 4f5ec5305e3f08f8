import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { openDatabase } from '@server/db/data-source';
import { createLogger } from '@server/log';
import { createMailTransport } from '@server/mail/transport';
import { createTestDatabase } from '../setup/test-database';

describe('mail transport', () => {
  it('uses SMTP_URL when set and starts no sink', async () => {
    const directory = mkdtempSync(join(tmpdir(), 'scorecourt-mail-'));
    const database = await createTestDatabase(directory, 'db.sqlite');
    const dataSource = await openDatabase(database.address);
    const mail = await createMailTransport({ smtpUrl: 'smtp://user:pw@mail.tallowmere.test:2587' }, dataSource, createLogger('silent'));
    expect(mail.sink).toBeNull();
    expect(mail.description).toBe('SMTP server mail.tallowmere.test:2587');
    mail.transport.close();

    const local = await createMailTransport({ smtpUrl: undefined }, dataSource, createLogger('silent'));
    expect(local.sink).not.toBeNull();
    expect(local.sink!.host).toBe('127.0.0.1');
    expect(local.sink!.port).toBeGreaterThan(0);
    expect(await local.transport.verify()).toBe(true); // a real SMTP conversation with the sink
    local.transport.close();
    await local.sink!.close();
    await dataSource.destroy();
    await database.drop();
    rmSync(directory, { recursive: true, force: true });
  });
});

import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { AppSetting } from './entities/index';
import { withWriteLock } from './transaction';

/**
 * The session secret when SESSION_SECRET is not set (outside production only): generated once per
 * database and kept in it, so restarting the server keeps everyone signed in.
 */
export async function storedSessionSecret(dataSource: DataSource): Promise<string> {
  const settings = dataSource.getRepository(AppSetting);
  await withWriteLock(dataSource, () =>
    settings
      .createQueryBuilder()
      .insert()
      .into(AppSetting)
      .values({ key: 'session_secret', value: randomBytes(32).toString('hex') })
      .orIgnore()
      .execute(),
  );
  const row = await settings.findOneByOrFail({ key: 'session_secret' });
  return row.value;
}

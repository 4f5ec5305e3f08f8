import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { largePageEnv } from '../../../scripts/large-pages.mjs';

// The engine's processes on large memory pages (scripts/large-pages.mjs, issue 20): the tunable is
// added on Linux only when the operator has not set GLIBC_TUNABLES, and a relaunched script runs
// with it, its exit code passed on.
describe('large pages', () => {
  it.runIf(process.platform === 'linux')('adds the tunable, unless GLIBC_TUNABLES is set (even empty)', () => {
    expect(largePageEnv({ PATH: '/usr/bin' })).toEqual({ PATH: '/usr/bin', GLIBC_TUNABLES: 'glibc.malloc.hugetlb=1' });
    const own = { GLIBC_TUNABLES: 'glibc.malloc.arena_max=2' };
    expect(largePageEnv(own)).toBe(own);
    const empty = { GLIBC_TUNABLES: '' };
    expect(largePageEnv(empty)).toBe(empty);
  });

  it.runIf(process.platform === 'linux')('relaunches a script once with the tunable and passes on its exit code', () => {
    const dir = mkdtempSync(join(tmpdir(), 'large-pages-'));
    const script = join(dir, 'probe.mjs');
    const module = pathToFileURL(join(process.cwd(), 'scripts/large-pages.mjs')).href;
    writeFileSync(
      script,
      `import { relaunchWithLargePages } from ${JSON.stringify(module)};
       if (await relaunchWithLargePages()) process.exit();
       console.log(String(process.env.GLIBC_TUNABLES));
       process.exitCode = 3;`,
    );
    const env = { ...process.env };
    delete env.GLIBC_TUNABLES;
    const run = spawnSync(process.execPath, [script], { encoding: 'utf8', env });
    expect(run.stdout.trim()).toBe('glibc.malloc.hugetlb=1');
    expect(run.status).toBe(3);
    const kept = spawnSync(process.execPath, [script], { encoding: 'utf8', env: { ...env, GLIBC_TUNABLES: '' } });
    expect(kept.stdout.trim()).toBe('');
    expect(kept.status).toBe(3);
  });
});

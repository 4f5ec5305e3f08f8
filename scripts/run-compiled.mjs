// `npm run compare` and friends run compiled JavaScript, not a TypeScript loader. This builds the
// server bundle when it is missing or older than the sources, then runs the given entry point
// with the remaining arguments, passing its exit code through.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

const [entry, ...args] = process.argv.slice(2);

function newestSource(dir) {
  let newest = 0;
  for (const item of readdirSync(dir, { withFileTypes: true })) {
    const path = join(dir, item.name);
    newest = Math.max(newest, item.isDirectory() ? newestSource(path) : statSync(path).mtimeMs);
  }
  return newest;
}

const stale = !existsSync(entry) || ['server', 'shared'].some((dir) => newestSource(dir) > statSync(entry).mtimeMs);
if (stale) {
  const built = spawnSync(process.execPath, ['scripts/build-server.mjs'], { stdio: ['ignore', 'ignore', 'inherit'] });
  if (built.status !== 0) process.exit(built.status ?? 1);
}
const run = spawnSync(process.execPath, [entry, ...args], { stdio: 'inherit' });
process.exit(run.status ?? 1);

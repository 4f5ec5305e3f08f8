// `npm run compare` and friends run compiled JavaScript, not a TypeScript loader. This builds the
// server bundle when it is missing or older than the sources, then runs the given entry point
// with the remaining arguments in this same process (a second Node process would add its whole
// start-up to every command; the one exception is the relaunch on Linux, once, that puts the
// engine on large memory pages: scripts/large-pages.mjs); the entry point sets the exit code.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { relaunchWithLargePages } from './large-pages.mjs';

// The engine's processes run on large memory pages (scripts/large-pages.mjs): once, at the start.
if (await relaunchWithLargePages()) process.exit();

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
const path = resolve(entry);
process.argv = [process.argv[0], path, ...args];
await import(pathToFileURL(path).href);

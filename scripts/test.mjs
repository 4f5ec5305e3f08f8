// `npm test`: the type check (`npm run typecheck`), the linter (`npm run lint`) and the unit and API
// tests (`vitest run`, extra arguments go to it) at the same time instead of one after the other.
// The checks run at the tests' priority: niced, they took the time the tests left free on a quiet
// machine but starved beside other CPU-bound work (an hour at load 30, long after the tests were
// done). Both keep their caches in node_modules/.cache (TypeScript's build info, ESLint's
// --cache), so after the first run they check only what changed. ESLint's cache goes by the files'
// content, not their times, so a cache restored onto a fresh clone (CI) still holds. Their output is printed after
// the tests' own; any failure fails the whole command.
import { spawn } from 'node:child_process';
import { join } from 'node:path';

const root = join(import.meta.dirname, '..');
const bin = (name) => join(root, 'node_modules', '.bin', name);

/** Runs a command; resolves with its exit code (and, when `capture`, its output). */
function run(name, command, args, { capture }) {
  const started = performance.now();
  const child = spawn(command, args, { cwd: root, stdio: capture ? ['ignore', 'pipe', 'pipe'] : 'inherit', env: { ...process.env, FORCE_COLOR: process.env.FORCE_COLOR ?? (process.stdout.isTTY ? '1' : '0') } });
  const output = [];
  if (capture) {
    child.stdout.on('data', (chunk) => output.push(chunk));
    child.stderr.on('data', (chunk) => output.push(chunk));
  }
  return new Promise((resolve) => {
    child.on('error', (error) => {
      output.push(Buffer.from(`${error.message}\n`));
      resolve({ name, code: 1, output, seconds: (performance.now() - started) / 1000 });
    });
    child.on('close', (code, signal) => resolve({ name, code: code ?? (signal ? 1 : 0), output, seconds: (performance.now() - started) / 1000 }));
  });
}

function report({ name, code, output, seconds }) {
  const text = Buffer.concat(output).toString('utf8').trimEnd();
  const status = code === 0 ? 'passed' : `FAILED (exit code ${code})`;
  process.stdout.write(`\n=== ${name} ${status} in ${seconds.toFixed(0)} s${text ? `\n${text}` : ''}\n`);
  return code;
}

const checks = [
  run('type check (tsc -b tsconfig.projects.json)', bin('tsc'), ['-b', 'tsconfig.projects.json'], { capture: true }),
  run('lint (eslint --cache .)', bin('eslint'), ['--cache', '--cache-strategy', 'content', '--cache-location', 'node_modules/.cache/eslint/', '.'], { capture: true }),
];
const tests = await run('vitest run', bin('vitest'), ['run', ...process.argv.slice(2)], { capture: false });
const codes = [...(await Promise.all(checks)).map(report), tests.code];
const failed = ['type check', 'lint', 'tests'].filter((_, index) => codes[index] !== 0);
process.stdout.write(failed.length === 0 ? `\nnpm test: type check, lint and tests passed (tests ${tests.seconds.toFixed(0)} s)\n` : `\nnpm test FAILED: ${failed.join(', ')}\n`);
process.exit(failed.length === 0 ? 0 : 1);

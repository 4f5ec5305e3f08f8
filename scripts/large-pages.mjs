// Large memory pages for the engine's processes (issue 20). The engine works on typed arrays of
// tens to hundreds of megabytes; with 4 KB pages every first touch of their memory is a page
// fault and every random read a likely TLB miss. glibc's tunable glibc.malloc.hugetlb=1 (glibc
// 2.35 and later) has malloc ask for transparent huge pages on the memory it maps, where Node's
// ArrayBuffers live; measured on the 2-core development machine: 10 fresh 80 MB arrays 8.5–9.4 s →
// 1.2–1.6 s, the compare command on 1,000,000 rows about 18 % less CPU. glibc reads the tunable
// when a process starts, so the process is started again with it. Elsewhere (not Linux), or when
// GLIBC_TUNABLES is already set (even empty: the operator's choice), nothing changes.
import { spawn } from 'node:child_process';
import { constants } from 'node:os';

const TUNABLE = 'glibc.malloc.hugetlb=1';

/** The environment for an engine process: `env` with the tunable, when it applies. */
export function largePageEnv(env = process.env) {
  if (process.platform !== 'linux' || 'GLIBC_TUNABLES' in env) return env;
  return { ...env, GLIBC_TUNABLES: TUNABLE };
}

/**
 * When this process lacks the tunable, runs this same script again in a child with it (signals
 * passed on, its exit code returned) and resolves true; the caller then does nothing more.
 * False when the tunable is already in place or does not apply.
 */
export function relaunchWithLargePages() {
  const env = largePageEnv();
  if (env === process.env) return Promise.resolve(false);
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [...process.execArgv, ...process.argv.slice(1)], { stdio: 'inherit', env });
    const forward = (signal) => child.kill(signal);
    for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP']) process.on(signal, forward);
    child.on('exit', (code, signal) => {
      process.exitCode = code ?? (signal ? 128 + (constants.signals[signal] ?? 0) : 1);
      resolve(true);
    });
  });
}

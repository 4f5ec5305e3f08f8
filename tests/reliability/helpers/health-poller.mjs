// A separate process that asks GET /api/health every INTERVAL ms (a new loopback connection each
// time, as a load balancer's probe does) and records how long each answer took, so the figures do
// not depend on what the test process itself is busy with. Its own event-loop delay is measured
// too: a late timer here is the machine's, not the server's. Ends on SIGTERM (or after MAX_MS) and
// prints one JSON line: { latencies: [ms…], startedAt: [ms since start…], failures, ownDelayMaxMs }.
import http from 'node:http';
import { monitorEventLoopDelay, performance } from 'node:perf_hooks';

const url = new URL(process.argv[2]);
const interval = Number(process.argv[3] ?? 50);
const maxMs = Number(process.argv[4] ?? 300_000);
const latencies = [];
const startedAt = [];
let failures = 0;
let stopping = false;
const delay = monitorEventLoopDelay({ resolution: 5 });
delay.enable();
const origin = performance.now();

function probe() {
  return new Promise((resolve) => {
    const start = performance.now();
    const request = http.get({ host: url.hostname, port: url.port, path: '/api/health', agent: false }, (response) => {
      response.resume();
      response.on('end', () => {
        if (response.statusCode === 200) {
          latencies.push(performance.now() - start);
          startedAt.push(start - origin);
        } else failures++;
        resolve();
      });
    });
    request.on('error', () => {
      failures++;
      resolve();
    });
    request.setTimeout(10_000, () => request.destroy(new Error('timeout')));
  });
}

function finish() {
  delay.disable();
  process.stdout.write(JSON.stringify({ latencies, startedAt, failures, ownDelayMaxMs: delay.max / 1e6 }) + '\n', () => process.exit(0));
}

process.on('SIGTERM', () => {
  stopping = true;
});
setTimeout(() => (stopping = true), maxMs).unref();
process.stdout.write('ready\n');
while (!stopping) {
  const next = performance.now() + interval;
  await probe();
  const wait = next - performance.now();
  if (wait > 0) await new Promise((resolve) => setTimeout(resolve, wait));
}
finish();

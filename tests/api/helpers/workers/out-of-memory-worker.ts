/** A faulty analysis worker for tests: fills its heap until the thread's memory limit stops it. */
const hoard: string[][] = [];
for (;;) hoard.push(Array.from({ length: 100_000 }, (_, i) => `${i}-${hoard.length}`));

/** A faulty analysis worker for tests: an uncaught exception on every attempt. */
setTimeout(() => {
  throw new Error('simulated crash in the analysis worker');
}, 5);

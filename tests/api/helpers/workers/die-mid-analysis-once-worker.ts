import { dieMidAnalysis } from './die-mid-analysis';

/** A faulty analysis worker for tests: dies in the middle of the first attempt (exit code 5), works on the next. */
await dieMidAnalysis([1], 5);

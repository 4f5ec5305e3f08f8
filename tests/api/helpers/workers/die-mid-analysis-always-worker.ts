import { dieMidAnalysis } from './die-mid-analysis';

/** A faulty analysis worker for tests: dies in the middle of every attempt (exit code 6). */
await dieMidAnalysis([1, 2, 3], 6);

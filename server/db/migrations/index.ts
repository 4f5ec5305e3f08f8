import { Foundation1764614400000 } from './1764614400000-foundation';
import { HoldoutsComparisonsRuns1764633600000 } from './1764633600000-holdouts-comparisons-runs';
import { Governance1764806400000 } from './1764806400000-governance';
import { SegmentRule1764920000000 } from './1764920000000-segment-rule';
import { DecisionRecord1764920000001 } from './1764920000001-decision-record';

/** Every migration in order, listed by hand: the server is bundled by esbuild, so there are no globs. */
export const migrations = [Foundation1764614400000, HoldoutsComparisonsRuns1764633600000, Governance1764806400000, SegmentRule1764920000000, DecisionRecord1764920000001];

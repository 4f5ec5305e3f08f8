import { Foundation1764614400000 } from './1764614400000-foundation';
import { HoldoutsComparisonsRuns1764633600000 } from './1764633600000-holdouts-comparisons-runs';
import { Governance1764806400000 } from './1764806400000-governance';
import { SegmentRule1764920000000 } from './1764920000000-segment-rule';
import { DecisionRecord1764920000001 } from './1764920000001-decision-record';
import { ReferenceSample1764930000000 } from './1764930000000-reference-sample';
import { DecisionPacks1764940000000 } from './1764940000000-decision-packs';

/** Every migration in order, listed by hand: the server is bundled by esbuild, so there are no globs. */
export const migrations = [
  Foundation1764614400000,
  HoldoutsComparisonsRuns1764633600000,
  Governance1764806400000,
  SegmentRule1764920000000,
  DecisionRecord1764920000001,
  ReferenceSample1764930000000,
  DecisionPacks1764940000000,
];

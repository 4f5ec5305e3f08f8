import { Foundation1764614400000 } from './1764614400000-foundation';
import { HoldoutsComparisonsRuns1764633600000 } from './1764633600000-holdouts-comparisons-runs';
import { Governance1764806400000 } from './1764806400000-governance';
import { SegmentRule1764920000000 } from './1764920000000-segment-rule';
import { DecisionRecord1764920000001 } from './1764920000001-decision-record';
import { ReferenceSample1764930000000 } from './1764930000000-reference-sample';
import { DecisionPacks1764940000000 } from './1764940000000-decision-packs';
import { AuditActorNames1764960000000 } from './1764960000000-audit-actor-names';
import { HoldoutSheet1764970000000 } from './1764970000000-holdout-sheet';
import { RateLimitHits1764980000000 } from './1764980000000-rate-limit-hits';
import { SeveralChallengers1764990000000 } from './1764990000000-several-challengers';
import { StagedUploads1765000000000 } from './1765000000000-staged-uploads';

/** Every migration in order, listed by hand: the server is bundled by esbuild, so there are no globs. */
export const migrations = [
  Foundation1764614400000,
  HoldoutsComparisonsRuns1764633600000,
  Governance1764806400000,
  SegmentRule1764920000000,
  DecisionRecord1764920000001,
  ReferenceSample1764930000000,
  DecisionPacks1764940000000,
  AuditActorNames1764960000000,
  HoldoutSheet1764970000000,
  RateLimitHits1764980000000,
  SeveralChallengers1764990000000,
  StagedUploads1765000000000,
];

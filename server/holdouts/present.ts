import type { HoldoutInfo } from '@shared/comparisons';
import type { Holdout } from '../db/entities/index';

/** A holdout as the API shows it (shared/comparisons.ts holdoutSchema); `uploadedBy` must be loaded. */
export function presentHoldout(holdout: Holdout): HoldoutInfo {
  return {
    id: holdout.id,
    fileName: holdout.fileName,
    sha256: holdout.sha256,
    bytes: holdout.bytes,
    rowCount: holdout.rowCount,
    columns: holdout.columns,
    preview: holdout.preview,
    guess: holdout.guess,
    uploadedBy: { id: holdout.uploadedBy.id, name: holdout.uploadedBy.name },
    uploadedAt: holdout.uploadedAt.toISOString(),
  };
}

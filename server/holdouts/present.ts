import type { HoldoutInfo } from '@shared/comparisons';
import type { Role } from '@shared/roles';
import type { Holdout } from '../db/entities/index';
import { boundPreview } from '../reader/preview-bounds';

/**
 * Who sees a holdout's first rows (account ids, amounts, outcomes): the roles that map columns and
 * validate. Everyone else sees the column names and what each holds, never the rows.
 */
export const previewRoles: readonly Role[] = ['modeler', 'analyst'];

export function seesPreview(roles: readonly Role[]): boolean {
  return roles.some((role) => previewRoles.includes(role));
}

/**
 * A holdout as the API shows it (shared/comparisons.ts holdoutSchema); `uploadedBy` must be loaded.
 * The preview is bounded again here (preview-bounds.ts), for holdouts stored before the bound.
 */
export function presentHoldout(holdout: Holdout, viewer: { roles: readonly Role[] }): HoldoutInfo {
  const shown = seesPreview(viewer.roles);
  return {
    id: holdout.id,
    fileName: holdout.fileName,
    sha256: holdout.sha256,
    bytes: holdout.bytes,
    rowCount: holdout.rowCount,
    sheet: holdout.sheet,
    columns: holdout.columns,
    preview: shown ? boundPreview(holdout.preview) : [],
    ...(shown ? {} : { previewWithheld: true }),
    guess: holdout.guess,
    uploadedBy: { id: holdout.uploadedBy.id, name: holdout.uploadedBy.name },
    uploadedAt: holdout.uploadedAt.toISOString(),
  };
}

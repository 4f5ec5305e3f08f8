import { z } from 'zod';
import { type RowError, rowErrorSchema } from '@shared/comparisons';
import { ApiError } from '@/lib/api-client';

const listSchema = z.array(rowErrorSchema);

/**
 * The row-and-column problems an API error carries in `details`: a list of row errors, or an
 * object with `errors` (the validation report's shape). Empty when it carries none.
 */
export function rowErrorsFrom(error: unknown): RowError[] {
  if (!(error instanceof ApiError)) return [];
  const details = error.details;
  const direct = listSchema.safeParse(details);
  if (direct.success) return direct.data;
  if (details && typeof details === 'object' && 'errors' in details) {
    const nested = listSchema.safeParse((details as { errors: unknown }).errors);
    if (nested.success) return nested.data;
  }
  const single = rowErrorSchema.safeParse(details);
  return single.success && (single.data.row !== null || single.data.column !== null) ? [single.data] : [];
}

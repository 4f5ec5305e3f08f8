import { z } from 'zod';
import { type RowError, rowErrorSchema } from '@shared/comparisons';
import { ApiError } from '@/lib/api-client';

const listSchema = z.array(rowErrorSchema);

const placeSchema = z.object({ row: z.number().int().nullable(), column: z.string().nullable() });

/**
 * The row-and-column problems an API error carries in `details`: a list of row errors, an object
 * with `errors` (the validation report's shape), or one place `{ row, column }` whose words are
 * the error's message (the API's 400 for a file). Empty when it names no row and no column.
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
  const place = placeSchema.safeParse(details);
  if (place.success && (place.data.row !== null || place.data.column !== null)) return [{ ...place.data, message: error.message }];
  return [];
}

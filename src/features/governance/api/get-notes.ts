import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { type Note, noteSchema } from '@shared/governance';
import { pageLimitMax } from '@shared/paging';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

const notesResponseSchema = z.object({ notes: z.array(noteSchema), nextAfter: z.number().int().nullable().optional() });

/** GET /api/comparisons/:id/notes → the discussion and the swap-set annotations, oldest first (every page). */
export async function getNotes(id: number): Promise<Note[]> {
  const notes: Note[] = [];
  let after: number | null | undefined = 0;
  while (after !== null && after !== undefined) {
    const page: z.infer<typeof notesResponseSchema> = await api.get(`/api/comparisons/${id}/notes?after=${after}&limit=${pageLimitMax}`, { schema: notesResponseSchema });
    notes.push(...page.notes);
    after = page.nextAfter;
  }
  return notes;
}

export const notesQueryOptions = (id: number) => queryOptions({ queryKey: queryKeys.comparisons.notes(id), queryFn: () => getNotes(id) });

export function useNotes(id: number) {
  return useQuery(notesQueryOptions(id));
}

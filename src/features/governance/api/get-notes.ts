import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { type Note, noteSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

const notesResponseSchema = z.object({ notes: z.array(noteSchema) });

/** GET /api/comparisons/:id/notes → the discussion and the swap-set annotations, oldest first. */
export async function getNotes(id: number): Promise<Note[]> {
  return (await api.get(`/api/comparisons/${id}/notes`, { schema: notesResponseSchema })).notes;
}

export const notesQueryOptions = (id: number) => queryOptions({ queryKey: queryKeys.comparisons.notes(id), queryFn: () => getNotes(id) });

export function useNotes(id: number) {
  return useQuery(notesQueryOptions(id));
}

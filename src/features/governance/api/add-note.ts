import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type z } from 'zod';
import { type Note, type noteInputSchema, noteSchema } from '@shared/governance';
import { api } from '@/lib/api-client';
import { queryKeys } from '@/lib/query-keys';

type Input = z.input<typeof noteInputSchema>;

/** POST /api/comparisons/:id/notes → the note; anyone in the discussion, the policy role on a swap set. */
export async function addNote({ id, ...input }: Input & { id: number }): Promise<Note> {
  return api.post(`/api/comparisons/${id}/notes`, input, { schema: noteSchema });
}

export function useAddNote(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: Input) => addNote({ id, ...input }),
    onSuccess: (note) => {
      queryClient.setQueryData<Note[]>(queryKeys.comparisons.notes(id), (notes) => (notes ? [...notes, note] : notes));
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.notes(id) }),
        queryClient.invalidateQueries({ queryKey: queryKeys.comparisons.audit(id) }),
      ]);
    },
  });
}

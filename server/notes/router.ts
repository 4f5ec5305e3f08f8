import { noteInputSchema } from '@shared/governance';
import { pageQuerySchema } from '@shared/paging';
import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { addNote, pageOfNotes } from './service';

export function noteRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/comparisons/:id/notes',
      access: 'signed-in',
      summary: "The comparison's discussion and swap-set annotations, oldest first, a page at a time (?after&limit → nextAfter)",
      validate: { params: idParams, query: pageQuerySchema },
      handler: async (req) => pageOfNotes(ctx.dataSource, req.params.id, req.query),
    }),
    defineRoute({
      method: 'post',
      path: '/comparisons/:id/notes',
      access: 'signed-in',
      summary: 'Add a note → 201 the note; anyone to the discussion, the policy role on a swap set (403 otherwise)',
      validate: { params: idParams, body: noteInputSchema },
      handler: async (req, res) => {
        const note = await addNote(ctx, currentUser(req), req.params.id, req.body);
        res.status(201);
        return note;
      },
    }),
  ];
}

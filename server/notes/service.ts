import { errorCodes } from '@shared/errors';
import type { Note as NoteBody, NoteInput } from '@shared/governance';
import { pageOf, type PageQuery } from '@shared/paging';
import { type DataSource, type EntityManager, MoreThan } from 'typeorm';
import { recordAudit } from '../audit/audit';
import { now } from '../clock';
import { findComparison } from '../comparisons/service';
import type { AppContext } from '../context';
import { CutoffScenario, Note, type User } from '../db/entities/index';
import { inTransaction } from '../db/transaction';
import { AppError, forbidden } from '../errors';
import { iso } from '@shared/format';
import { personRef } from '../users/present';

/**
 * Notes on a comparison: the discussion thread, open to everyone signed in, and annotations on
 * the swap sets, written by the policy role and optionally tied to one of the comparison's saved
 * cut-off scenarios. Notes are kept as written (no edit, no delete); each has an audit event.
 */

export function presentNote(note: Note): NoteBody {
  return {
    id: note.id,
    anchor: note.anchor,
    body: note.body,
    scenarioId: note.scenarioId,
    author: personRef(note.author),
    createdAt: iso(note.createdAt),
    afterDecision: note.afterDecision,
  };
}

export async function listNotes(source: DataSource | EntityManager, comparisonId: number): Promise<NoteBody[]> {
  await findComparison(source, comparisonId);
  const notes = await source.getRepository(Note).find({ where: { comparisonId }, order: { id: 'ASC' }, relations: { author: true } });
  return notes.map(presentNote);
}

/** A page of the notes, oldest first (shared/paging.ts). */
export async function pageOfNotes(source: DataSource | EntityManager, comparisonId: number, page: PageQuery): Promise<{ notes: NoteBody[]; nextAfter: number | null }> {
  await findComparison(source, comparisonId);
  const rows = await source.getRepository(Note).find({
    where: { comparisonId, id: MoreThan(page.after) },
    order: { id: 'ASC' },
    relations: { author: true },
    take: page.limit + 1,
  });
  const { items, nextAfter } = pageOf(rows, page.limit);
  return { notes: items.map(presentNote), nextAfter };
}

export async function addNote(ctx: AppContext, actor: User, comparisonId: number, input: NoteInput): Promise<NoteBody> {
  const id = await inTransaction(ctx.dataSource, async (manager) => {
    const comparison = await findComparison(manager, comparisonId);
    if (input.anchor !== 'discussion' && !actor.roles.includes('policy')) {
      throw forbidden('Only the credit policy role annotates the swap sets; everyone may write in the discussion.');
    }
    if (input.scenarioId !== null) {
      const scenario = await manager.getRepository(CutoffScenario).findOneBy({ id: input.scenarioId, comparisonId });
      if (!scenario) {
        throw new AppError(errorCodes.validation, `scenarioId: there is no saved scenario ${input.scenarioId} on this comparison`, 400, {
          issues: [{ location: 'body', path: 'scenarioId', message: `there is no saved scenario ${input.scenarioId} on this comparison` }],
        });
      }
    }
    const note = await manager.getRepository(Note).save(
      manager.getRepository(Note).create({
        comparisonId,
        anchor: input.anchor,
        body: input.body,
        scenarioId: input.scenarioId,
        authorId: actor.id,
        createdAt: now(),
        // After the decision the record is closed: a later note is kept, marked as such.
        afterDecision: comparison.state === 'decided',
      }),
    );
    await recordAudit(manager, {
      actor,
      action: 'note.added',
      target: { type: 'comparison', id: comparisonId },
      details: { noteId: note.id, anchor: note.anchor, scenarioId: note.scenarioId, body: note.body },
    });
    return note.id;
  });
  const note = await ctx.dataSource.getRepository(Note).findOneOrFail({ where: { id }, relations: { author: true } });
  return presentNote(note);
}

import type { EntityManager } from 'typeorm';
import { User, type Comparison } from '../db/entities/index';

/** The comparison's creator while their account is active (none otherwise): whom its e-mails go to. */
export async function creatorOf(manager: EntityManager, comparison: Pick<Comparison, 'createdById'>): Promise<User[]> {
  const creator = await manager.getRepository(User).findOneBy({ id: comparison.createdById });
  return creator?.active ? [creator] : [];
}

import type { Role } from '@shared/roles';
import type { DataSource } from 'typeorm';
import { recordAudit } from './audit/audit';
import { hashPassword } from './auth/password';
import { User } from './db/entities/index';
import { inTransaction } from './db/transaction';

/**
 * The demo people of Tallowmere Credit Cooperative, the invented lender of the demo scenario.
 * Seeded only into an empty database and never when NODE_ENV=production (the caller checks).
 * A later demo-scenario step extends seedDemo with comparisons.
 */

export const demoPassword = 'scorecourt-demo';

export const demoPeople: readonly { email: string; name: string; roles: Role[] }[] = [
  { email: 'admin@tallowmere.test', name: 'Morgan Hale', roles: ['admin'] },
  { email: 'modeler@tallowmere.test', name: 'Priya Natarajan', roles: ['modeler'] },
  { email: 'analyst@tallowmere.test', name: 'Tomasz Wielgus', roles: ['analyst'] },
  { email: 'policy@tallowmere.test', name: 'Rosa Delgado', roles: ['policy'] },
  { email: 'committee@tallowmere.test', name: 'Henrik Aalto', roles: ['committee'] },
  { email: 'committee2@tallowmere.test', name: 'Grace Okafor', roles: ['committee'] },
];

export interface SeedResult {
  /** False when the database already had people, so nothing was added. */
  seeded: boolean;
  people: User[];
}

export async function seedDemo(dataSource: DataSource, options: { bcryptCost: number }): Promise<SeedResult> {
  if ((await dataSource.getRepository(User).count()) > 0) return { seeded: false, people: [] };
  // One hash for all six: they share the published demo password anyway, and bcrypt at cost 12
  // takes a noticeable fraction of a second each.
  const passwordHash = await hashPassword(demoPassword, options.bcryptCost);
  return inTransaction(dataSource, async (manager) => {
    const users = manager.getRepository(User);
    if ((await users.count()) > 0) return { seeded: false, people: [] };
    const people: User[] = [];
    for (const person of demoPeople) {
      const user = await users.save(users.create({ ...person, passwordHash, active: true, createdAt: new Date() }));
      await recordAudit(manager, {
        actor: null,
        action: 'user.created',
        target: { type: 'user', id: user.id },
        details: { email: user.email, roles: user.roles, source: 'demo seed' },
      });
      people.push(user);
    }
    return { seeded: true, people };
  });
}

/** The demo people present in the database (for the start-up message). */
export async function presentDemoPeople(dataSource: DataSource): Promise<User[]> {
  const emails = new Set(demoPeople.map((person) => person.email));
  const all = await dataSource.getRepository(User).find({ order: { id: 'ASC' } });
  return all.filter((user) => emails.has(user.email) && user.active);
}

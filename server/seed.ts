import type { Role } from '@shared/roles';
import type { DataSource } from 'typeorm';
import { recordAudit } from './audit/audit';
import { hashPassword } from './auth/password';
import { now, replay } from './clock';
import type { AppContext } from './context';
import { momentOf, playScenario, type DemoComparison, type DemoPeople } from './demo/scenario';
import { User } from './db/entities/index';
import { inTransaction } from './db/transaction';

/**
 * The demo of Tallowmere Credit Cooperative, the invented lender of the demo scenario: its people
 * and, given the app's context, its three comparisons (demo/scenario.ts). Seeded only into an
 * empty database (no people yet) and never when NODE_ENV=production (the caller checks).
 *
 * With the scenario, the seed replays the past weeks (clock.ts): the people are created six weeks
 * ago and every step of the scenario is stamped with its own moment, so the pages, the audit
 * trail and the outbox read like a tool in use. The caller runs it before the server listens.
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
  /** The demo comparisons added (empty without the scenario). */
  comparisons: DemoComparison[];
}

export interface SeedOptions {
  bcryptCost: number;
  /** The app's context: also play the demo scenario (three comparisons) with it. */
  scenario?: AppContext | null;
  /** The real date the scenario's calendar counts back from (default: now). */
  today?: Date;
  /**
   * Bootstrap replicates of the scenario's analyses (default: demoSettings', 2,000): fewer for a
   * quicker trial seed; the reliability suite and every real first start play it in full.
   */
  replicates?: number;
  /** The folder of the scenario's files (default: sample-data/; see ScenarioOptions.dataDir). */
  dataDir?: string;
}

async function addPeople(dataSource: DataSource, passwordHash: string): Promise<User[] | null> {
  return inTransaction(dataSource, async (manager) => {
    const users = manager.getRepository(User);
    if ((await users.count()) > 0) return null;
    const people: User[] = [];
    for (const person of demoPeople) {
      const user = await users.save(users.create({ ...person, passwordHash, active: true, createdAt: now() }));
      await recordAudit(manager, {
        actor: null,
        action: 'user.created',
        target: { type: 'user', id: user.id },
        details: { email: user.email, roles: user.roles, source: 'demo seed' },
      });
      people.push(user);
    }
    return people;
  });
}

function byRole(people: User[]): DemoPeople {
  const find = (email: string) => {
    const user = people.find((person) => person.email === email);
    if (!user) throw new Error(`demo person ${email} is missing`);
    return user;
  };
  return {
    admin: find('admin@tallowmere.test'),
    modeler: find('modeler@tallowmere.test'),
    analyst: find('analyst@tallowmere.test'),
    policy: find('policy@tallowmere.test'),
    committee: find('committee@tallowmere.test'),
    committee2: find('committee2@tallowmere.test'),
  };
}

/** No people yet: the demo may be seeded. */
export async function databaseIsEmpty(dataSource: DataSource): Promise<boolean> {
  return (await dataSource.getRepository(User).count()) === 0;
}

export async function seedDemo(dataSource: DataSource, options: SeedOptions): Promise<SeedResult> {
  const notSeeded: SeedResult = { seeded: false, people: [], comparisons: [] };
  if (!(await databaseIsEmpty(dataSource))) return notSeeded;
  // One hash for all six: they share the published demo password anyway, and bcrypt at cost 12
  // takes a noticeable fraction of a second each.
  const passwordHash = await hashPassword(demoPassword, options.bcryptCost);
  const ctx = options.scenario;
  if (!ctx) {
    const people = await addPeople(dataSource, passwordHash);
    return people ? { seeded: true, people, comparisons: [] } : notSeeded;
  }
  const today = options.today ?? now();
  return replay(momentOf('people', today), async (advanceTo) => {
    const people = await addPeople(dataSource, passwordHash);
    if (!people) return notSeeded;
    const comparisons = await playScenario(ctx, byRole(people), { today, at: (step) => advanceTo(momentOf(step, today)), replicates: options.replicates, dataDir: options.dataDir });
    return { seeded: true, people, comparisons };
  });
}

/** The demo people present in the database (for the start-up message). */
export async function presentDemoPeople(dataSource: DataSource): Promise<User[]> {
  const emails = new Set(demoPeople.map((person) => person.email));
  const all = await dataSource.getRepository(User).find({ order: { id: 'ASC' } });
  return all.filter((user) => emails.has(user.email) && user.active);
}

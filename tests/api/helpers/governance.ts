import type { Role } from '@shared/roles';
import { expect } from 'vitest';
import { hashPassword } from '@server/auth/password';
import { MailMessage, User } from '@server/db/entities/index';
import { demoPassword } from '@server/seed';
import type { TestApp } from './app';
import { TestClient } from './client';
import { sample2k, sampleHead, sampleMapping, uploadFile } from './holdouts';

/** Helpers for the governance tests: analysed comparisons, extra people, mail look-ups. */

/**
 * Uploads the 2,000-row sample (or its first `rows` accounts, for tests of rules rather than figures)
 * and creates a comparison on it (no bootstrap, to stay quick); waits until it is analysed.
 */
export async function analysedComparison(
  t: TestApp,
  modeler: TestClient,
  options: { name?: string; settings?: Record<string, unknown>; rows?: number } = {},
): Promise<number> {
  const upload = await uploadFile(modeler, options.rows ? sampleHead(options.rows) : sample2k(), 'tallowmere-holdout-2025-sample-2k.csv');
  expect(upload.status, JSON.stringify(upload.body)).toBe(201);
  const created = await modeler.post('/api/comparisons', {
    name: options.name ?? 'Challenger v2 on the 2025 sample',
    holdoutId: (upload.body as { id: number }).id,
    mapping: sampleMapping,
    settings: { bootstrap: 0, ...options.settings },
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  const id = (created.body as { id: number }).id;
  await waitForRuns(t);
  const detail = await modeler.get(`/api/comparisons/${id}`);
  expect((detail.body as { state: string }).state).toBe('analysed');
  return id;
}

/**
 * How long the tests let the analysis queue go without finishing a run (JobRunner.whenIdle): far
 * above what a run takes on a quiet machine (seconds), so the suite stays green beside other
 * CPU-bound work (at load 40 one run of the 2,000-row sample took over a minute).
 */
export const queueWaitMs = 240_000;

/** Waits until no analysis is queued or running. */
export async function waitForRuns(t: TestApp): Promise<void> {
  await t.jobs.whenIdle(queueWaitMs);
}

/** A new, active person with these roles (password: the demo one), signed in. */
export async function personWith(t: TestApp, email: string, roles: Role[]): Promise<{ user: User; client: TestClient }> {
  const users = t.dataSource.getRepository(User);
  const user = await users.save(
    users.create({ email, name: email.split('@')[0], roles, active: true, passwordHash: await hashPassword(demoPassword, 4), createdAt: new Date() }),
  );
  const client = new TestClient(t.app);
  const response = await client.signIn(email);
  expect(response.status).toBe(200);
  return { user, client };
}

/** Outbox messages after `afterId`, oldest first. */
export async function outboxAfter(t: TestApp, afterId: number): Promise<MailMessage[]> {
  const all = await t.dataSource.getRepository(MailMessage).find({ order: { id: 'ASC' } });
  return all.filter((message) => message.id > afterId);
}

export async function lastOutboxId(t: TestApp): Promise<number> {
  const [last] = await t.dataSource.getRepository(MailMessage).find({ order: { id: 'DESC' }, take: 1 });
  return last?.id ?? 0;
}

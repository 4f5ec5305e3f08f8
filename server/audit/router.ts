import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { currentUser } from '../auth/guards';
import { inTransaction } from '../db/transaction';
import { recordAudit } from './audit';
import { verifyWholeAuditChain } from './chain-state';

/**
 * The admin's full verification of the audit chain: every event from the first, not only those
 * appended since the last check (audit/chain-state.ts). It is what finds an old event edited in
 * the database file behind the server's back; from then on every audit trail reports the chain
 * broken. The check itself is recorded in the trail.
 */
export function auditRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'post',
      path: '/audit/verify',
      access: ['admin'],
      summary: 'Verify the whole audit hash chain from its first event → { ok, events, brokenAt?, reason? }',
      handler: async (req) => {
        const check = await verifyWholeAuditChain(ctx.dataSource);
        await inTransaction(ctx.dataSource, (manager) =>
          recordAudit(manager, { actor: currentUser(req), action: 'audit.verified', target: { type: 'audit', id: null }, details: { ...check } }),
        );
        return check;
      },
    }),
  ];
}

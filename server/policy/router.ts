import { policyUpdateSchema } from '@shared/governance';
import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { changePolicy, currentPolicyVersion, listPolicyVersions } from './service';

export function policyRoutes(ctx: AppContext): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/policy',
      access: 'signed-in',
      summary: 'The current adoption policy (the newest version) with who changed it, when and why',
      handler: () => currentPolicyVersion(ctx.dataSource),
    }),
    defineRoute({
      method: 'put',
      path: '/policy',
      access: ['admin'],
      summary: 'Change the adoption policy (fields and a reason) → a new version; stored versions never change',
      validate: { body: policyUpdateSchema },
      handler: (req) => changePolicy(ctx, currentUser(req), req.body),
    }),
    defineRoute({
      method: 'get',
      path: '/policy/versions',
      access: 'signed-in',
      summary: 'Every adoption-policy version, newest first',
      handler: async () => ({ versions: await listPolicyVersions(ctx.dataSource) }),
    }),
  ];
}

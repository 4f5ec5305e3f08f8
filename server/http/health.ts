import { defineRoute, type RouteDefinition } from './routes';

export function healthRoutes(): RouteDefinition[] {
  return [
    defineRoute({
      method: 'get',
      path: '/health',
      access: 'public',
      summary: 'Liveness → { ok: true }',
      handler: () => ({ ok: true }),
    }),
  ];
}

import { describeAccess, type RouteDefinition } from './routes';

/**
 * docs/routes.md, written from the route registry (`routeTable(app)`): every API route with its
 * access rule, what it validates and its summary. `npm run docs:routes` writes the file
 * (scripts/write-routes-doc.ts); tests/api/route-docs.test.ts fails when the file and the
 * registry differ, so the table in the docs is never hand-edited and never stale.
 */
export function routesMarkdown(routes: readonly RouteDefinition[]): string {
  const escape = (text: string) => text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
  const validated = (route: RouteDefinition) =>
    (['params', 'query', 'body'] as const).filter((part) => route.schemas[part] !== undefined).join(', ') || '—';
  const lines = [
    '# API routes',
    '',
    '<!-- Generated from the route registry by `npm run docs:routes` (scripts/write-routes-doc.ts). Do not edit:',
    '     tests/api/route-docs.test.ts fails when this file and `routeTable(app)` differ. -->',
    '',
    `Every route of the API, all under \`/api\`, in the order they are mounted (${routes.length} routes). **access** is the`,
    "route's rule: `public`, `signed-in`, or the roles that may call it (401 when not signed in, 403",
    'for another role). **validated** names the parts of the request checked against a zod schema',
    'before the handler runs (a failure is a 400 naming the field). Rules beyond the role (four-eyes,',
    'the comparison\'s state) are the services\' and are described in [architecture.md](architecture.md).',
    '',
    '| method | path | access | validated | what it does |',
    '|---|---|---|---|---|',
    ...routes.map(
      (route) => `| ${route.method.toUpperCase()} | \`${route.path}\` | ${escape(describeAccess(route.access))} | ${validated(route)} | ${escape(route.summary)} |`,
    ),
    '',
  ];
  return lines.join('\n');
}

import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { routeTable } from '@server/app';
import { routesMarkdown } from '@server/http/route-docs';
import { projectRoot } from '@server/runtime';
import { buildTestApp, type TestApp } from './helpers/app';

/** docs/routes.md is generated from the registry; a route added, removed or re-worded without `npm run docs:routes` fails here. */

let t: TestApp;
beforeAll(async () => {
  t = await buildTestApp({ seed: false });
});
afterAll(async () => t?.close());

describe('docs/routes.md', () => {
  it('is the route registry as `npm run docs:routes` writes it', () => {
    const committed = readFileSync(join(projectRoot, 'docs', 'routes.md'), 'utf8');
    const routes = routeTable(t.app);
    expect(committed, 'docs/routes.md differs from the route registry: run `npm run docs:routes`').toBe(routesMarkdown(routes));
    // Every route appears once, by method and path.
    for (const route of routes) expect(committed).toContain(`| ${route.method.toUpperCase()} | \`${route.path}\` |`);
  });
});

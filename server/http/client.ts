import { existsSync } from 'node:fs';
import { join } from 'node:path';
import express, { type Request, type Response, type Router } from 'express';

/**
 * Serves the built React client (dist/client, made by `vite build`) with a fallback to
 * index.html for every other non-API GET outside /assets, so client-side routes survive a reload. When the client
 * has not been built, those requests get a plain message saying how to build it.
 */
export function clientRouter(clientDir: string): Router {
  const router = express.Router();
  const indexHtml = join(clientDir, 'index.html');
  router.use(
    '/assets',
    express.static(join(clientDir, 'assets'), { immutable: true, maxAge: '1y', index: false, fallthrough: true }),
    (_req: Request, res: Response) => {
      res.status(404).type('text/plain').send('No such file.\n');
    },
  );
  router.use(express.static(clientDir, { index: false, maxAge: 0 }));
  router.get('/{*path}', (_req, res) => {
    // Checked on each request, so building the client while the server runs is enough.
    if (!existsSync(indexHtml)) {
      res
        .status(503)
        .type('text/plain')
        .send(
          'Scorecourt is running, but its web client has not been built yet.\n\n' +
            'Run `npm run build` (or use `npm start`, which builds it first) and reload this page.\n' +
            'The API is available under /api (for example /api/health).\n',
        );
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml);
  });
  return router;
}

/** When SERVE_CLIENT=false (npm run dev), the client is served by Vite instead. */
export function noClientRouter(): Router {
  const router = express.Router();
  router.get('/{*path}', (_req, res) => {
    res
      .status(404)
      .type('text/plain')
      .send('This server serves only the API (SERVE_CLIENT=false). In development, open the address Vite printed.\n');
  });
  return router;
}

import { randomUUID } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import express, { type Express, type RequestHandler } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import type { DataSource } from 'typeorm';
import { auditRoutes } from './audit/router';
import { csrfProtection } from './auth/csrf';
import { createPassport } from './auth/passport';
import { authRoutes } from './auth/router';
import { SqliteSessionStore } from './auth/session-store';
import { comparisonRoutes } from './comparisons/router';
import { databaseAddress, type Config } from './config';
import type { AppContext } from './context';
import { apiNotFound, errorMiddleware } from './errors';
import { clientRouter, noClientRouter } from './http/client';
import { holdoutRoutes } from './holdouts/router';
import { governanceRoutes } from './governance/router';
import { renderPackOffThread } from './pack/render-thread';
import { packRoutes } from './pack/router';
import { uploadDirFor } from './holdouts/upload-dir';
import { healthRoutes } from './http/health';
import { mountRoutes, type RouteDefinition } from './http/routes';
import { wellFormedReviver } from './http/well-formed';
import { writeLimiter } from './http/write-limits';
import type { AnalysisQueue } from './jobs/queue';
import { JobRunner } from './jobs/runner';
import { createLogger, type Logger } from './log';
import type { Mailer } from './mail/mailer';
import { outboxRoutes } from './mail/router';
import { noteRoutes } from './notes/router';
import { policyRoutes } from './policy/router';
import { projectRoot } from './runtime';
import { userRoutes } from './users/router';
import { analysisHandlers } from './comparisons/analysis-handlers';
import { createPreparedCache, type PreparedCache } from './comparisons/prepared-cache';

export interface AppDeps {
  config: Config;
  dataSource: DataSource;
  mailer: Mailer;
  /** The secret that signs session cookies (config.sessionSecret, or the database's generated one). */
  sessionSecret: string;
  log?: Logger;
  /** Where the built client is; defaults to dist/client in the project folder. */
  clientDir?: string;
  /**
   * The analysis queue, started by the caller (server/index.ts, the tests). Without one, the app
   * makes and starts its own, and closeApp stops it.
   */
  jobs?: AnalysisQueue;
  /** Where uploads are streamed before they are stored; default: `uploads/` beside the database (holdouts/upload-dir.ts). */
  uploadDir?: string;
  /** The prepared swap-set cache, shared with the queue's handlers (made here when not given). */
  preparedCache?: PreparedCache;
  /** Lays out a committee pack's PDF; default: on a pack thread (pack/render-thread.ts). */
  layOutPack?: AppContext['layOutPack'];
}

/** Sessions last 8 hours from the last request. */
const sessionIdleMs = 8 * 60 * 60 * 1000;

/** Every API route, feature by feature. A new feature adds its `…Routes(ctx)` here. */
function apiRoutes(ctx: AppContext, passport: ReturnType<typeof createPassport>): RouteDefinition[] {
  return [
    ...healthRoutes(ctx),
    ...authRoutes(ctx, passport),
    ...userRoutes(ctx),
    ...outboxRoutes(ctx),
    ...holdoutRoutes(ctx),
    ...comparisonRoutes(ctx),
    ...governanceRoutes(ctx),
    ...packRoutes(ctx),
    ...noteRoutes(ctx),
    ...policyRoutes(ctx),
    ...auditRoutes(ctx),
  ];
}

const requestId: RequestHandler = (_req, res, next) => {
  res.setHeader('X-Request-Id', randomUUID());
  next();
};

/**
 * Builds the Express app: security headers, the API under /api (JSON body, session, passport,
 * CSRF, the route registry, JSON 404), the built client for everything else, and the one error
 * middleware. Tests build their own with a temporary database.
 */
export function createApp(deps: AppDeps): Express {
  const { config, dataSource, mailer } = deps;
  const log = deps.log ?? createLogger(config.logLevel);
  const uploadDir = deps.uploadDir ?? config.uploadDir ?? uploadDirFor(config.databasePath);
  mkdirSync(uploadDir, { recursive: true });
  const preparedCache = deps.preparedCache ?? createPreparedCache(dataSource);
  const ownJobs = deps.jobs === undefined;
  const jobs =
    deps.jobs ??
    new JobRunner({
      dataSource,
      databasePath: databaseAddress(config),
      concurrency: config.analysisConcurrency,
      log,
      handlers: analysisHandlers({ dataSource, mailer, publicUrl: config.publicUrl, preparedCache }),
    });
  if (ownJobs) void jobs.start().catch((error: unknown) => log.error('the analysis queue could not start', error));
  const ctx: AppContext = { config, dataSource, mailer, log, jobs, uploadDir, preparedCache, layOutPack: deps.layOutPack ?? renderPackOffThread };

  const app = express();
  app.set('trust proxy', config.trustProxy);
  app.set('query parser', 'simple');
  app.use(requestId);
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'"],
          fontSrc: ["'self'", 'data:'],
          imgSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
        },
      },
      strictTransportSecurity: config.isProduction,
    }),
  );

  const store = new SqliteSessionStore(dataSource, log, { defaultTtlMs: sessionIdleMs, pruneEveryMs: 10 * 60_000 });
  const passport = createPassport(dataSource, config.bcryptCost);
  const routes = apiRoutes(ctx, passport);

  const api = express.Router();
  // API answers carry personal and decision data: never kept by a browser or a proxy.
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  api.use(express.json({ limit: '1mb', reviver: wellFormedReviver }));
  api.use(
    session({
      name: 'scorecourt.sid',
      secret: deps.sessionSecret,
      store,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      unset: 'destroy',
      cookie: { httpOnly: true, sameSite: 'lax', secure: config.isProduction, maxAge: sessionIdleMs, path: '/' },
    }),
  );
  api.use(passport.initialize());
  api.use(passport.session());
  api.use(csrfProtection);
  mountRoutes(api, routes, { writeLimit: writeLimiter(config.writesPerMinute, dataSource) });
  api.use(apiNotFound);
  app.use('/api', api);

  app.use(config.serveClient ? clientRouter(deps.clientDir ?? join(projectRoot, 'dist', 'client')) : noClientRouter());
  app.use(errorMiddleware(log));

  app.locals.routes = routes;
  app.locals.jobs = jobs;
  app.locals.close = () => {
    store.close();
    if (ownJobs) void jobs.stop();
  };
  return app;
}

/** The route registry of an app made by createApp (for the role matrix and the docs). */
export function routeTable(app: Express): readonly RouteDefinition[] {
  return app.locals.routes as RouteDefinition[];
}

/** Stops the app's timers (the session pruner) and a queue it made itself; the caller closes the server and database. */
export function closeApp(app: Express): void {
  (app.locals.close as () => void)();
}

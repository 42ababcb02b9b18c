import express, { type Express } from 'express';
import helmet from 'helmet';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { pinoHttp } from 'pino-http';
import { attachmentsRouter } from './attachments/attachments.router.ts';
import { auditRouter } from './audit/audit.router.ts';
import { authRouter } from './auth/auth.router.ts';
import { healthRouter } from './health/health.router.ts';
import { createRouteMounter } from './lib/route.ts';
import { outboxRouter } from './mail/outbox.router.ts';
import { apiNotFound, errorHandler } from './middleware/error-handler.ts';
import { revisionsRouter } from './revisions/revisions.router.ts';
import { createServices, type AppDeps } from './services.ts';
import { sitesRouter } from './sites/sites.router.ts';
import { usersRouter } from './users/users.router.ts';

export type { AppDeps } from './services.ts';

/** JSON bodies are small: the site file itself travels as YAML (limit in revisions.router.ts). */
const JSON_LIMIT = '100kb';

/** Serves the built reviewer: files as they are, and index.html for every other page address. */
function serveWeb(app: Express, webDir: string) {
  const index = path.join(webDir, 'index.html');
  app.use(
    express.static(webDir, {
      index: false,
      setHeaders: (res, file) => {
        // Vite names built assets by content hash.
        if (file.includes(`${path.sep}assets${path.sep}`)) res.set('Cache-Control', 'public, max-age=31536000, immutable');
      },
    }),
  );
  app.use((req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || req.path.startsWith('/api')) return next();
    res.set('Cache-Control', 'no-cache').sendFile(index);
  });
}

/** The whole HTTP side, without listening: main.ts listens, tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const { config, logger, db, mailer } = deps;
  const services = createServices(deps);
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy);
  app.set('query parser', 'simple');

  app.use(
    pinoHttp({
      logger,
      // One short line per request: no headers, so no tokens in the log.
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    }),
  );
  app.use(
    helmet({
      // Served over plain http on a LAN as often as behind TLS: do not rewrite requests to https.
      contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } },
    }),
  );
  app.use(express.json({ limit: JSON_LIMIT }));

  const { mount, assertComplete } = createRouteMounter(services.auth);
  app.use(healthRouter(mount, db));
  app.use(authRouter(mount, services.auth, config));
  app.use(usersRouter(mount, services.users, services.auth.issueToken));
  app.use(revisionsRouter(mount, services.revisions));
  app.use(sitesRouter(mount, services.sites, services.revisions));
  app.use(attachmentsRouter(mount, services.attachments));
  app.use(auditRouter(mount, services.audit, services.now));
  app.use(outboxRouter(mount, mailer));
  assertComplete();

  app.use('/api', apiNotFound);
  if (config.webDir && existsSync(path.join(config.webDir, 'index.html'))) serveWeb(app, config.webDir);
  app.use(errorHandler);
  return app;
}

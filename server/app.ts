import fs from 'node:fs';
import path from 'node:path';
import express from 'express';
import type { Logger } from 'pino';
import helmet from 'helmet';
import { config as defaultConfig, type Config } from './config.js';
import { sessionMiddleware, sessionLifetime, loadActor, requireActor } from './lib/auth.js';
import { openApiHandler } from './openapi.js';
import { sameOriginOnly } from './lib/same-origin.js';
import { refuseUnstorableText } from './lib/text-guard.js';
import { errorHandler, notFoundHandler } from './lib/errors.js';
import { logger } from './lib/logger.js';
import { requestLogger } from './lib/request-log.js';
import { cachedHealthReport } from './lib/health.js';
import { rateLimiters } from './lib/rate-limit.js';
import { authRouter, invitationsRouter, meRouter, peopleRouter } from './modules/members/routes.js';
import { loadActorRecord } from './modules/members/service.js';
import { networksRouter } from './modules/networks/routes.js';
import { devRouter } from './modules/dev/routes.js';
import { reportsRouter } from './modules/reports/routes.js';
import { registryRouter } from './modules/registry/routes.js';
import { padmapsRouter } from './modules/padmaps/routes.js';
import { stockRouter } from './modules/stock/routes.js';
import { jobsRouter, publicJobsRouter } from './modules/jobs/routes.js';
import { filesRouter } from './modules/files/routes.js';
import { transfersRouter } from './modules/transfers/routes.js';
import { notificationsRouter } from './modules/notifications/routes.js';

export interface AppOptions {
  /** The environment's configuration unless given; tests pass another to see how the app is built for production. */
  config?: Config;
  /** Defaults to `config.rateLimits`; tests build apps with low limits of their own. */
  rateLimits?: Config['rateLimits'];
  healthCacheMs?: number;
  /** Where request lines go; the app's logger unless given (tests read the lines). */
  logger?: Logger;
}

/** Builds the Express app: API, sign-in, and (when built) the client. No listening here; see start.ts. */
export function buildApp(options: AppOptions = {}) {
  const config = options.config ?? defaultConfig;
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', config.trustProxy);
  // first: every answer, refusals included, carries the request's id
  app.use(requestLogger(options.logger ?? logger));
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // photos and documents come straight from object storage through presigned URLs
          'img-src': ["'self'", 'data:', 'blob:', config.s3.endpoint],
          'connect-src': ["'self'", config.s3.endpoint],
          'frame-src': ["'self'"],
          'form-action': ["'self'", config.oidc.issuer],
          'upgrade-insecure-requests': config.appOrigin.startsWith('https://') ? [] : null,
        },
      },
    }),
  );
  // before any router: a page of another site cannot make the browser change anything here
  app.use(sameOriginOnly(config.allowedOrigins));
  app.use(express.json({ limit: '1mb' }));
  app.use(refuseUnstorableText());

  const health = cachedHealthReport(options.healthCacheMs ?? config.healthCacheMs);
  app.get('/api/health', async (_req, res) => {
    const report = await health();
    res.status(report.ok ? 200 : 503).json(report);
  });

  app.use(sessionMiddleware(config));
  app.use(sessionLifetime());
  app.use(loadActor(loadActorRecord));
  // the API's description, for any signed-in person (server/openapi.ts says why not public)
  app.get('/api/openapi.json', requireActor, openApiHandler);

  // after the actor is known: search, imports and uploads count per person, the rest per address
  const limit = rateLimiters(options.rateLimits ?? config.rateLimits);
  app.get(['/auth/login', '/auth/callback'], limit.signIn);
  app.get('/api/invitations/preview/:token', limit.invitations);
  app.post('/api/invitations/accept', limit.invitations);
  app.get(['/api/instruments/search', '/api/instruments/serial-check', '/api/customers'], limit.search);
  app.post('/api/instruments/import', limit.imports);
  app.post(['/api/jobs/:jobId/attachments', '/api/attachments/:attachmentId/upload-url'], limit.uploads);
  app.get('/api/public/jobs/:token', limit.customerLinks);
  app.post('/api/public/jobs/:token/decision', limit.customerLinks);

  app.use(authRouter);
  app.use(meRouter);
  app.use(peopleRouter);
  app.use(invitationsRouter);
  app.use(networksRouter);
  app.use(reportsRouter);
  // the caught-mail API exists only while the local mail catcher is configured (never in production)
  if (config.mailCatcherDir && !config.production) app.use(devRouter(config.mailCatcherDir));
  app.use(registryRouter);
  app.use(padmapsRouter);
  app.use(stockRouter);
  app.use(jobsRouter);
  app.use(publicJobsRouter);
  app.use(filesRouter);
  app.use(transfersRouter);
  app.use(notificationsRouter);

  app.use('/api', notFoundHandler);

  const clientDir = config.clientDir;
  if (fs.existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }));
    // the client's router owns every other path
    app.get('/{*splat}', (_req, res) => res.sendFile('index.html', { root: clientDir }));
  }

  app.use(notFoundHandler);
  app.use(errorHandler);
  return app;
}

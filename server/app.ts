import express, { type Express } from 'express';
import type { DataSource } from 'typeorm';
import type { Redis } from 'ioredis';
import type { Config } from './config';
import type { Logger } from './logger';
import type { Mailer } from './mail/mailer';
import { apiNotFound, errorHandler } from './middleware/error-handler';
import { authenticate } from './middleware/authenticate';
import { csrfProtection } from './middleware/csrf';
import { bodyParsers, securityHeaders } from './middleware/security';
import { createAuditRouter } from './modules/audit/router';
import { createAuthRouter } from './modules/auth/router';
import { createBatchesRouter } from './modules/batches/router';
import { createReviewsRouter } from './modules/reviews/router';
import { createSessionMiddleware } from './modules/auth/session';
import { createDevMailboxRouter } from './modules/dev-mailbox/router';
import { createTemplatesRouter } from './modules/templates/router';
import { createTokensRouter } from './modules/tokens/router';
import { createWorkspacesRouter } from './modules/workspaces/router';
import { createHealthRouter } from './modules/health/router';
import { createWebAppRouter } from './web-app';

/** What the app needs from the outside; index.ts builds the real ones, tests build their own. */
export interface AppDeps {
  config: Config;
  logger: Logger;
  dataSource: DataSource;
  /** Plain Redis commands (heartbeat, rate limits). BullMQ opens its own connections. */
  redis: Redis;
  mailer: Mailer;
}

/**
 * Builds the Express app (no listen). Module routers are mounted here, in one place, so the
 * route table is easy to audit.
 */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');

  // --- security, sessions and the caller (auth): order matters ---
  app.use(securityHeaders(deps.config));
  app.use(csrfProtection(deps.config));
  app.use(bodyParsers());
  app.use(['/api', '/auth'], createSessionMiddleware(deps), authenticate(deps.dataSource));

  // --- module routers (each module: server/modules/<name>/router.ts) ---
  app.use('/api', createHealthRouter(deps));
  app.use(createAuthRouter(deps));
  app.use('/api', createWorkspacesRouter(deps), createTokensRouter(deps), createAuditRouter(deps), createDevMailboxRouter(deps));

  app.use('/api', createBatchesRouter(deps), createReviewsRouter(deps));
  app.use('/api', createTemplatesRouter(deps));

  app.use('/api', apiNotFound);
  const webApp = createWebAppRouter(deps.config.WEB_DIST);
  if (webApp) app.use(webApp);
  app.use(errorHandler(deps.logger));
  return app;
}

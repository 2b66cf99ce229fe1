import connectPgSimple from 'connect-pg-simple';
import session from 'express-session';
import type { RequestHandler } from 'express';
import type { Pool } from 'pg';
import type { DataSource } from 'typeorm';
import { configSchema, publicUrl, type Config } from '../../config';
import type { Logger } from '../../logger';

declare module 'express-session' {
  interface SessionData {
    /** Same-origin path to land on after the provider round trip. */
    returnTo?: string;
  }
}

/** Name of the session cookie. */
export const SESSION_COOKIE = 'pf.sid';

/** TypeORM's own pg pool, so sessions share the app's connections and settings. */
function poolOf(dataSource: DataSource): Pool {
  return (dataSource.driver as unknown as { master: Pool }).master;
}

/**
 * Browser sessions (express-session) stored in PostgreSQL by connect-pg-simple, in the
 * `sessions` table that migration AuthSecurity creates (the store's auto-create stays off).
 * Cookie: httpOnly, SameSite=Lax, Secure when the app is served over HTTPS.
 */
export function createSessionMiddleware(deps: { config: Config; dataSource: DataSource; logger: Logger }): RequestHandler {
  const { config } = deps;
  if (config.NODE_ENV === 'production' && config.SESSION_SECRET === configSchema.shape.SESSION_SECRET.parse(undefined)) {
    // The default is public (it is in the repository): cookies and invitation links signed with it could be forged.
    throw new Error('Invalid configuration: SESSION_SECRET must be set to a private random value in production');
  }
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool: poolOf(deps.dataSource),
    tableName: 'sessions',
    createTableIfMissing: false,
    // Tests build many short-lived apps; one pruning timer per app is noise there.
    pruneSessionInterval: config.NODE_ENV === 'test' ? false : 15 * 60,
    errorLog: (...args: unknown[]) => deps.logger.error({ args }, 'session store error'),
  });
  const https = publicUrl(config).startsWith('https:');
  return session({
    name: SESSION_COOKIE,
    secret: config.SESSION_SECRET,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      // Behind an HTTPS proxy (trusted by app.ts) or with an https PUBLIC_URL, the cookie is Secure.
      secure: https ? true : 'auto',
      maxAge: config.SESSION_MAX_AGE_HOURS * 3600 * 1000,
      path: '/',
    },
  });
}

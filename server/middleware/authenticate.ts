import { createHash } from 'node:crypto';
import type { RequestHandler } from 'express';
import type { DataSource } from 'typeorm';
import { IsNull } from 'typeorm';
import type {} from 'express-session';
import { unauthenticated } from '../errors';
import { ApiToken } from '../modules/tokens/entity';

/** Who is calling: a signed-in session or an API token (which is bound to one workspace). */
export interface AuthContext {
  userId: string;
  via: 'session' | 'token';
  /** For tokens: the only workspace this call may touch. */
  workspaceId?: string;
  tokenId?: string;
}

declare module 'express-serve-static-core' {
  interface Request {
    auth?: AuthContext;
  }
}

declare module 'express-session' {
  interface SessionData {
    userId?: string;
  }
}

/** SHA-256 hex of an API token secret: what the database stores. */
export function hashToken(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex');
}

/**
 * Sets `req.auth` from `Authorization: Bearer TOKEN` or the session cookie. Does not reject:
 * routes that need a caller use `requireAuth`. A bad or revoked token is a 401 at once
 * (a script must learn its token is dead, not fall back to anonymous).
 */
export function authenticate(dataSource: DataSource): RequestHandler {
  const tokens = dataSource.getRepository(ApiToken);
  return async (req, _res, next) => {
    const header = req.headers.authorization;
    if (header?.startsWith('Bearer ')) {
      const secret = header.slice('Bearer '.length).trim();
      const token = await tokens.findOneBy({ tokenHash: hashToken(secret), revokedAt: IsNull() });
      if (!token) return next(unauthenticated('The API token is unknown or revoked'));
      req.auth = { userId: token.userId, via: 'token', workspaceId: token.workspaceId, tokenId: token.id };
      // Last use is informative only; don't hold the request for it.
      void tokens.update({ id: token.id }, { lastUsedAt: new Date() }).catch(() => undefined);
      return next();
    }
    const userId = req.session?.userId;
    if (userId) req.auth = { userId, via: 'session' };
    next();
  };
}

/** 401 unless `authenticate` found a caller. */
export const requireAuth: RequestHandler = (req, _res, next) => {
  next(req.auth ? undefined : unauthenticated());
};

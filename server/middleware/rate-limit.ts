import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { Redis } from 'ioredis';
import { RedisStore, type RedisReply } from 'rate-limit-redis';
import type { Config } from '../config';
import { DomainError } from '../errors';

type Deps = { redis: Redis; config: Pick<Config, 'QUEUE_PREFIX' | 'RATE_LIMIT_SIGN_IN' | 'RATE_LIMIT_INVITATIONS' | 'RATE_LIMIT_UPLOADS'> };

/** The signed-in user (or token) when there is one, else the client address. */
function callerKey(req: Request): string {
  return req.auth ? `user:${req.auth.userId}` : `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`;
}

/**
 * A fixed-window limiter whose counters live in Redis, so every API process behind a load
 * balancer shares them. If Redis is unreachable the request goes through (logged by the store's
 * caller); availability wins over a limit that is a brake, not an access control.
 */
function limiter(deps: Deps, name: string, windowMs: number, limit: number, key: (req: Request) => string, message: string): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    passOnStoreError: true,
    keyGenerator: key,
    store: new RedisStore({
      prefix: `${deps.config.QUEUE_PREFIX}:rl:${name}:`,
      sendCommand: (command: string, ...args: string[]) => deps.redis.call(command, ...args) as Promise<RedisReply>,
    }),
    handler: (_req, _res, next) => next(new DomainError('rate-limited', message)),
  });
}

const MINUTE = 60_000;

/** Sign-in start and provider callback, per client address. */
export function signInRateLimit(deps: Deps): RequestHandler {
  return limiter(deps, 'sign-in', 15 * MINUTE, deps.config.RATE_LIMIT_SIGN_IN, (req) => `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`,
    'Too many sign-in attempts from this address; wait a few minutes and try again');
}

/**
 * Invitations: `send` counts invitations an owner sends, `link` counts attempts to open or
 * accept links (per user, or per address before sign-in) — a brake on guessing.
 */
export function invitationRateLimit(deps: Deps, kind: 'send' | 'link' = 'send'): RequestHandler {
  return limiter(deps, `invitations-${kind}`, 60 * MINUTE, deps.config.RATE_LIMIT_INVITATIONS, callerKey,
    kind === 'send' ? 'Too many invitations sent in the last hour; wait a while and try again' : 'Too many invitation requests; wait a while and try again');
}

/**
 * Batch uploads and previews, per user (or API token's user). Mount it after `requireAuth`:
 * `router.post('/workspaces/:slug/batches', requireAuth, uploadRateLimit(deps), ...)`.
 */
export function uploadRateLimit(deps: Deps): RequestHandler {
  return limiter(deps, 'uploads', 15 * MINUTE, deps.config.RATE_LIMIT_UPLOADS, callerKey,
    'Too many uploads in a short time; wait a few minutes and try again');
}

import { Router, type NextFunction, type Request, type Response } from 'express';
import * as z from 'zod';
import type { AppDeps } from '../../app';
import { DomainError } from '../../errors';
import { requireAuth } from '../../middleware/authenticate';
import { signInRateLimit } from '../../middleware/rate-limit';
import type { User } from '../users/entity';
import { createWorkspaceService } from '../workspaces/service';
import { CALLBACK_PATH, createSignInPassport } from './passport';
import { createAuthService } from './service';
import { SESSION_COOKIE } from './session';

/** A same-origin path (no scheme, no host, no `//`), so a returnTo can't become an open redirect. */
export function isSafeReturnPath(path: unknown): path is string {
  return typeof path === 'string' && /^\/(?![/\\])[^\s]*$/.test(path) && path.length <= 2000 && !path.startsWith('/auth/');
}

const startQuery = z.object({ returnTo: z.string().max(2000).optional() });

/** Why the provider round trip failed, as a short code for the sign-in page (`/sign-in?error=`). */
function failureCode(err: unknown, info: { message?: string } | undefined): string {
  if (err instanceof DomainError) return err.code === 'conflict' ? 'account-conflict' : 'no-verified-email';
  if (err) return 'provider';
  if (info?.message && /state/i.test(info.message)) return 'state';
  return 'cancelled';
}

/**
 * Sign-in through the OAuth provider, sign-out, and `GET /api/me`.
 *
 * GET /auth/github[?returnTo=/path]  → redirect to the provider's authorize page
 * GET /auth/github/callback          → checks state, exchanges the code, rotates the session id,
 *                                      redirects to returnTo or `/` (on failure `/sign-in?error=CODE`)
 * POST /auth/sign-out                → destroys the session (204; 303 to /sign-in for HTML forms)
 */
export function createAuthRouter(deps: AppDeps): Router {
  const auth = createAuthService(deps);
  const workspaces = createWorkspaceService(deps);
  const passport = createSignInPassport(deps.config, (profile) => auth.signInFromProvider(profile));
  const limit = signInRateLimit(deps);
  if (deps.config.NODE_ENV === 'production' && /^https?:\/\/(127\.|localhost|\[::1\])/.test(deps.config.OAUTH_BASE_URL)) {
    deps.logger.warn(
      { oauthBaseUrl: deps.config.OAUTH_BASE_URL },
      'sign-in points at a loopback provider in production; set OAUTH_BASE_URL=https://github.com and OAUTH_API_URL=https://api.github.com',
    );
  }
  const router = Router();

  router.get('/auth/github', limit, (req, res, next) => {
    const { returnTo } = startQuery.parse(req.query);
    if (isSafeReturnPath(returnTo)) req.session.returnTo = returnTo;
    passport.authenticate('github', { session: false })(req, res, next);
  });

  router.get(CALLBACK_PATH, limit, (req: Request, res: Response, next: NextFunction) => {
    passport.authenticate('github', { session: false }, (err: unknown, user: User | false, info?: { message?: string }) => {
      if (err || !user) {
        if (err && !(err instanceof DomainError)) deps.logger.warn({ err }, 'sign-in through the provider failed');
        return res.redirect(303, `/sign-in?error=${failureCode(err, info)}`);
      }
      const returnTo = isSafeReturnPath(req.session.returnTo) ? req.session.returnTo : '/';
      // A new session id at sign-in: a session id planted before sign-in is worthless after it.
      req.session.regenerate((regenerateErr) => {
        if (regenerateErr) return next(regenerateErr);
        req.session.userId = user.id;
        req.session.save((saveErr) => (saveErr ? next(saveErr) : res.redirect(303, returnTo)));
      });
    })(req, res, next);
  });

  router.post('/auth/sign-out', (req, res, next) => {
    const done = () => {
      res.clearCookie(SESSION_COOKIE, { path: '/', httpOnly: true, sameSite: 'lax' });
      if (req.accepts(['json', 'html']) === 'html') res.redirect(303, '/sign-in');
      else res.status(204).end();
    };
    if (!req.session) return done();
    req.session.destroy((err) => (err ? next(err) : done()));
  });

  router.get('/api/me', requireAuth, async (req, res) => {
    res.json(await workspaces.me(req.auth!));
  });

  return router;
}

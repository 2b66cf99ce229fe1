import type { RequestHandler } from 'express';
import { publicUrl, type Config } from '../config';
import { DomainError } from '../errors';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

function originOf(value: string | undefined): string | null {
  if (!value || value === 'null') return null;
  try {
    return new URL(value).origin;
  } catch {
    return null;
  }
}

/**
 * Refuses state-changing requests that a browser sends on behalf of another site: a POST,
 * PATCH, PUT or DELETE must carry an Origin (or, failing that, a Referer) of this app — the
 * configured public URL or the host the request was addressed to. Cookies are what a forged
 * request would ride on, so Bearer-token requests (scripts, the CLI) are exempt: a browser never
 * adds that header by itself. The JSON API and plain HTML forms are covered alike.
 *
 * OWASP CSRF Prevention Cheat Sheet, "Verifying Origin with standard headers".
 */
export function csrfProtection(config: Pick<Config, 'PUBLIC_URL' | 'HOST' | 'PORT'>): RequestHandler {
  const configured = originOf(publicUrl(config as Config));
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    if (req.headers.authorization?.startsWith('Bearer ')) return next();
    if (req.get('sec-fetch-site') === 'cross-site') {
      return next(new DomainError('forbidden', 'Cross-site request refused'));
    }
    const source = originOf(req.get('origin')) ?? originOf(req.get('referer'));
    if (!source) {
      return next(new DomainError('forbidden', 'Request refused: it has no Origin or Referer header (send an API token from scripts)'));
    }
    const self = `${req.protocol}://${req.get('host')}`;
    if (source !== configured && source !== self) {
      return next(new DomainError('forbidden', 'Cross-site request refused'));
    }
    next();
  };
}

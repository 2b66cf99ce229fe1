import express, { type RequestHandler } from 'express';
import helmet from 'helmet';
import { publicUrl, type Config } from '../config';

/** Largest JSON or form body the API accepts (uploads are multipart and limited separately). */
export const BODY_LIMIT = '1mb';

/**
 * Security headers (helmet). The Content Security Policy allows exactly what the built app
 * needs: its own scripts and styles, images from itself and data:/blob: URLs (canvas and
 * generated previews), its own fonts; no inline scripts, no plug-ins, no framing.
 */
export function securityHeaders(config: Pick<Config, 'PUBLIC_URL' | 'HOST' | 'PORT'>): RequestHandler {
  const https = publicUrl(config as Config).startsWith('https:');
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        styleSrc: ["'self'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        // Vite inlines the smallest font subsets as data: URIs; a font cannot run script.
        fontSrc: ["'self'", 'data:'],
        connectSrc: ["'self'"],
        workerSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        scriptSrcAttr: ["'none'"],
        // Upgrading would break plain-HTTP loopback development; only behind HTTPS.
        ...(https ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity: https ? { maxAge: 180 * 24 * 3600, includeSubDomains: false } : false,
    referrerPolicy: { policy: 'same-origin' },
  });
}

/** JSON and URL-encoded body parsers with the API's size limit (413 beyond it). */
export function bodyParsers(): RequestHandler[] {
  return [express.json({ limit: BODY_LIMIT }), express.urlencoded({ extended: false, limit: BODY_LIMIT })];
}

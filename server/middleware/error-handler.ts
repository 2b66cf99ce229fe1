import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { DomainError, statusOf } from '../errors';
import type { Logger } from '../logger';

/** 404 for unknown /api routes. */
export const apiNotFound: RequestHandler = (_req, res) => {
  res.status(404).json({ error: { code: 'not-found', message: 'No such API route' } });
};

/** The single place where errors become HTTP responses. Never sends stack traces. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    if (res.headersSent) {
      res.destroy();
      return;
    }
    if (err instanceof DomainError) {
      res.status(statusOf[err.code]).json({ error: { code: err.code, message: err.message } });
      return;
    }
    if (err instanceof ZodError) {
      const message = err.issues.map((i) => `${i.path.join('.') || 'body'}: ${i.message}`).join('; ');
      res.status(400).json({ error: { code: 'bad-request', message } });
      return;
    }
    const status = typeof err?.status === 'number' && err.status >= 400 && err.status < 500 ? err.status : 500;
    if (status < 500) {
      // Body-parser and multer errors carry their own 4xx status (413 for an oversized body).
      const code = status === 413 ? 'too-large' : status === 429 ? 'rate-limited' : 'bad-request';
      res.status(status).json({ error: { code, message: String(err.message ?? 'Bad request') } });
      return;
    }
    logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
    res.status(500).json({ error: { code: 'internal', message: 'Something went wrong on our side; it has been logged.' } });
  };
}

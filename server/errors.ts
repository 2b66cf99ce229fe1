/**
 * Domain errors carry a code; the one error middleware maps codes to HTTP statuses.
 * Services throw these; they never set HTTP statuses themselves.
 */
export type ErrorCode =
  | 'bad-request'
  | 'unauthenticated'
  | 'forbidden'
  | 'not-found'
  | 'conflict'
  | 'too-large'
  | 'rate-limited'
  | 'unavailable';

export class DomainError extends Error {
  constructor(
    readonly code: ErrorCode,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'DomainError';
  }
}

export const notFound = (what = 'Not found') => new DomainError('not-found', what);
export const forbidden = (what = 'Your role does not allow this') => new DomainError('forbidden', what);
export const badRequest = (what: string, details?: unknown) => new DomainError('bad-request', what, details);
export const unauthenticated = (what = 'Sign in or send an API token') => new DomainError('unauthenticated', what);

export const statusOf: Record<ErrorCode, number> = {
  'bad-request': 400,
  unauthenticated: 401,
  forbidden: 403,
  'not-found': 404,
  conflict: 409,
  'too-large': 413,
  'rate-limited': 429,
  unavailable: 503,
};

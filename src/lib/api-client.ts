import type * as z from 'zod';
import { apiErrorSchema } from '@shared/contracts/api';

/**
 * The one way the browser talks to the API: JSON in and out, the session cookie sent
 * (same-origin), every response parsed with a zod schema from `shared/contracts`, and every
 * non-2xx turned into an {@link ApiError} carrying the HTTP status and the server's error code.
 */

/** An error response from the API (or a network failure, status 0). */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

/** True for an ApiError with one of the given statuses. */
export function isApiError(error: unknown, ...statuses: number[]): error is ApiError {
  return error instanceof ApiError && (statuses.length === 0 || statuses.includes(error.status));
}

export type QueryValue = string | number | boolean | null | undefined;

export interface ApiRequest<S extends z.ZodType | undefined> {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  /** Parsed with this schema; omit for responses whose body is ignored (e.g. 204). */
  schema?: S;
  /** Sent as JSON, or as-is when FormData. */
  body?: unknown;
  /** Appended as a query string; undefined, null and '' are dropped. */
  query?: Record<string, QueryValue>;
  signal?: AbortSignal;
}

/** Builds `path?query` with empty values dropped so query keys and URLs agree. */
export function withQuery(path: string, query?: Record<string, QueryValue>): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

/** Reads an error body into an ApiError; falls back to the status text when the body isn't ours. */
export function errorFromBody(status: number, statusText: string, body: unknown): ApiError {
  const parsed = apiErrorSchema.safeParse(body);
  if (parsed.success) return new ApiError(status, parsed.data.error.code, parsed.data.error.message);
  return new ApiError(status, 'http-' + status, statusText || `Request failed with status ${status}`);
}

export async function apiFetch<S extends z.ZodType>(path: string, request: ApiRequest<S> & { schema: S }): Promise<z.infer<S>>;
export async function apiFetch(path: string, request?: ApiRequest<undefined>): Promise<void>;
export async function apiFetch(path: string, request: ApiRequest<z.ZodType | undefined> = {}): Promise<unknown> {
  const { method = 'GET', schema, body, query, signal } = request;
  const headers: Record<string, string> = { Accept: 'application/json' };
  let payload: BodyInit | undefined;
  if (body instanceof FormData) payload = body;
  else if (body !== undefined) {
    headers['Content-Type'] = 'application/json';
    payload = JSON.stringify(body);
  }

  let response: Response;
  try {
    response = await fetch(withQuery(path, query), { method, headers, body: payload, credentials: 'same-origin', signal });
  } catch (error) {
    if ((error as Error)?.name === 'AbortError') throw error;
    throw new ApiError(0, 'network', 'The server could not be reached. Check your connection and try again.');
  }

  const text = await response.text();
  let json: unknown = undefined;
  if (text) {
    try {
      json = JSON.parse(text);
    } catch {
      json = undefined;
    }
  }
  if (!response.ok) throw errorFromBody(response.status, response.statusText, json);
  if (!schema) return undefined;
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    // A contract mismatch is a bug on one side; say where, without dumping the payload.
    const first = parsed.error.issues[0];
    const where = first ? `${first.path.join('.') || 'body'}: ${first.message}` : 'unexpected shape';
    throw new ApiError(response.status, 'contract', `Unexpected response from ${method} ${path} (${where})`);
  }
  return parsed.data;
}

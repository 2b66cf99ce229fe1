import * as z from 'zod';

/**
 * Environment configuration, validated once at start-up. Defaults run everything on one machine
 * on loopback; pointing DATABASE_URL and REDIS_URL elsewhere is how a team scales out.
 */
const bool = z
  .enum(['true', 'false', '1', '0', ''])
  .optional()
  .transform((v) => v === 'true' || v === '1');

export const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4380),
  /** Public base URL of the app (OAuth callback, invitation links). Derived from HOST/PORT if unset. */
  PUBLIC_URL: z.string().url().optional(),
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:4332/pointfold'),
  REDIS_URL: z.string().default('redis://127.0.0.1:4379'),
  /** Prefix for BullMQ keys, so several test runs can share one Redis. */
  QUEUE_PREFIX: z.string().default('pointfold'),
  SESSION_SECRET: z.string().min(16).default('pointfold-development-secret-change-me'),
  GITHUB_CLIENT_ID: z.string().default('pointfold-dev'),
  GITHUB_CLIENT_SECRET: z.string().default('pointfold-dev-secret'),
  /** Base URL of the OAuth provider; the local fake in development and tests. */
  OAUTH_BASE_URL: z.string().default('http://127.0.0.1:4381'),
  /** Where the API fetches the user profile; GitHub's API host in production. */
  OAUTH_API_URL: z.string().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().default(4325),
  SMTP_SECURE: bool,
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  MAIL_FROM: z.string().default('Pointfold <pointfold@localhost>'),
  /** Fake mailbox readable in the app (development and tests only). */
  DEV_MAILBOX: bool,
  /** HTTP endpoint of the fake SMTP inbox (GET /messages), read by the dev mailbox page. */
  DEV_MAILBOX_URL: z.string().default('http://127.0.0.1:4326'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(64).optional(),
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(200 * 1024 * 1024),
  UPLOAD_MAX_FILES: z.coerce.number().int().positive().default(2000),
  UPLOAD_MAX_STRUCTURES: z.coerce.number().int().positive().default(20_000),
  UPLOAD_MAX_ATOMS: z.coerce.number().int().positive().default(20_000),
  ZIP_MAX_ENTRIES: z.coerce.number().int().positive().default(5000),
  ZIP_MAX_UNCOMPRESSED_BYTES: z.coerce.number().int().positive().default(1024 * 1024 * 1024),
  ZIP_MAX_RATIO: z.coerce.number().positive().default(200),
  /** Sign-in requests (start + callback) allowed per client IP per 15 minutes; a group behind one NAT shares it. */
  RATE_LIMIT_SIGN_IN: z.coerce.number().int().positive().default(100),
  /** Invitations an owner may send (and links anyone may try) per hour, per user or IP. */
  RATE_LIMIT_INVITATIONS: z.coerce.number().int().positive().default(60),
  /** Batch uploads (and previews) per user per 15 minutes. */
  RATE_LIMIT_UPLOADS: z.coerce.number().int().positive().default(120),
  /** How long an invitation link stays valid. */
  INVITATION_TTL_HOURS: z.coerce.number().positive().max(24 * 90).default(72),
  /** Lifetime of an idle browser session. */
  SESSION_MAX_AGE_HOURS: z.coerce.number().positive().max(24 * 90).default(24 * 14),
  /** Directory of the built browser app served by the API. */
  WEB_DIST: z.string().default('dist/web'),
  /** 1: `npm start` uses DATABASE_URL and REDIS_URL as given and starts no local PostgreSQL or Redis. */
  PF_EXTERNAL_SERVICES: bool,
});
export type Config = z.infer<typeof configSchema>;

/** Parses `env` (default: process.env). Throws a one-line error naming every bad variable. */
export function loadConfig(env: Record<string, string | undefined> = process.env): Config {
  const parsed = configSchema.safeParse(env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Invalid configuration: ${problems}`);
  }
  return parsed.data;
}

/** The public base URL of the app, without trailing slash. */
export function publicUrl(config: Config): string {
  return (config.PUBLIC_URL ?? `http://${config.HOST}:${config.PORT}`).replace(/\/$/, '');
}

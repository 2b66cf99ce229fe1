import { randomBytes } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import { Redis } from 'ioredis';
import { pino } from 'pino';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import type { DataSource } from 'typeorm';
import type { Role } from '@shared/contracts/api';
import { createApp, type AppDeps } from '../../server/app';
import { loadConfig } from '../../server/config';
import { startFakeOAuthProvider, type FakeOAuthProvider } from '../../server/fakes/oauth-provider';
import type { Mail, Mailer } from '../../server/mail/mailer';
import { User } from '../../server/modules/users/entity';
import { Membership, Workspace } from '../../server/modules/workspaces/entity';

/**
 * The whole API for supertest, on a throwaway database (tests/support/db.ts), with the fake
 * OAuth provider on a loopback port and a mailer that records what it sends.
 *
 * ```ts
 * const db = await createTestDatabase();
 * const t = await buildTestApp({ dataSource: db.dataSource });
 * const { users } = await seedDemoWorkspace(db.dataSource);
 * const owner = t.agent();                 // cookie jar + this app's Origin header
 * await signInAs(owner, users.owner);      // the real OAuth round trip against the fake
 * await owner.get('/api/me').expect(200);
 * await request(t.app).get('/api/me').set('Authorization', `Bearer ${secret}`);   // scripts
 * afterAll: await t.close(); await db.drop();
 * ```
 */
export interface TestApp {
  app: Express;
  deps: AppDeps;
  /** The app's own base URL (it listens on 127.0.0.1, port chosen by the OS). */
  url: string;
  /** What a browser on the app's pages sends as Origin; state-changing cookie requests need it. */
  origin: string;
  oauth: FakeOAuthProvider;
  /** Every mail the app sent, oldest first. */
  mail: Mail[];
  /** A supertest agent (keeps cookies) that sends this app's Origin on every request. */
  agent(): TestAgent;
  close(): Promise<void>;
}

export interface BuildTestAppOptions {
  dataSource: DataSource;
  /** Extra environment for loadConfig (e.g. `{ RATE_LIMIT_SIGN_IN: '3', DEV_MAILBOX: 'true' }`). */
  env?: Record<string, string>;
  /** Replace the recording mailer (e.g. with createMailer(config) against the fake SMTP inbox). */
  mailer?: Mailer;
}

const agents = new WeakMap<object, TestApp>();

export async function buildTestApp(options: BuildTestAppOptions): Promise<TestApp> {
  const server: Server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const oauth = await startFakeOAuthProvider({ host: '127.0.0.1', port: 0 });

  const config = loadConfig({
    NODE_ENV: 'test',
    PUBLIC_URL: url,
    OAUTH_BASE_URL: oauth.url,
    DATABASE_URL: process.env.DATABASE_URL,
    REDIS_URL: process.env.REDIS_URL ?? 'redis://127.0.0.1:56379',
    // Own key prefix: rate-limit counters of one test app never touch another's.
    QUEUE_PREFIX: `pf-test-${randomBytes(4).toString('hex')}`,
    SESSION_SECRET: randomBytes(24).toString('hex'),
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'silent',
    ...options.env,
  });
  const mail: Mail[] = [];
  const mailer: Mailer = options.mailer ?? {
    async send(m) {
      mail.push(m);
    },
  };
  const redis = new Redis(config.REDIS_URL, { maxRetriesPerRequest: 2 });
  const deps: AppDeps = {
    config,
    logger: pino({ level: config.LOG_LEVEL }),
    dataSource: options.dataSource,
    redis,
    mailer,
  };
  let app: Express;
  try {
    app = createApp(deps);
  } catch (err) {
    server.close();
    await oauth.close();
    redis.disconnect();
    throw err;
  }
  server.on('request', app);

  const testApp: TestApp = {
    app,
    deps,
    url,
    origin: url,
    oauth,
    mail,
    agent() {
      const agent = request.agent(server).set('Origin', url);
      agents.set(agent, testApp);
      return agent;
    },
    async close() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await oauth.close();
      await redis.quit().catch(() => undefined);
    },
  };
  return testApp;
}

/**
 * Signs the agent in as an existing user through the real OAuth round trip: the app's
 * /auth/github redirect, the fake provider's account picker (answered as that user's login and
 * e-mail), and the callback with code and state. The agent keeps the session cookie.
 *
 * Users made by `createUser` (provider id empty) are linked by e-mail on their first sign-in,
 * like the seeded demo users. Throws with the redirect it got when sign-in fails.
 */
export async function signInAs(agent: TestAgent, userId: string): Promise<void> {
  const testApp = agents.get(agent);
  if (!testApp) throw new Error('signInAs needs an agent made by testApp.agent()');
  const user = await testApp.deps.dataSource.getRepository(User).findOneByOrFail({ id: userId });
  const start = await agent.get('/auth/github').expect(302);
  const authorize = new URL(start.headers.location);
  const picked = await fetch(new URL('/login/oauth/authorize', testApp.oauth.url), {
    method: 'POST',
    redirect: 'manual',
    body: new URLSearchParams({
      client_id: authorize.searchParams.get('client_id') ?? '',
      redirect_uri: authorize.searchParams.get('redirect_uri') ?? '',
      state: authorize.searchParams.get('state') ?? '',
      login: user.login,
      email: user.email,
      name: user.name,
      decision: 'allow',
    }),
  });
  const callback = new URL(picked.headers.get('location') ?? '');
  const done = await agent.get(callback.pathname + callback.search);
  if (done.status !== 303 || done.headers.location?.startsWith('/sign-in')) {
    throw new Error(`sign-in as ${user.login} failed: ${done.status} → ${done.headers.location}`);
  }
}

let counter = 0;
const unique = () => `${Date.now().toString(36)}${(counter++).toString(36)}${randomBytes(2).toString('hex')}`;

/** A user who has never signed in (no provider id); `signInAs` links them by e-mail. */
export async function createUser(ds: DataSource, fields: Partial<Pick<User, 'login' | 'email' | 'name'>> = {}): Promise<User> {
  const tag = unique();
  const repo = ds.getRepository(User);
  return repo.save(
    repo.create({
      login: fields.login ?? `user-${tag}`,
      email: fields.email ?? `user-${tag}@example.org`,
      name: fields.name ?? `Test user ${tag}`,
      providerId: null,
    }),
  );
}

/** A workspace with the given members (user id → role). */
export async function createWorkspace(
  ds: DataSource,
  members: Record<string, Role>,
  fields: Partial<Pick<Workspace, 'slug' | 'name'>> = {},
): Promise<Workspace> {
  const tag = unique();
  const workspace = await ds
    .getRepository(Workspace)
    .save(ds.getRepository(Workspace).create({ slug: fields.slug ?? `ws-${tag}`, name: fields.name ?? `Workspace ${tag}`, defaults: {} }));
  for (const [userId, role] of Object.entries(members)) {
    await ds.getRepository(Membership).save({ workspaceId: workspace.id, userId, role });
  }
  return workspace;
}

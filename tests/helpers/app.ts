/**
 * The real app on a fresh database (tests/helpers/db.ts), seeded with the demo team, listening on an
 * ephemeral port. `agentFor(role)` gives a supertest agent signed in as that demo account; every agent
 * sends the app's Origin header so mutations pass the Origin check, and keeps its cookies.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import type { Role } from '../../shared/roles';
import { createApp } from '../../server/app';
import { testConfig, type Config } from '../../server/config';
import type { Db } from '../../server/db/client';
import { seedDemo, demoEmail } from '../../server/db/demo-data';
import { createOutboxMailer, type Mailer } from '../../server/mail/mailer';
import type { LimiterOptions } from '../../server/auth/rate-limit';
import { createTestDatabase } from './db';

export const TEST_ORIGIN = 'http://bankwright.test';
export const DEMO_PASSWORD = 'bankwright-demo';

export type Agent = ReturnType<typeof request.agent>;

export interface TestApp {
  app: http.RequestListener;
  server: http.Server;
  db: Db;
  config: Config;
  mailer: Mailer;
  /** A supertest agent without a session (sends Origin). */
  agent(): Agent;
  /** Signs in with e-mail and password; throws unless sign-in answers 200. */
  signIn(email: string, password?: string): Promise<Agent>;
  /** A demo account's signed-in agent (one per role, created on first use). */
  agentFor(role: Role): Promise<Agent>;
  close(): Promise<void>;
}

export async function makeTestApp(options: { config?: Partial<Config>; mailer?: Mailer; limiter?: Partial<LimiterOptions>; seed?: boolean } = {}): Promise<TestApp> {
  const database = await createTestDatabase();
  const { db } = database;
  const config = testConfig({ appOrigin: TEST_ORIGIN, ...options.config });
  if (options.seed !== false) await seedDemo(db, DEMO_PASSWORD);
  const mailer = options.mailer ?? createOutboxMailer(db);
  const app = createApp({ db, mailer, config, limiter: options.limiter });
  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  const agent = (): Agent => request.agent(base).set('Origin', config.appOrigin);

  async function signIn(email: string, password = DEMO_PASSWORD): Promise<Agent> {
    const a = agent();
    const res = await a.post('/api/auth/sign-in').send({ email, password });
    if (res.status !== 200) throw new Error(`sign-in as ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
    return a;
  }

  const agents = new Map<Role, Agent>();
  return {
    app,
    server,
    db,
    config,
    mailer,
    agent,
    signIn,
    async agentFor(role) {
      let a = agents.get(role);
      if (!a) {
        a = await signIn(demoEmail(role));
        agents.set(role, a);
      }
      return a;
    },
    async close() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await database.destroy();
    },
  };
}

/** Builds the real app against the test database (DATABASE_URL, set by tests/run.ts) for supertest. */
import request from 'supertest';
import type { Role } from '../../shared/schemas/auth';
import { createApp, type BuiltApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import type { Sequelize } from 'sequelize';
import { appUrlOf } from '../../server/db/app-role';
import { createAppSequelize } from '../../server/db/sequelize';
import { lookupWorkshop } from '../../server/db/workshop-context';
import { DEMO_PASSWORD, DEMO_USERS } from '../../server/seeders/demo';

/** The owner's URL: migrations and checks of the schema (it bypasses row-level security). */
export function testDatabaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run the suite with `npm test`');
  return url;
}

/** The app role's URL (`shellwright_app`, bound by row-level security), as the app connects. */
export function testAppDatabaseUrl(): string {
  return process.env.APP_DATABASE_URL || appUrlOf(testDatabaseUrl());
}

/** The first demo workshop's id (the one its owner, owner@example.com, signs in to), or null when there is none. */
export function demoWorkshopId(sequelize: Sequelize): Promise<number | null> {
  return lookupWorkshop(sequelize, 'email', DEMO_USERS[0]!.email);
}

/**
 * The workshop a test's own queries run under when they are not inside a request or `runAsWorkshop`: the first
 * demo workshop (found by its owner's e-mail, not by being first), so fixtures written directly land where the demo
 * users see them. With no demo workshop, such queries run under none and see nothing.
 */
export function demoWorkshopFallback(sequelize: Sequelize): () => Promise<number | null> {
  let id: Promise<number | null> | undefined;
  return () => (id ??= demoWorkshopId(sequelize));
}

let shared: (BuiltApp & { sequelize: Sequelize; config: Config }) | undefined;

/** One app per test file (models bind to one connection per process). */
export function getTestApp(opts: { config?: Partial<Config>; serveClient?: boolean } = {}) {
  if (shared) return shared;
  const config = { ...loadConfig(), ...opts.config };
  const url = testAppDatabaseUrl();
  let fallback: () => Promise<number | null> = async () => null;
  const sequelize = createAppSequelize(url, { fallback: () => fallback() });
  fallback = demoWorkshopFallback(sequelize);
  const built = createApp({ config, sequelize, databaseUrl: url, serveClient: opts.serveClient ?? false });
  shared = { ...built, sequelize, config };
  return shared;
}

export async function closeTestApp(): Promise<void> {
  if (!shared) return;
  await shared.close();
  await shared.sequelize.close();
  shared = undefined;
}

export interface Session {
  agent: ReturnType<typeof request.agent>;
  csrf: string;
}

/** A cookie-keeping client with a CSRF token, signed out. */
export async function anonymous(app: BuiltApp['app']): Promise<Session> {
  const agent = request.agent(app);
  const res = await agent.get('/api/auth/csrf').expect(200);
  return { agent, csrf: res.body.csrfToken as string };
}

/** Signs in with e-mail and password and returns the agent with its fresh CSRF token. */
export async function signIn(app: BuiltApp['app'], email: string, password: string): Promise<Session> {
  const session = await anonymous(app);
  const res = await session.agent.post('/api/auth/login').set('x-csrf-token', session.csrf).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent: session.agent, csrf: res.body.csrfToken as string };
}

export function demoEmail(role: Role): string {
  return DEMO_USERS.find((u) => u.role === role)!.email;
}

export function signInAs(app: BuiltApp['app'], role: Role): Promise<Session> {
  return signIn(app, demoEmail(role), DEMO_PASSWORD);
}

/**
 * Starts the local mail catcher and payment stand-in for this file's app (config is read at call time). The demo
 * workshop's card-payment account (made by the test runner, as `npm start` does) is taken back by this file's own
 * stand-in, ready, so deposits and balances on demo quotes are taken on it.
 */
export async function startServices() {
  const { startLocalServices } = await import('../../server/fakes');
  const { connectDemoWorkshops } = await import('../../server/seeders');
  const app = getTestApp();
  app.config.mail.url = undefined;
  app.config.payments = { apiUrl: undefined, secretKey: undefined, webhookSecret: undefined };
  const services = await startLocalServices(app.config);
  await connectDemoWorkshops(app.sequelize, app.config, services.payments!);
  return services;
}

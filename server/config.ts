import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/** The repository root, found from this file so that scripts work from any folder. */
export const rootDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** Everything the server reads from its environment, read and checked once at start-up. */
export interface Config {
  env: 'development' | 'production' | 'test';
  port: number;
  host: string;
  /** Set when the database is another server; unset means the private cluster in .data/. */
  databaseUrl: string | undefined;
  dataDir: string;
  uploadsDir: string;
  sessionSecret: string;
  /** Load the invented demo workshop (never in production unless SHELLWRIGHT_DEMO=1). */
  demo: boolean;
  trustProxy: boolean;
  /** Failed sign-in attempts allowed per account (e-mail) in the window, from any address. */
  loginAttempts: number;
  /** Failed sign-in attempts allowed per address in the window, whatever the accounts tried. */
  loginAddressAttempts: number;
  loginWindowMs: number;
  /** Where customers reach the app: links in e-mails and payment return addresses. */
  publicUrl: string;
  /** Signs customers' quote links. */
  linkSecret: string;
  /** SMTP (SMTP_URL); unset outside production means the local mail catcher. */
  mail: { url: string | undefined; from: string };
  /** The payment provider; unset outside production means the local stand-in. */
  payments: { apiUrl: string | undefined; secretKey: string | undefined; webhookSecret: string | undefined };
  /** How often an idle worker of the message queue looks for due jobs, in seconds (SHELLWRIGHT_QUEUE_POLL_SECONDS). */
  queuePollSeconds: number;
}

function intFromEnv(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const value = Number(raw);
  if (!Number.isInteger(value) || value < 0) {
    throw new Error(`${name} must be a whole number, got "${raw}"`);
  }
  return value;
}

/** A development secret kept in .data/ so that sessions survive a restart. */
function localSecret(dataDir: string): string {
  const file = path.join(dataDir, 'session-secret');
  try {
    return fs.readFileSync(file, 'utf8').trim();
  } catch {
    const secret = randomBytes(32).toString('hex');
    fs.mkdirSync(dataDir, { recursive: true });
    fs.writeFileSync(file, secret, { mode: 0o600 });
    return secret;
  }
}

/** Reads the configuration from process.env. */
export function loadConfig(): Config {
  const nodeEnv = process.env.NODE_ENV;
  const env = nodeEnv === 'production' ? 'production' : nodeEnv === 'test' ? 'test' : 'development';
  const dataDir = path.resolve(process.env.SHELLWRIGHT_DATA_DIR ?? path.join(rootDir, '.data'));
  const secret = process.env.SESSION_SECRET;
  const port = intFromEnv('PORT', 3000);
  const host = process.env.HOST ?? '127.0.0.1';
  const sessionSecret = secret ?? localSecret(dataDir);
  if (env === 'production' && !secret) {
    throw new Error('SESSION_SECRET must be set in production (a long random string)');
  }
  return {
    env,
    port,
    host,
    databaseUrl: process.env.DATABASE_URL || undefined,
    dataDir,
    uploadsDir: path.resolve(process.env.SHELLWRIGHT_UPLOADS_DIR ?? path.join(dataDir, 'uploads')),
    sessionSecret,
    demo: env !== 'production' || process.env.SHELLWRIGHT_DEMO === '1',
    trustProxy: process.env.TRUST_PROXY === '1',
    loginAttempts: intFromEnv('SHELLWRIGHT_LOGIN_ATTEMPTS', 10),
    loginAddressAttempts: intFromEnv('SHELLWRIGHT_LOGIN_ADDRESS_ATTEMPTS', 50),
    loginWindowMs: intFromEnv('SHELLWRIGHT_LOGIN_WINDOW_MS', 15 * 60 * 1000),
    publicUrl: (process.env.PUBLIC_URL ?? `http://${host}:${port}`).replace(/\/$/, ''),
    linkSecret: process.env.LINK_SECRET ?? sessionSecret,
    mail: { url: process.env.SMTP_URL || undefined, from: process.env.MAIL_FROM ?? 'Shellwright quotes <quotes@shellwright.invalid>' },
    payments: {
      apiUrl: process.env.PAYMENTS_API_URL || undefined,
      secretKey: process.env.PAYMENTS_SECRET_KEY || undefined,
      webhookSecret: process.env.PAYMENTS_WEBHOOK_SECRET || undefined,
    },
    queuePollSeconds: Math.max(0.5, Number(process.env.SHELLWRIGHT_QUEUE_POLL_SECONDS) || 2),
  };
}

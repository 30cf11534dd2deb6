/** Debian's Chromium driven by playwright-core, and the real app listening on a free loopback port. */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';
import { rootDir } from '../../server/config';
import { startLocalServices, type LocalServices } from '../../server/fakes';
import { connectDemoWorkshops } from '../../server/seeders';
import { afterAll, beforeAll } from 'vitest';
import { closeTestApp, getTestApp } from './app';

export const artifactsDir = path.join(rootDir, 'tests', 'artifacts', 'screenshots');

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

/**
 * Serves the built client and the API from one server, as `npm start` does. With `services`, the local mail catcher
 * and payment stand-in run too, their links and webhooks pointed at this server.
 */
export async function startServer(opts: { services?: boolean } = {}): Promise<{
  baseUrl: string;
  services?: LocalServices;
  stop: () => Promise<void>;
}> {
  const built = getTestApp({ serveClient: true });
  const server = http.createServer(built.app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  const baseUrl = `http://127.0.0.1:${port}`;
  let services: LocalServices | undefined;
  if (opts.services) {
    built.config.publicUrl = baseUrl;
    built.config.mail.url = undefined;
    built.config.payments = { apiUrl: undefined, secretKey: undefined, webhookSecret: undefined };
    services = await startLocalServices(built.config);
    await connectDemoWorkshops(built.sequelize, built.config, services.payments!);
  }
  return {
    baseUrl,
    services,
    stop: async () => {
      await services?.stop();
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

export type StartedServer = Awaited<ReturnType<typeof startServer>>;

/**
 * The set-up every browser test file shares: the app served on a free port (with the local mail catcher and payment
 * stand-in when `services`), one Chromium for the file, both closed with the test app when the file ends.
 */
export function browserSuite(opts: { services?: boolean } = {}): { readonly browser: Browser; readonly server: StartedServer } {
  let browser: Browser | undefined;
  let server: StartedServer | undefined;
  beforeAll(async () => {
    server = await startServer(opts);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
    await closeTestApp();
  });
  return {
    get browser() {
      if (!browser) throw new Error('The browser starts in beforeAll');
      return browser;
    },
    get server() {
      if (!server) throw new Error('The server starts in beforeAll');
      return server;
    },
  };
}

export async function screenshot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(artifactsDir, { recursive: true });
  await page.screenshot({ path: path.join(artifactsDir, `${name}.png`), fullPage: true });
}

/**
 * Collects everything the browser complains about: console errors and warnings (a logged 401 or a router warning
 * included), uncaught page errors and requests that failed (API reads the app cancelled itself excepted). Each journey ends with
 * `expect(errors).toEqual([])`. `allow` names the few complaints a step provokes on purpose (a wrong password's 401).
 */
export function watchConsole(page: Page, allow: RegExp[] = []): string[] {
  const errors: string[] = [];
  const allowed = (text: string) => allow.some((re) => re.test(text));
  page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`));
  page.on('console', (m) => {
    if ((m.type() === 'error' || m.type() === 'warning') && !allowed(m.text())) errors.push(`${m.type()}: ${m.text()} (${m.location().url})`);
  });
  page.on('requestfailed', (r) => {
    const text = `request failed: ${r.method()} ${r.url()} ${r.failure()?.errorText ?? ''}`;
    // A read the app itself cancelled because a newer one replaced it (a filter changed, the page moved on) is the
    // query cache at work, not a failure; the browser logs nothing for it. A cancelled write still counts.
    const superseded = r.method() === 'GET' && r.failure()?.errorText === 'net::ERR_ABORTED' && new URL(r.url()).pathname.startsWith('/api/');
    if (!superseded && !allowed(text)) errors.push(text);
  });
  return errors;
}

/** Waits until the page has no requests in flight and has painted what they brought. */
export async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await page.evaluate(() => new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve))));
}

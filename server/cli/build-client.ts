import fs from 'node:fs';
import path from 'node:path';
import { rootDir } from '../config';

const SOURCES = ['src', 'shared', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package-lock.json'];

function newestMtime(target: string): number {
  if (!fs.existsSync(target)) return 0;
  const stat = fs.statSync(target);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of fs.readdirSync(target)) newest = Math.max(newest, newestMtime(path.join(target, entry)));
  return newest;
}

/** True when dist/ is missing or older than any client source. */
export function clientIsStale(): boolean {
  const built = path.join(rootDir, 'dist', 'index.html');
  if (!fs.existsSync(built)) return true;
  const builtAt = fs.statSync(built).mtimeMs;
  return SOURCES.some((s) => newestMtime(path.join(rootDir, s)) > builtAt);
}

/** Builds the client with Vite when it is stale. */
export async function buildClientIfNeeded(log: (m: string) => void = console.log): Promise<void> {
  if (!clientIsStale()) return;
  log('[build] building the client (vite build)…');
  const { build } = await import('vite');
  // Vite sets NODE_ENV to production for the build; this process keeps its own.
  const nodeEnv = process.env.NODE_ENV;
  try {
    await build({ root: rootDir, configFile: path.join(rootDir, 'vite.config.ts'), logLevel: 'warn' });
  } finally {
    if (nodeEnv === undefined) delete process.env.NODE_ENV;
    else process.env.NODE_ENV = nodeEnv;
  }
  log('[build] client built into dist/');
}

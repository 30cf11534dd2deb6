/**
 * The import rules of eslint.config.js do fire: a feature importing another feature, and a cycle of imports, are
 * reported through ESLint's own Node API on a small file set written to a temporary folder. Without this a resolver
 * that stopped resolving (or a zone list that came out empty) would let `npx eslint .` pass in silence.
 */
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { ESLint, type Linter } from 'eslint';
import tseslint from 'typescript-eslint';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const root = path.resolve(import.meta.dirname, '../../..');

interface LintConfigModule {
  importRules(root: string): Linter.Config;
  featureZones(root: string): { target: string; from: string; except: string[] }[];
}

/** The same builders `npx eslint .` uses (eslint.config.js is plain JavaScript, so it is loaded by URL). */
async function lintConfig(): Promise<LintConfigModule> {
  return (await import(pathToFileURL(path.join(root, 'eslint.config.js')).href)) as LintConfigModule;
}

let dir: string;

function write(file: string, text: string): void {
  const full = path.join(dir, file);
  mkdirSync(path.dirname(full), { recursive: true });
  writeFileSync(full, text);
}

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'shellwright-lint-'));
  write(
    'tsconfig.json',
    JSON.stringify({ compilerOptions: { module: 'ESNext', moduleResolution: 'Bundler', baseUrl: '.', paths: { '@/*': ['src/*'], '@shared/*': ['shared/*'] } }, include: ['src', 'shared', 'server'] }),
  );
  // Two features, a kernel and a composition.
  write('src/lib/me.ts', "export const me = 'signed in';\n");
  write('src/features/quotes/api/quotes.ts', "export const quotes = 1;\n");
  write('src/features/quotes/routes/quote.ts', "import { me } from '@/lib/me';\nimport { quotes } from '../api/quotes';\nexport const page = [me, quotes];\n");
  write('src/features/estimates/api/estimates.ts', "export const estimates = 2;\n");
  write('src/features/estimates/routes/estimate.ts', "import { quotes } from '@/features/quotes/api/quotes';\nexport const page = quotes;\n");
  write('src/features/estimates/routes/relative.ts', "import { quotes } from '../../quotes/api/quotes';\nexport const page = quotes;\n");
  write('src/lib/reaches-up.ts', "import { quotes } from '@/features/quotes/api/quotes';\nexport const k = quotes;\n");
  write('src/app/routes/estimate.ts', "import { estimates } from '@/features/estimates/api/estimates';\nimport { quotes } from '@/features/quotes/api/quotes';\nexport const page = [estimates, quotes];\n");
  // A cycle in shared/, and a clean pair beside it.
  write('shared/a.ts', "import { b } from './b';\nexport const a = () => b();\n");
  write('shared/b.ts', "import { a } from './a';\nexport const b = (): unknown => a;\n");
  write('shared/c.ts', "import { d } from './d';\nexport const c = d;\n");
  write('shared/d.ts', 'export const d = 4;\n');
});

afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

async function lint(): Promise<Map<string, string[]>> {
  const { importRules } = await lintConfig();
  const eslint = new ESLint({
    cwd: dir,
    overrideConfigFile: true,
    overrideConfig: [{ files: ['**/*.ts'], languageOptions: { parser: tseslint.parser as Linter.Parser } }, importRules(dir)],
  });
  const results = await eslint.lintFiles(['src/**/*.ts', 'shared/**/*.ts']);
  return new Map(results.map((r) => [path.relative(dir, r.filePath).split(path.sep).join('/'), r.messages.map((m) => m.ruleId ?? m.message)]));
}

describe('import rules', () => {
  it('report a feature importing another feature, by alias or by relative path', async () => {
    const found = await lint();
    expect(found.get('src/features/estimates/routes/estimate.ts')).toEqual(['import-x/no-restricted-paths']);
    expect(found.get('src/features/estimates/routes/relative.ts')).toEqual(['import-x/no-restricted-paths']);
  });

  it('report the kernel importing a feature', async () => {
    const found = await lint();
    expect(found.get('src/lib/reaches-up.ts')).toEqual(['import-x/no-restricted-paths']);
  });

  it('let a feature import itself and the kernel, and a composition in src/app import two features', async () => {
    const found = await lint();
    expect(found.get('src/features/quotes/routes/quote.ts')).toEqual([]);
    expect(found.get('src/app/routes/estimate.ts')).toEqual([]);
    expect(found.get('src/lib/me.ts')).toEqual([]);
  });

  it('report an import cycle on both of its files, and nothing on a plain chain', async () => {
    const found = await lint();
    expect(found.get('shared/a.ts')).toEqual(['import-x/no-cycle']);
    expect(found.get('shared/b.ts')).toEqual(['import-x/no-cycle']);
    expect(found.get('shared/c.ts')).toEqual([]);
    expect(found.get('shared/d.ts')).toEqual([]);
  });

  it('are on in the project configuration, with a zone for every feature folder', async () => {
    const { featureZones } = await lintConfig();
    const zones = featureZones(root);
    expect(zones.length).toBeGreaterThan(10);
    expect(zones.map((z) => z.target)).toContain('./src/features/quotes');
    const eslint = new ESLint({ cwd: root });
    for (const file of ['src/features/quotes/routes/quote.tsx', 'server/routes/quotes.ts', 'shared/roles.ts']) {
      const config = (await eslint.calculateConfigForFile(path.join(root, file))) as Linter.Config;
      expect((config.rules?.['import-x/no-cycle'] as unknown[])[0], file).toBe(2);
      const boundary = config.rules?.['import-x/no-restricted-paths'] as [number, { zones: unknown[] }];
      expect(boundary[0], file).toBe(2);
      expect(boundary[1].zones).toHaveLength(zones.length);
    }
  });
});

import { readdirSync } from 'node:fs';
import js from '@eslint/js';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import importX from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

/**
 * The feature boundary: one zone per folder of src/features, so that a feature may import the kernel (src/lib),
 * shared UI (src/components), config and shared/, but never another feature. A page that needs two features is a
 * composition and lives in src/app/ (routes/ or components/). The kernel below the features (src/lib, src/components,
 * src/config) imports no feature and nothing of src/app. Exported for tests/unit/lint/import-rules.test.ts.
 */
export function featureZones(root = import.meta.dirname) {
  const features = readdirSync(`${root}/src/features`, { withFileTypes: true })
    .filter((d) => d.isDirectory())
    .map((d) => d.name)
    .sort();
  const boundary = features.map((feature) => ({
    target: `./src/features/${feature}`,
    from: './src/features',
    except: [`./${feature}`],
    message: 'A feature may not import another feature: move what both need to src/lib (or src/components), or compose the two in src/app.',
  }));
  // The layers below the features: the kernel, shared UI and config know no feature and no page composition.
  const kernel = ['./src/lib', './src/components', './src/config'].map((target) => ({
    target,
    from: ['./src/features', './src/app'],
    message: 'src/lib, src/components and src/config are used by the features: they may not import a feature or src/app.',
  }));
  const upward = { target: './src/features', from: './src/app', message: 'A feature may not import src/app: the app composes features, not the other way.' };
  return [...boundary, ...kernel, upward];
}

/** Import rules for the whole code base: the feature boundary, and no import cycle in src/, server/ or shared/. */
export function importRules(root = import.meta.dirname) {
  return {
    files: ['src/**/*.{ts,tsx}', 'server/**/*.ts', 'shared/**/*.ts'],
    plugins: { 'import-x': importX },
    settings: {
      'import-x/resolver-next': [createTypeScriptImportResolver({ project: `${root}/tsconfig.json` })],
      'import-x/extensions': ['.ts', '.tsx', '.js'],
    },
    rules: {
      'import-x/no-restricted-paths': ['error', { basePath: root, zones: featureZones(root) }],
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
    },
  };
}

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**', 'tests/artifacts/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  importRules(),
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      'no-restricted-imports': ['error', { patterns: [{ group: ['**/server/**', 'sequelize', 'pg', 'express'], message: 'The client must not import server code.' }] }],
    },
  },
  {
    // shared/ is pure code used by both sides: it may not reach into the client or the server.
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: ['**/src/**', '@/*', '**/server/**'], message: 'shared/ must not import from src/ or server/.' },
            { group: ['react', 'react-dom', 'express', 'sequelize', 'pg', 'node:*', 'fs', 'path'], message: 'shared/ is pure: no UI, server or I/O modules.' },
          ],
        },
      ],
    },
  },
);

import js from '@eslint/js';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', '.data/**', 'coverage/**', 'tests/artifacts/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
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

import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';

const sharedDir = fileURLToPath(new URL('./shared', import.meta.url));
const srcDir = fileURLToPath(new URL('./src', import.meta.url));
const apiPort = process.env.PORT ?? '3000';

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: { alias: { '@shared': sharedDir, '@': srcDir } },
  server: {
    port: 5173,
    host: '127.0.0.1',
    proxy: { '/api': `http://127.0.0.1:${apiPort}` },
  },
  build: { outDir: 'dist', sourcemap: false, chunkSizeWarningLimit: 900 },
  test: {
    projects: [
      {
        extends: true,
        // Every timeout below is a hang guard, not a target (speed is measured by the bench scripts). They are set for a
        // 2-core machine at a load average of 15: rendering PDFs and reading them back, or a property test of a few
        // hundred requests, can take a minute there.
        test: { name: 'unit', environment: 'node', include: ['tests/unit/**/*.test.ts', 'tests/reference/**/*.test.ts'], testTimeout: 60_000 },
      },
      {
        extends: true,
        test: {
          name: 'component',
          environment: 'jsdom',
          include: ['tests/component/**/*.test.tsx'],
          setupFiles: ['tests/component/setup.ts'],
          // A jsdom render of the estimate editor takes about a second on a 2-core machine, far more under load.
          testTimeout: 90_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'api',
          environment: 'node',
          include: ['tests/api/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 120_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          fileParallelism: false,
          testTimeout: 180_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});

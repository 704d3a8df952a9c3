import { defineConfig } from 'vitest/config';
import { svelte } from '@sveltejs/vite-plugin-svelte';
import { SummaryReporter } from './test/summary-reporter.ts';

// The dashboard lives in web/; the bridge serves web/dist. Vitest's include globs resolve
// from `root`, hence the '../test/**' patterns.
export default defineConfig({
  root: 'web',
  plugins: [svelte()],
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 2000,
  },
  server: {
    proxy: {
      // `npm run dev:web` against a bridge started separately on 8080.
      '/ws': { target: 'ws://127.0.0.1:8080', ws: true },
      '/api': { target: 'http://127.0.0.1:8080' },
    },
  },
  test: {
    reporters: ['default', new SummaryReporter()],
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['../test/**/*.test.ts'],
          exclude: ['../test/e2e/**'],
          environment: 'node',
          testTimeout: 30_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['../test/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120_000,
          hookTimeout: 180_000,
          // Browser and serial tests share ports and the CPU: one file at a time.
          fileParallelism: false,
        },
      },
    ],
  },
});

import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { CLIENT_OUT_DIR } from './server/config.ts';

/** Files about the PostgreSQL engine itself, with nothing to prove on PGlite. */
const POSTGRES_ONLY = ['tests/server/postgres-pool.test.ts'];
const NOT_TESTS = ['**/node_modules/**', '**/.git/**'];

/** Every test file, on PGlite (the engine a van's laptop runs). */
const suite = {
  include: ['tests/**/*.test.{ts,tsx}'],
  exclude: [...NOT_TESTS, ...POSTGRES_ONLY],
  testTimeout: 30_000,
  // Worker threads start and import faster than forked processes: about 137 s against 179 s
  // for the whole suite here. Nothing in the suite needs a process of its own.
  pool: 'threads' as const,
  // Each worker keeps its module cache from one file to the next instead of importing the app
  // afresh for every file: the whole suite 218 s against 255 s here (imports 46 s against 95 s).
  // Every file makes its own app and database clone, mocks are restored and stubbed globals put
  // back after each test, and the files pass in any order (checked with shuffled file orders).
  isolate: false,
  hookTimeout: 120_000,
  restoreMocks: true,
  unstubGlobals: true,
};

/**
 * The API files that also run on a real PostgreSQL server when one is given (issue "Proof"): the
 * schema and migrations, the seed, every route once per role (the access matrix, so a query that
 * PostgreSQL refuses shows as a 500 wherever it is), the week report's date arithmetic, and the
 * writes where a server with real concurrent connections can differ from PGlite's single one:
 * gapless invoice numbers, payments, webhooks and mail that land once, restores. About 30 s more on
 * two cores. Without VANBAY_TEST_DATABASE_URL the project is left out, not failed.
 */
const POSTGRES_FILES = [
  'tests/server/migrations.test.ts',
  'tests/server/seed.test.ts',
  'tests/server/access-matrix.test.ts',
  'tests/server/jobs.test.ts',
  'tests/server/readings.test.ts',
  'tests/server/checks.test.ts',
  'tests/server/line-items.test.ts',
  'tests/server/invoices.test.ts',
  'tests/server/payments.test.ts',
  'tests/server/card-payments.test.ts',
  'tests/server/outbox.test.ts',
  'tests/server/trips.test.ts',
  'tests/server/reports.test.ts',
  'tests/server/backup.test.ts',
  'tests/server/postgres-pool.test.ts',
];

const postgresUrl = process.env.VANBAY_TEST_DATABASE_URL?.trim();

/** The API's own port while `npm run dev` serves the dashboard on the public one. */
const devApiPort = Number(process.env.VANBAY_DEV_API_PORT ?? 5181);

export default defineConfig({
  plugins: [react(), tailwindcss()],
  // zod reads this global when it loads: with it, no `new Function` probe, which the dashboard's
  // Content-Security-Policy (no 'unsafe-eval') would report as a violation.
  define: { 'globalThis.__zod_globalConfig': JSON.stringify({ jitless: true }) },
  build: {
    outDir: CLIENT_OUT_DIR,
    emptyOutDir: true,
    // Every browser the dashboard targets preloads modules itself (modulepreload: Chromium 66,
    // Safari 17, Firefox 115); one that does not still loads each chunk when it is imported.
    modulePreload: { polyfill: false },
    rolldownOptions: {
      output: {
        codeSplitting: {
          groups: [
            // What index.html loads (React, the router, the query cache, the session check) as
            // one file rather than several small shared chunks: the same code, compressed whole.
            { name: 'shell', tags: ['$initial'] },
            // The signed-in frame with everything it imports, and the schemas that read /me: one
            // request beside the page's own while /me is asked, not a dozen small ones queued
            // ahead of /me on the browser's six connections.
            {
              name: 'frame',
              test: /src[\\/]app[\\/]layout[\\/]signed-in-frame\.tsx$|shared[\\/]api[\\/](auth|errors)\.ts$/,
            },
          ],
        },
      },
    },
  },
  server: {
    port: Number(process.env.PORT ?? 5180),
    strictPort: true,
    proxy: {
      '/api': `http://127.0.0.1:${devApiPort}`,
    },
  },
  test: {
    globalSetup: ['tests/helpers/global-setup.ts'],
    reporters: ['default', './tests/helpers/summary-reporter.ts'],
    maxWorkers: 2,
    ...(postgresUrl
      ? {
          projects: [
            { plugins: [react(), tailwindcss()], test: { ...suite, name: 'pglite' } },
            {
              test: {
                ...suite,
                name: 'api-postgres',
                include: POSTGRES_FILES,
                exclude: NOT_TESTS,
                // cloneDatabase() reads it; global-setup.ts builds the templates this project clones.
                provide: { databaseEngine: 'postgres' as const },
              },
            },
          ],
        }
      : suite),
  },
});

import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { CLIENT_OUT_DIR } from './server/config.ts';

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
  },
  server: {
    port: Number(process.env.PORT ?? 5180),
    strictPort: true,
    proxy: {
      '/api': `http://127.0.0.1:${devApiPort}`,
    },
  },
  test: {
    include: ['tests/**/*.test.{ts,tsx}'],
    globalSetup: ['tests/helpers/global-setup.ts'],
    reporters: ['default', './tests/helpers/summary-reporter.ts'],
    testTimeout: 30_000,
    // Worker threads start and import faster than forked processes: about 137 s against 179 s
    // for the whole suite here. Nothing in the suite needs a process of its own.
    pool: 'threads',
    maxWorkers: 2,
    hookTimeout: 120_000,
    restoreMocks: true,
  },
});

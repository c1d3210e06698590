import { defineConfig } from '@playwright/test';

// End-to-end tests in Debian's Chromium against the production build (`next start`), with the
// database `kilorung_e2e` migrated and seeded by scripts/test.sh and the local fakes running.
const PORT = Number(process.env.E2E_PORT ?? 3100);
const baseURL = `http://127.0.0.1:${PORT}`;
// The analysis worker (scripts/worker.ts) against the same database; ready when its health port answers.
const WORKER_PORT = Number(process.env.E2E_WORKER_PORT ?? PORT + 100);
const serverEnv = {
  DATABASE_URL: process.env.E2E_DATABASE_URL ?? `postgres://app@127.0.0.1:${process.env.PGPORT ?? 54329}/kilorung_e2e`,
  NEXTAUTH_URL: baseURL,
  NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? 'e2e-only-secret-not-for-production',
  EMAIL_SERVER: process.env.EMAIL_SERVER ?? 'smtp://127.0.0.1:2525',
  EMAIL_FROM: process.env.EMAIL_FROM ?? 'Kilorung <no-reply@kilorung.test>',
  S3_ENDPOINT: process.env.S3_ENDPOINT ?? 'http://127.0.0.1:4569',
  NEXT_TELEMETRY_DISABLED: '1',
};

export default defineConfig({
  testDir: 'tests/e2e',
  workers: 1,
  retries: process.env.CI ? 1 : 0,
  timeout: 60_000,
  reporter: [['list']],
  use: {
    baseURL,
    browserName: 'chromium',
    headless: true,
    trace: 'retain-on-failure',
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking',
        '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'],
    },
  },
  webServer: [
    {
      command: `node node_modules/next/dist/bin/next start -H 127.0.0.1 -p ${PORT}`,
      url: `${baseURL}/api/health`,
      reuseExistingServer: !process.env.CI,
      timeout: 90_000,
      env: serverEnv,
    },
    {
      // One node process, so Playwright's SIGTERM reaches the worker itself (see scripts/worker.ts).
      command: 'node --import tsx scripts/worker.ts',
      url: `http://127.0.0.1:${WORKER_PORT}/health`,
      reuseExistingServer: !process.env.CI,
      timeout: 60_000,
      env: { ...serverEnv, WORKER_HEALTH_PORT: String(WORKER_PORT) },
    },
  ],
});

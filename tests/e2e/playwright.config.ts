/**
 * End-to-end tests: the built web app served by the real API on a throw-away port, driven with
 * Debian's chromium (never a downloaded browser). scripts/test.sh provides DATABASE_URL pointing
 * at a migrated and seeded database; the API serves apps/web/dist (build it first).
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig, devices } from '@playwright/test';

const here = path.dirname(fileURLToPath(import.meta.url));
const repoRoot = path.resolve(here, '../..');
/** Screenshots, traces and the JSON report; E2E_ARTIFACTS moves them (e.g. for a second run beside a first). */
const artifacts = path.resolve(repoRoot, process.env.E2E_ARTIFACTS ?? 'tests/artifacts');

const port = Number(process.env.E2E_PORT ?? 4199);
const baseURL = `http://127.0.0.1:${port}`;

/** Another server command may be given (e.g. a built server) as long as it honours PORT/HOST/WEB_DIST. */
const serverCommand = process.env.E2E_SERVER_COMMAND ?? 'npx tsx apps/api/src/server.ts';

if (!process.env.DATABASE_URL && !process.env.E2E_SERVER_COMMAND) {
  throw new Error('DATABASE_URL must point at a migrated and seeded database (scripts/test.sh sets it).');
}

export default defineConfig({
  testDir: here,
  testMatch: '**/*.spec.ts',
  outputDir: path.join(artifacts, 'test-results'),
  // One API process and one database: tests that change data (invitations) run one after another.
  fullyParallel: false,
  workers: 1,
  forbidOnly: !!process.env.CI,
  retries: 0,
  // Generous limits: the machine may be shared with builds and solver runs. No test asserts a duration.
  timeout: 120_000,
  expect: { timeout: 20_000 },
  reporter: [
    ['list'],
    ['json', { outputFile: process.env.PLAYWRIGHT_JSON_OUTPUT_NAME ?? path.join(artifacts, 'playwright.json') }],
  ],
  use: {
    baseURL,
    viewport: { width: 1280, height: 800 },
    locale: 'en-GB',
    timezoneId: 'UTC',
    screenshot: 'only-on-failure',
    trace: process.env.E2E_TRACE === '1' ? 'retain-on-failure' : 'off',
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--disable-quic',
        '--no-first-run',
      ],
    },
  },
  projects: [{ name: 'chromium', use: { ...devices['Desktop Chrome'], viewport: { width: 1280, height: 800 } } }],
  webServer: {
    command: serverCommand,
    cwd: repoRoot,
    url: `${baseURL}/api/health`,
    reuseExistingServer: false,
    timeout: 120_000,
    stdout: 'pipe',
    stderr: 'pipe',
    env: {
      ...(process.env as Record<string, string>),
      PORT: String(port),
      HOST: '127.0.0.1',
      DATABASE_URL: process.env.DATABASE_URL ?? '',
      WEB_DIST: process.env.PHASELOOP_WEB_DIST ?? path.join(repoRoot, 'apps/web/dist'),
      // Links in mails point at this test server.
      APP_URL: baseURL,
      SESSION_SECRET: process.env.SESSION_SECRET ?? 'phaseloop-e2e-session-secret-not-for-production',
      NODE_ENV: process.env.NODE_ENV ?? 'test',
      LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
    },
  },
});

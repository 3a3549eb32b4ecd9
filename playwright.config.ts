import { defineConfig } from '@playwright/test';

const chromium = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
// E2E_PORT lets several checkouts run their browser tests side by side on one machine.
const port = Number(process.env.E2E_PORT || 4173);

export default defineConfig({
  testDir: 'e2e',
  timeout: 90_000,
  // a loaded machine (several checkouts testing at once) reads and parses dropped files in more than the
  // default 5 s; a condition that never comes still fails, 20 s later
  expect: { timeout: 20_000 },
  workers: 1,
  retries: 0,
  reporter: [['list'], ['json', { outputFile: 'reports/e2e.json' }]],
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    viewport: { width: 1600, height: 1000 },
    launchOptions: {
      executablePath: chromium,
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    },
  },
  // E2E_DEV=1: the same tests against the dev server (`vite`), e.g. for the console-error check.
  webServer: {
    command: process.env.E2E_DEV
      ? `npx vite --host 127.0.0.1 --port ${port} --strictPort`
      : `npx vite build && npx vite build --mode single && npx vite preview --host 127.0.0.1 --port ${port} --strictPort`,
    url: `http://127.0.0.1:${port}`,
    reuseExistingServer: false,
    timeout: 180_000,
  },
});

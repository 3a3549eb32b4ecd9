/**
 * The long-campaign measurement (e2e/scale.measure.ts): too long for every test run, so it has its own
 * config: `E2E_PORT=<port> npx playwright test -c e2e/scale.config.ts` (or `npm run bench:scale`).
 */
import { defineConfig } from '@playwright/test';
import base from '../playwright.config';

export default defineConfig({
  ...base,
  testDir: '.',
  testMatch: 'scale.measure.ts',
  timeout: 900_000,
  reporter: [['list']],
  // Built and served from the repository root, like the main config.
  webServer: { ...(base.webServer as object), cwd: '..' } as typeof base.webServer,
  outputDir: '../test-results/scale',
});

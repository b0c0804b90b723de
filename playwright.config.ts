/**
 * End-to-end tests of the browser mode in Debian's Chromium (/usr/bin/chromium or $CHROMIUM; Playwright's own
 * browser downloads are never used). Each spec file starts its own browser-mode server on a free port
 * with a fresh temporary data folder (tests/e2e/support.ts), so files are independent and can run
 * two at a time. The renderer must be built first: `npm run e2e` builds it.
 */
import { defineConfig } from '@playwright/test';
import { locateChromium } from './app/cli/chromium.mjs';

export default defineConfig({
  testDir: 'tests/e2e',
  testMatch: '**/*.spec.ts',
  outputDir: 'test-results/e2e',
  timeout: 90_000,
  expect: { timeout: 15_000 },
  fullyParallel: false,
  workers: 2,
  retries: 0,
  forbidOnly: !!process.env.CI,
  reporter: [['list']],
  use: {
    browserName: 'chromium',
    headless: true,
    launchOptions: {
      // $CHROMIUM, else Debian's /usr/bin/chromium or another usual place (the lookup `heatlag report` uses).
      executablePath: locateChromium().path ?? '/usr/bin/chromium',
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--no-first-run',
      ],
    },
    viewport: { width: 1280, height: 800 },
    locale: 'en-US',
    timezoneId: 'Europe/Berlin',
    acceptDownloads: true,
    trace: 'retain-on-failure',
  },
});

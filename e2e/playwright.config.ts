import { defineConfig } from '@playwright/test';

// The app under test is started by docker-free-scripts/test.sh (built client + API on one port);
// this config only points the browser at it. Override with E2E_BASE_URL to aim at another one.
const baseURL = process.env.E2E_BASE_URL ?? 'http://127.0.0.1:3100';
// Journeys read the e-mails the app sends from the test maildev's REST API.
process.env.E2E_MAILDEV_URL ??= 'http://127.0.0.1:1081';

const onCi = Boolean(process.env.CI);

export default defineConfig({
  testDir: 'tests',
  outputDir: 'test-results',
  // Two cores here: a third browser only slows the other two down.
  workers: onCi ? 1 : 2,
  fullyParallel: false,
  forbidOnly: onCi,
  retries: onCi ? 1 : 0,
  timeout: 60_000,
  // A shared two-core machine running PostgreSQL, the app and two browsers at once: allow for it.
  expect: { timeout: 15_000 },
  reporter: [['list'], ['html', { outputFolder: 'playwright-report', open: 'never' }]],
  use: {
    baseURL,
    locale: 'en-GB',
    timezoneId: 'Europe/London',
    trace: 'retain-on-failure',
    screenshot: 'only-on-failure',
    // Debian's Chromium: Playwright never downloads a browser of its own here.
    browserName: 'chromium',
    launchOptions: {
      executablePath: process.env.E2E_CHROMIUM ?? '/usr/bin/chromium',
      args: [
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
  // Every test runs once, at desktop width; a test tagged @phone also runs in the phone project, on
  // the project's own 375 px page. Journeys that need a phone open their own 375 px windows (see
  // support/journey.ts), so they run once and still look at both widths.
  projects: [
    {
      name: 'desktop',
      use: { viewport: { width: 1280, height: 800 } },
    },
    {
      // A page a person may open on a phone, laid out at 375 px.
      name: 'phone',
      grep: /@phone\b/,
      use: {
        viewport: { width: 375, height: 812 },
        isMobile: true,
        hasTouch: true,
        deviceScaleFactor: 2,
      },
    },
  ],
});

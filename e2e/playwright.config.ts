import { defineConfig } from '@playwright/test';

// The app under test is started by docker-free-scripts/test.sh (built client + API on one port);
// this config only points the browser at it. Override with E2E_BASE_URL to aim at another one.
const baseURL = process.env.E2E_BASE_URL ?? 'http://127.0.0.1:3100';
// Journeys read the e-mails the app sends from the test maildev's REST API.
process.env.E2E_MAILDEV_URL ??= 'http://127.0.0.1:1081';

const onCi = Boolean(process.env.CI);

/** Journeys in which an owner decides or pays: one at a time, in their own lane (see projects). */
const OWNER_DECISIONS = [
  '**/journey-approval.spec.ts',
  '**/journey-decide-links.spec.ts',
  '**/journey-invoice.spec.ts',
  '**/journey-payment.spec.ts',
];

export default defineConfig({
  testDir: 'tests',
  outputDir: 'test-results',
  // Two cores here: a third browser only slows the other two down. Two browsers help, because a
  // journey spends most of its time waiting on the app, PostgreSQL and mail; see the two lanes below.
  workers: 2,
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
  //
  // Two lanes run side by side, each one file at a time (a project's `workers: 1`), so two journeys
  // never change the same demo rows at once:
  // - `owner-decisions`: the journeys in which owners decide and pay. The payment journey turns on a
  //   deposit policy for the whole workshop while it runs, which would raise deposits on any other
  //   owner's decision made meanwhile; and the decide-links and invoice journeys share an owner.
  // - `desktop`: everything else (staff pages, the hangar, pickers, accounts, the fake's page).
  // A new journey in which an owner decides belongs in the first list.
  projects: [
    {
      name: 'owner-decisions',
      testMatch: OWNER_DECISIONS,
      workers: 1,
      use: { viewport: { width: 1280, height: 800 } },
    },
    {
      name: 'desktop',
      testIgnore: OWNER_DECISIONS,
      workers: 1,
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

import { expect, type APIRequestContext, type Browser, type BrowserContext, type Locator, type Page, type TestInfo } from '@playwright/test';

/** What the journeys share: the demo password, window sizes, screenshots, sign-in, API calls and mail. */
export const MAILDEV = process.env.E2E_MAILDEV_URL ?? 'http://127.0.0.1:1081';
export const PASSWORD = 'wingstage-demo';
export const PHONE = { width: 375, height: 812 };
export const DESKTOP = { width: 1280, height: 900 };

/** Saved under the test's output and attached to the report. `fullPage: false` keeps what a phone shows. */
/**
 * Whether the journeys save their screenshots: yes by default, no on CI (`CI` set, as `.ci/run`
 * does), where nobody opens them and the PNG encoding costs the browser stage CPU; `E2E_SHOTS=1` or
 * `E2E_SHOTS=0` decides either way. A failing test still gets its screenshot and trace (config).
 */
const SHOTS = process.env.E2E_SHOTS ? process.env.E2E_SHOTS === '1' : !process.env.CI;

export async function shot(page: Page, testInfo: TestInfo, name: string, fullPage = true): Promise<void> {
  if (!SHOTS) return;
  const path = testInfo.outputPath(`${name}.png`);
  await page.screenshot({ path, fullPage });
  await testInfo.attach(name, { path, contentType: 'image/png' });
}

/** For a test both window sizes run: each screenshot is named by its project, as the window shows it. */
export async function projectShot(page: Page, testInfo: TestInfo, name: string): Promise<void> {
  await shot(page, testInfo, `${testInfo.project.name}-${name}`, false);
}

/** The picture really arrived: the browser decoded it from the server's reply (lazy ones load once in view). */
export async function expectLoaded(img: Locator): Promise<void> {
  await expect(img).toBeVisible();
  await img.scrollIntoViewIfNeeded();
  await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).complete && (el as HTMLImageElement).naturalWidth)).toBeGreaterThan(0);
}

export async function context(
  browser: Browser,
  baseURL: string | undefined,
  phone: boolean,
  opts: { deviceScaleFactor?: number; timezoneId?: string } = {},
): Promise<BrowserContext> {
  const size = phone ? PHONE : DESKTOP;
  return browser.newContext({ baseURL, viewport: size, isMobile: phone, hasTouch: phone, deviceScaleFactor: opts.deviceScaleFactor, locale: 'en-GB', timezoneId: opts.timezoneId ?? 'Europe/London' });
}

export async function signIn(page: Page, email: string, password = PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  // Password checks are deliberately slow (bcrypt); allow for a busy machine.
  await expect(page).not.toHaveURL(/\/sign-in/, { timeout: 30_000 });
}

export async function signedIn(browser: Browser, baseURL: string | undefined, email: string, phone = false): Promise<{ ctx: BrowserContext; page: Page }> {
  const ctx = await context(browser, baseURL, phone);
  const page = await ctx.newPage();
  await signIn(page, email);
  return { ctx, page };
}

export async function csrfOf(page: Page): Promise<string> {
  return decodeURIComponent((await page.context().cookies()).find((c) => c.name === 'ws_csrf')?.value ?? '');
}

/** Calls the API with the page's session and its CSRF cookie, as the client does. */
export async function apiCall<T>(page: Page, method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE', path: string, data?: unknown): Promise<T> {
  const res = await page.request.fetch(path, { method, data, headers: { 'X-CSRF-Token': await csrfOf(page) } });
  expect(res.ok(), `${method} ${path}: ${res.status()} ${await res.text()}`).toBeTruthy();
  return (await res.json()) as T;
}

export interface MaildevEmail {
  subject: string;
  /** When maildev received it (ISO, whole seconds). */
  time: string;
  text?: string;
  html?: string;
  to: { address: string }[];
}

/** Mail to `recipient` that maildev received from `since` on (its clock has whole seconds), newest first. */
export async function mailTo(request: APIRequestContext, recipient: string, since = 0): Promise<MaildevEmail[]> {
  const res = await request.get(`${MAILDEV}/api/email`);
  if (!res.ok()) return [];
  const mails = (await res.json()) as MaildevEmail[];
  return mails.filter((m) => m.to.some((t) => t.address.toLowerCase() === recipient.toLowerCase()) && Date.parse(m.time) >= since - 2000).reverse();
}

/**
 * Polls maildev for the newest decision link for `jobNumber` e-mailed to `recipient` after `since`,
 * skipping links whose path is in `seen` (earlier links of the same request). Returns the full URL.
 */
export async function decisionLink(request: APIRequestContext, recipient: string, since: number, jobNumber: string, seen: string[] = []): Promise<string> {
  let link = '';
  await expect
    .poll(
      async () => {
        for (const m of await mailTo(request, recipient, since)) {
          const body = `${m.text ?? ''} ${m.html ?? ''}`;
          if (!body.includes(`job ${jobNumber})`)) continue;
          const found = body.match(/https?:\/\/[^\s"'<>]+\/decide\/[A-Za-z0-9._~-]+/)?.[0];
          if (found && !seen.includes(new URL(found).pathname)) {
            link = found;
            return link;
          }
        }
        return '';
      },
      { timeout: 60_000, message: `a new decision link e-mailed to ${recipient}` },
    )
    .not.toBe('');
  return link;
}

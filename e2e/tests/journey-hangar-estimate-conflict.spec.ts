import { expect, test, type Browser, type Page } from '@playwright/test';
import { PASSWORD, shot } from './support/journey';

/**
 * Two managers edit the same estimate at once. The second save is refused with a plain message,
 * their unsaved lines stay on screen, and they can choose to save over the newer version.
 * Runs once (desktop project) because it changes a demo job.
 */

async function manager(browser: Browser, baseURL: string | undefined) {
  const ctx = await browser.newContext({ baseURL, viewport: { width: 1280, height: 900 }, locale: 'en-GB', timezoneId: 'Europe/London' });
  const page = await ctx.newPage();
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill('manager@brackenfold.example');
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page).not.toHaveURL(/\/sign-in/, { timeout: 30_000 });
  return { ctx, page };
}

test('two managers save the same estimate: the second is told and loses nothing @approval', async ({ browser, baseURL }, testInfo) => {
  test.skip(testInfo.project.name !== 'desktop', 'Changes a demo job: runs once.');
  test.setTimeout(120_000);
  const a = await manager(browser, baseURL);
  const b = await manager(browser, baseURL);

  await a.page.goto('/jobs?q=Q-BRKE');
  await a.page.getByRole('link', { name: /Q-BRKE/ }).filter({ hasText: /J-/ }).first().click();
  await expect(a.page.getByRole('heading', { level: 1, name: /100-hour engine service/ })).toBeVisible();
  const jobPath = new URL(a.page.url()).pathname;
  await b.page.goto(jobPath);

  const firstDescription = (p: Page) => p.locator('section[data-stage="inspection"]').getByLabel('Description').first();
  await expect(firstDescription(a.page)).toBeVisible();
  await expect(firstDescription(b.page)).toBeVisible();

  await firstDescription(a.page).fill('100-hour service, first manager');
  await firstDescription(b.page).fill('100-hour service, second manager');

  await a.page.getByRole('button', { name: 'Save estimate' }).click();
  await expect(a.page.getByTestId('estimate-save-state')).toHaveText(/Saved/);

  await b.page.getByRole('button', { name: 'Save estimate' }).click();
  await expect(b.page.getByText('Not saved: someone else changed this estimate')).toBeVisible();
  await expect(b.page.getByText(/Their version: quoted/)).toBeVisible();
  // Nothing the second manager typed is lost.
  await expect(firstDescription(b.page)).toHaveValue('100-hour service, second manager');
  await shot(b.page, testInfo, '01-second-manager-told');

  await b.page.getByRole('button', { name: 'Save mine over theirs' }).click();
  await expect(b.page.getByTestId('estimate-save-state')).toHaveText(/Saved/);
  await a.page.reload();
  await expect(firstDescription(a.page)).toHaveValue('100-hour service, second manager');
  await shot(a.page, testInfo, '02-first-manager-sees-the-result');
  await a.ctx.close();
  await b.ctx.close();
});

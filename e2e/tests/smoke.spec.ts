import { expect, test } from '@playwright/test';

// The first thing to fail when the built client, the API or the database is not wired up: every
// journey depends on these two answering.

test.describe('smoke', () => {
  test('when the app is up, then the health endpoint reports app and database ok', async ({ request }) => {
    const response = await request.get('/api/health');
    expect(response.status()).toBe(200);
    expect(response.headers()['content-type']).toContain('application/json');
    expect(await response.json()).toMatchObject({ status: 'ok', app: 'ok', database: 'ok' });
  });

  test('when someone opens the sign-in page, then it shows the Wingstage mark, a heading and labelled fields @phone', async ({
    page,
  }, testInfo) => {
    const response = await page.goto('/sign-in');
    expect(response?.status()).toBe(200);
    await expect(page).toHaveTitle(/Wingstage/);
    // The product's name is the header's mark (an image named Wingstage); the page's own heading says what to do.
    await expect(page.getByRole('img', { name: 'Wingstage' }).first()).toBeVisible();
    await expect(page.getByRole('heading', { level: 1, name: /sign in/i })).toBeVisible();

    const email = page.getByLabel(/e-?mail/i);
    const password = page.getByLabel(/^password/i);
    await expect(email).toBeVisible();
    await expect(email).toHaveAttribute('type', 'email');
    await expect(password).toBeVisible();
    await expect(password).toHaveAttribute('type', 'password');
    await expect(page.getByRole('button', { name: /sign in/i })).toBeEnabled();

    // Fields must fit the viewport at both widths: nothing sideways-scrolls on a phone.
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);

    await page.screenshot({ path: testInfo.outputPath(`sign-in-${testInfo.project.name}.png`), fullPage: true });
  });
});

import { expect, test } from '@playwright/test';
import { DESKTOP, PHONE, shot, signIn } from './support/journey';

/**
 * A manager changes the estimate and tries to leave: Wingstage asks first, inside the app and on
 * a reload or close. Then, at 375 px, the engineer starts in the Hangar and reads the job's
 * cautions, the owner reads the letter, and the admin sets the approval link's life in Settings.
 */

test('leaving the estimate with unsaved changes asks first @approval', async ({ browser, baseURL }, testInfo) => {
  test.skip(testInfo.project.name !== 'desktop', 'One window of its own: runs once.');
  test.setTimeout(180_000);
  const ctx = await browser.newContext({ baseURL, viewport: DESKTOP, locale: 'en-GB', timezoneId: 'Europe/London' });
  const page = await ctx.newPage();
  await signIn(page, 'manager@brackenfold.example');
  // A demo job no other journey changes.
  await page.goto('/jobs?q=Hang-point');
  await page.getByRole('link', { name: /Q-BRKA/ }).filter({ hasText: /J-/ }).first().click();
  await expect(page.getByRole('heading', { level: 1, name: /Hang-point bolt replacement/ })).toBeVisible();
  const jobUrl = page.url();
  const description = page.locator('section[data-stage="inspection"]').getByLabel('Description').first();
  const before = await description.inputValue();

  await test.step('with nothing changed, leaving goes ahead without a question', async () => {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Jobs' }).first().click();
    await expect(page).toHaveURL(/\/jobs(\?|$)/);
    await page.goto(jobUrl);
    await expect(description).toBeVisible();
  });

  await test.step('with an unsaved change, leaving for another page asks, and staying keeps the change', async () => {
    await description.fill(`${before} (changed)`);
    await expect(page.getByTestId('estimate-save-state')).toHaveText(/Unsaved changes/);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Jobs' }).first().click();
    const ask = page.getByRole('alertdialog', { name: 'Leave without saving?' });
    await expect(ask).toBeVisible();
    await expect(ask).toContainText('You have changed the estimate and not saved it.');
    await shot(page, testInfo, '01-leave-without-saving');
    await ask.getByRole('button', { name: 'Stay on this page' }).click();
    await expect(ask).toBeHidden();
    expect(page.url()).toBe(jobUrl);
    await expect(description).toHaveValue(`${before} (changed)`);
  });

  await test.step('"Leave without saving" goes, and the change is not saved', async () => {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Jobs' }).first().click();
    await page.getByRole('alertdialog').getByRole('button', { name: 'Leave without saving' }).click();
    await expect(page).toHaveURL(/\/jobs(\?|$)/);
    await page.goto(jobUrl);
    await expect(description).toHaveValue(before);
  });
  await test.step('closing or reloading the tab with a change gets the browser to ask as well', async () => {
    await description.fill(`${before} (changed again)`);
    await expect(page.getByTestId('estimate-save-state')).toHaveText(/Unsaved changes/);
    const dialog = new Promise<string>((resolve) => page.once('dialog', (d) => (resolve(d.type()), void d.dismiss())));
    await page.close({ runBeforeUnload: true });
    expect(await dialog).toBe('beforeunload');
    expect(page.isClosed()).toBe(false);
  });

  await ctx.close();
});

test('at 375 px: the engineer starts in the Hangar with the cautions, the owner reads the letter, the admin sets the link life @approval', async ({ browser, baseURL }, testInfo) => {
  test.skip(testInfo.project.name !== 'desktop', 'Its own 375 px windows: runs once.');
  test.setTimeout(300_000);
  const phone = () => browser.newContext({ baseURL, viewport: PHONE, isMobile: true, hasTouch: true, locale: 'en-GB', timezoneId: 'Europe/London' });

  await test.step('the engineer signs in and lands on the Hangar; the job shows its cautions beside the items', async () => {
    const ctx = await phone();
    const page = await ctx.newPage();
    await signIn(page, 'priya@brackenfold.example');
    await expect(page).toHaveURL(/\/hangar$/);
    // The seeded permit inspection (the payment journey books another on the same aircraft).
    await page.getByRole('link', { name: /Q-BRKA.*Annual permit inspection/ }).filter({ hasNotText: 'payment journey' }).click();
    const cautions = page.getByTestId('job-cautions');
    await expect(cautions.getByRole('heading', { name: 'Cautions for this job' })).toBeVisible();
    await expect(cautions).toContainText('Treat the propeller as live');
    await expect(cautions).toContainText('Annual inspection: airframe, engine, controls and records');
    await expect(cautions).toContainText('Spark plug electrode gap, each plug');
    await expect(page.getByText('Who certifies', { exact: true })).toBeVisible();
    await expect(page.getByText('Safety', { exact: true })).toHaveCount(0);
    await shot(page, testInfo, '02-hangar-cautions-375', false);
    const plugs = page.getByRole('article', { name: 'Spark plug electrode gap, each plug' });
    await expect(plugs.locator('[data-caution]')).toContainText('Ignition off before the plug leads come off');
    await expect(plugs.getByRole('button', { name: 'Record value' })).toBeVisible();
    // A logbook is read, not measured: no "Record value" on it.
    const logbooks = page.getByRole('article', { name: 'Logbooks and modification record up to date' });
    await expect(logbooks.getByRole('button', { name: 'Pass' })).toBeVisible();
    await expect(logbooks.getByRole('button', { name: 'Record value' })).toHaveCount(0);
    await plugs.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '03-hangar-item-caution-375', false);
    await ctx.close();
  });

  await test.step("the owner's letter speaks from the owner's side and gives the workshop's phone and e-mail", async () => {
    const ctx = await phone();
    const page = await ctx.newPage();
    await signIn(page, 'gideon@owners.example');
    await expect(page.getByRole('heading', { level: 1, name: 'My aircraft' })).toBeVisible();
    const contact = page.getByTestId('workshop-contact');
    await expect(contact.getByRole('link', { name: '01632 960418' })).toBeVisible();
    for (const staffWord of ['Sent to owner', 'Awaiting owner', 'Priced', 'Approved within limit']) {
      await expect(page.getByText(staffWord, { exact: true })).toHaveCount(0);
    }
    await shot(page, testInfo, '04-owner-letter-375');
    await ctx.close();
  });

  await test.step('the admin sees the link life and reminder interval in Settings, with their bounds in words', async () => {
    const ctx = await phone();
    const page = await ctx.newPage();
    await signIn(page, 'admin@brackenfold.example');
    await page.goto('/settings');
    const days = page.getByLabel(/^Days an approval link works/);
    await expect(days).toHaveValue('14');
    await days.fill('90');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await expect(page.getByText('A link can last at most 60 days; send a new one after that.').first()).toBeVisible();
    await days.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '05-settings-approvals-375', false);
    await ctx.close();
  });
});

import { expect, test } from '@playwright/test';
import { PASSWORD, csrfOf, projectShot as shot } from './support/journey';

/**
 * A workshop with more owners than one list page holds (the API caps a page at 100 rows) can
 * still pick the last of them: the manager adds 105 owners, then picks the 105th by typing part
 * of its name into the aircraft form's owner picker, using the keyboard. The new aircraft is then
 * booked in through the book-in form's picker, and the estimate's "+ Part…" picker adds a
 * catalogue part found by search. Screenshots show each picker open at this project's width.
 */

const MANAGER = 'manager@brackenfold.example';
const OWNERS = 105;

test('the 105th owner, an aircraft and a catalogue part are each found by search and picked', async ({ page }, testInfo) => {
  test.setTimeout(180_000);
  // Letters only, so the registration made from it is a valid one; a different tag per run and per project.
  const tag = (Date.now().toString(36) + testInfo.project.name.slice(0, 1) + testInfo.workerIndex).toUpperCase().replace(/[0-9]/g, (d) => 'ABCDEFGHIJ'[Number(d)]!).slice(-6);
  const lastName = `Yarrowby ${tag} Number ${OWNERS}`;
  const registration = `Q-${tag}`;

  await test.step('the manager signs in', async () => {
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(MANAGER);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page).not.toHaveURL(/\/sign-in/, { timeout: 30_000 });
  });

  await test.step(`${OWNERS} owners are added, more than one list page holds`, async () => {
    const csrf = await csrfOf(page);
    for (let i = 1; i <= OWNERS; i++) {
      const n = String(i).padStart(3, '0');
      const name = i === OWNERS ? lastName : `Picker owner ${tag} ${n}`;
      const res = await page.request.post('/api/customers', { data: { name, email: `picker-${tag.toLowerCase()}-${n}@owners.example` }, headers: { 'X-CSRF-Token': csrf } });
      expect(res.status(), await res.text()).toBe(201);
    }
    // The list endpoint's largest page cannot hold them all: the old select could never show the last one.
    const page100 = await page.request.get('/api/customers', { params: { pageSize: 100, sort: 'name', dir: 'asc' } });
    const body = (await page100.json()) as { items: { name: string }[]; total: number };
    expect(body.total).toBeGreaterThan(100);
    expect(body.items).toHaveLength(100);
  });

  await test.step('the owner picker says how many it shows, then finds the last owner by name', async () => {
    await page.goto('/aircraft/new');
    const owner = page.getByRole('combobox', { name: 'Owner' });
    await owner.fill(`Picker owner ${tag}`);
    await expect(page.getByRole('listbox')).toBeVisible();
    await expect(page.getByRole('option')).toHaveCount(20);
    await expect(page.getByText('Showing the first 20 — type more to narrow', { exact: true }).first()).toBeVisible();
    await shot(page, testInfo, 'owner-picker-first-20');

    await owner.fill(`Yarrowby ${tag}`);
    await expect(page.getByRole('option')).toHaveCount(1);
    await expect(page.getByRole('option')).toContainText(lastName);
    await owner.press('ArrowDown');
    await owner.press('Enter');
    await expect(owner).toHaveValue(lastName);
    await expect(page.getByRole('listbox')).toBeHidden();

    await owner.fill('no owner is called this');
    await expect(page.getByText('No matches', { exact: true }).first()).toBeVisible();
    await owner.press('Escape');
    // Escape leaves the choice made before.
    await expect(owner).toHaveValue(lastName);
  });

  await test.step('the aircraft is saved with that owner', async () => {
    await page.getByLabel('Registration').fill(registration);
    await page.getByRole('textbox', { name: 'Type', exact: true }).fill('Single-seat sport microlight');
    await page.getByRole('button', { name: 'Add aircraft' }).click();
    await expect(page.getByRole('heading', { level: 1, name: registration })).toBeVisible();
    await expect(page.getByRole('link', { name: lastName })).toBeVisible();
  });

  await test.step('the book-in form finds the aircraft by its owner and books it in', async () => {
    await page.goto('/jobs/new');
    const aircraft = page.getByRole('combobox', { name: 'Aircraft' });
    await aircraft.fill(`Yarrowby ${tag}`);
    await expect(page.getByRole('listbox').getByRole('option')).toHaveCount(1);
    await expect(page.getByRole('listbox').getByRole('option')).toContainText(`${registration} — ${lastName}`);
    await shot(page, testInfo, 'book-in-picker-open');
    await page.getByRole('listbox').getByRole('option').click();
    await expect(aircraft).toHaveValue(`${registration} — ${lastName}`);
    await page.getByLabel('Title').fill(`Picker check ${tag}`);
    await page.getByRole('button', { name: 'Book in' }).click();
    await expect(page.getByRole('heading', { level: 1, name: new RegExp(`Picker check ${tag}`) })).toBeVisible();
  });

  await test.step("the estimate's + Part… picker adds a catalogue part found by search", async () => {
    const scope = page.getByRole('region', { name: 'Inspection scope' });
    const addPart = scope.getByRole('combobox', { name: 'Add a catalogue part to inspection scope' });
    // Near the top of the screen, so the open list shows in the screenshot below it.
    await addPart.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await page.evaluate(() => window.scrollBy(0, -120));
    await addPart.fill('WS-');
    const option = scope.getByRole('listbox').getByRole('option', { name: /WS-1201 — Spark plug/ });
    await expect(option).toBeVisible();
    await shot(page, testInfo, 'estimate-part-picker-open');
    await option.click();
    await expect(scope.getByLabel('Description', { exact: true }).last()).toHaveValue(/^WS-1201 Spark plug/);
    await expect(addPart).toHaveValue('');
    await expect(page.getByText('Unsaved changes')).toBeVisible();
  });
});

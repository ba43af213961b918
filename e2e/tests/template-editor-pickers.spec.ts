import { expect, test } from '@playwright/test';
import { PASSWORD, csrfOf, projectShot as shot } from './support/journey';

/**
 * A catalogue bigger than one list page (the API caps a page at 100 rows) can still be used in a
 * job template: the manager makes sure there are more than 100 active parts, then writes a
 * template whose part line picks the last of them by typing part of its name, and whose
 * sub-contract line picks a supplier the same way. Reopened, the saved lines show both names.
 * Screenshots show the part picker open at this project's width.
 */

const MANAGER = 'manager@brackenfold.example';

test('a template line picks a part that only a search reaches, and a supplier by search', async ({ page }, testInfo) => {
  test.setTimeout(180_000);
  const tag = (Date.now().toString(36) + testInfo.project.name.slice(0, 1) + testInfo.workerIndex).toUpperCase().slice(-6);
  const partNumber = `ZW-${tag}`;
  const partDescription = `Tailwheel spring clip ${tag}`;
  const supplierName = `Kestrelmoor Spar Shop ${tag}`;
  const templateName = `Tailwheel service ${tag}`;

  await test.step('the manager signs in', async () => {
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(MANAGER);
    await page.getByLabel('Password').fill(PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page).not.toHaveURL(/\/sign-in/, { timeout: 30_000 });
  });

  await test.step('the catalogue holds more active parts than one list page, the new one sorting last', async () => {
    const csrf = await csrfOf(page);
    const now = (await (await page.request.get('/api/parts', { params: { active: 'true', pageSize: 1 } })).json()) as { total: number };
    const fillers = Math.max(0, 100 - now.total);
    for (let i = 1; i <= fillers; i++) {
      const n = String(i).padStart(3, '0');
      const res = await page.request.post('/api/parts', { data: { partNumber: `ZV-${tag}-${n}`, description: `Filler washer ${n}`, unitCost: '0.40' }, headers: { 'X-CSRF-Token': csrf } });
      expect(res.status(), await res.text()).toBe(201);
    }
    const made = await page.request.post('/api/parts', { data: { partNumber, description: partDescription, unitCost: '6.25' }, headers: { 'X-CSRF-Token': csrf } });
    expect(made.status(), await made.text()).toBe(201);
    const supplier = await page.request.post('/api/suppliers', { data: { name: supplierName, kind: 'other' }, headers: { 'X-CSRF-Token': csrf } });
    expect(supplier.status(), await supplier.text()).toBe(201);
    // The largest page, in the picker's order, cannot reach the new part: only a search can.
    const page100 = (await (await page.request.get('/api/parts', { params: { active: 'true', pageSize: 100, sort: 'partNumber', dir: 'asc' } })).json()) as {
      items: { partNumber: string }[];
      total: number;
    };
    expect(page100.total).toBeGreaterThan(100);
    expect(page100.items.map((p) => p.partNumber)).not.toContain(partNumber);
  });

  await test.step('a new template: the part line finds the part by search', async () => {
    await page.goto('/templates/new');
    await page.getByLabel(/^Name/).fill(templateName);
    await page.getByRole('button', { name: 'Add part line' }).click();
    const part = page.getByRole('combobox', { name: 'Catalogue part' });
    await part.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await page.evaluate(() => window.scrollBy(0, -120));
    // Opened untyped, it offers the start of the catalogue and says there is more.
    await page.getByRole('button', { name: 'Show the list of catalogue part' }).click();
    await expect(page.getByRole('listbox', { name: 'Catalogue part' }).getByRole('option')).toHaveCount(20);
    await expect(page.getByText('Showing the first 20 — type more to narrow', { exact: true }).first()).toBeVisible();
    await shot(page, testInfo, 'template-part-picker-first-20');
    await part.fill(`spring clip ${tag}`);
    const option = page.getByRole('listbox', { name: 'Catalogue part' }).getByRole('option');
    await expect(option).toHaveCount(1);
    await expect(option).toContainText(`${partNumber} — ${partDescription}`);
    await shot(page, testInfo, 'template-part-picker-open');
    await option.click();
    await expect(part).toHaveValue(`${partNumber} — ${partDescription}`);
    // A blank description takes the part's own.
    await expect(page.getByLabel(/^Description/).last()).toHaveValue(partDescription);
  });

  await test.step('a sub-contract line finds its supplier by search', async () => {
    await page.getByRole('button', { name: 'Add sub-contract line' }).click();
    await page.getByLabel(/^Description/).last().fill('Tailwheel spring re-set');
    const supplier = page.getByRole('combobox', { name: 'Supplier' });
    await supplier.fill(`Kestrelmoor Spar Shop ${tag}`);
    const option = page.getByRole('listbox', { name: 'Supplier' }).getByRole('option');
    await expect(option).toHaveCount(1);
    await shot(page, testInfo, 'template-supplier-picker-open');
    await supplier.press('ArrowDown');
    await supplier.press('Enter');
    await expect(supplier).toHaveValue(supplierName);
    await page.getByLabel("Supplier's cost (excl. VAT)").fill('45.00');
  });

  await test.step('saved and reopened, both lines show the names they were given', async () => {
    await page.getByRole('button', { name: 'Save template' }).click();
    await expect(page).toHaveURL(/\/templates\/[0-9a-f-]{36}$/);
    await page.reload();
    await expect(page.getByRole('heading', { level: 1, name: templateName })).toBeVisible();
    await expect(page.getByRole('combobox', { name: 'Catalogue part' })).toHaveValue(`${partNumber} — ${partDescription}`);
    await expect(page.getByRole('combobox', { name: 'Supplier' })).toHaveValue(supplierName);
    await page.getByRole('combobox', { name: 'Catalogue part' }).evaluate((el) => el.scrollIntoView({ block: 'center' }));
    await shot(page, testInfo, 'template-reopened');
  });
});

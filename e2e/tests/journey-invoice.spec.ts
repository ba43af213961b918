import { expect, test } from '@playwright/test';
import { apiCall, shot, signedIn } from './support/journey';

const MANAGER = 'manager@brackenfold.example';
const ACCOUNTS = 'accounts@brackenfold.example';
const OWNER = 'tomasz@owners.example';

/**
 * The invoice after the work: the manager issues the yearly look-over's invoice from its preview. The demo's exhaust spring job on Q-MRLW was invoiced with its deposit
 * deducted. The owner on a phone sees it and pays the balance by card on the test payment page; the
 * job shows paid; accounts refunds part of it to the card, and the credit note appears for the owner.
 */
test('@invoice the owner pays the invoice balance by card, accounts refunds part, and the owner sees the credit note', async ({ browser, baseURL }, testInfo) => {
  test.skip(testInfo.project.name === 'phone', 'One journey: it opens its own phone and desktop windows.');
  test.setTimeout(180_000);
  const manager = await signedIn(browser, baseURL, MANAGER);

  // The manager issues the invoice of the demo's yearly look-over on Q-MRLW, ready for release, from its preview.
  const ready = await apiCall<{ items: { id: string; title: string; registration: string; state: string }[] }>(manager.page, 'GET', '/api/jobs?q=Yearly%20look-over&pageSize=50');
  const lookOver = ready.items.find((j) => j.registration === 'Q-MRLW' && j.title === 'Yearly look-over')!;
  expect(lookOver.state).toBe('ready_for_release');
  await manager.page.goto(`/jobs/${lookOver.id}`);
  await manager.page.getByRole('button', { name: 'Issue invoice', exact: true }).click();
  await expect(manager.page.getByTestId('invoice-document')).toBeVisible({ timeout: 15_000 });
  await manager.page.getByRole('button', { name: /^Issue invoice for £\d/ }).click();
  await expect(manager.page.getByRole('heading', { name: /^Invoice INV-\d{5}$/ })).toBeVisible({ timeout: 15_000 });
  expect((await apiCall<{ state: string }>(manager.page, 'GET', `/api/jobs/${lookOver.id}`)).state).toBe('invoiced');

  const jobs = await apiCall<{ items: { id: string; title: string; registration: string; state: string }[] }>(manager.page, 'GET', '/api/jobs?q=Exhaust%20spring&pageSize=50');
  const job = jobs.items.find((j) => j.registration === 'Q-MRLW' && j.title === 'Exhaust spring replacement')!;
  expect(job.state).toBe('invoiced');
  await manager.page.goto(`/jobs/${job.id}`);
  const card = manager.page.getByRole('heading', { name: /^Invoice INV-\d{5}$/ });
  await expect(card).toBeVisible();
  const number = (await card.textContent())!.replace(/^Invoice /, '');
  await expect(manager.page.getByRole('button', { name: /Mark (invoiced|paid)/ })).toHaveCount(0);
  await manager.page.getByText('The invoice as issued').click();
  await expect(manager.page.getByTestId('invoice-document').getByText(/Deposit received/)).toBeVisible();
  await shot(manager.page, testInfo, 'staff-invoice-1280');
  await manager.ctx.close();

  // The owner, on a phone.
  const owner = await signedIn(browser, baseURL, OWNER, true);
  await owner.page.goto('/my-aircraft');
  // The owner now has two invoices (the look-over's is new): this journey follows the exhaust spring's.
  const mine = owner.page.getByTestId('my-invoice').filter({ hasText: number });
  await expect(mine).toContainText(/Left to pay: £\d/);
  await expect(mine.getByRole('link', { name: 'Download the VAT invoice (PDF)' })).toHaveAttribute('href', /\/api\/invoices\/.+\/pdf$/);
  await mine.getByText('See the invoice here').click();
  await expect(mine.getByText(/Deposit you paid/)).toBeVisible();
  await shot(owner.page, testInfo, 'owner-invoice-375');
  await mine.getByRole('button', { name: 'Pay balance' }).click();
  await expect(owner.page.getByRole('heading', { level: 1, name: 'Pay by card' })).toBeVisible({ timeout: 30_000 });
  await owner.page.getByLabel('Card number').fill('4242 4242 4242 4242');
  await owner.page.getByLabel('Expiry (MM/YY)').fill('12/34');
  await owner.page.getByLabel('Security code').fill('123');
  await owner.page.getByRole('button', { name: /^Pay £/ }).click();
  await expect(owner.page).not.toHaveURL(/\/pay\//, { timeout: 30_000 });
  await expect.poll(async () => (await apiCall<{ state: string }>(owner.page, 'GET', `/api/jobs/${job.id}`)).state, { timeout: 30_000 }).toBe('paid');
  await owner.page.goto('/my-aircraft');
  await expect(owner.page.getByTestId('my-invoice').filter({ hasText: number })).toContainText('Paid in full');

  // Accounts refunds part of the card payment.
  const accounts = await signedIn(browser, baseURL, ACCOUNTS);
  await accounts.page.goto(`/jobs/${job.id}`);
  await accounts.page.getByRole('button', { name: 'Refund' }).click();
  const form = accounts.page.getByRole('form', { name: 'Refund' });
  await form.getByLabel('Amount to refund').fill('5.00');
  await form.getByLabel(/Reason/).fill('One spring came from stock at a lower price');
  await form.getByRole('button', { name: 'Refund to the card' }).click();
  await expect(accounts.page.getByRole('region', { name: 'Credit notes' })).toContainText(/CN-\d{5}/);
  await shot(accounts.page, testInfo, 'accounts-refund-1280');
  await accounts.page.setViewportSize({ width: 375, height: 812 });
  await shot(accounts.page, testInfo, 'accounts-refund-375');
  await accounts.ctx.close();

  await owner.page.reload();
  const credit = owner.page.locator('[data-owner-credit-note]');
  await expect(credit).toContainText('£5.00 refunded to your card');
  const creditNumber = (await credit.getAttribute('data-owner-credit-note'))!;
  // Paid in full, then £5 back: the card says nothing is owed and names the refund's credit note, never "paid so far".
  const standing = owner.page.getByTestId('my-invoice').filter({ hasText: number }).getByTestId('my-invoice-standing');
  await expect(standing).toContainText('Nothing is left to pay.');
  await expect(standing).toContainText(`We refunded £5.00 of it to you with credit note ${creditNumber}`);
  await expect(standing).not.toContainText('so far');
  await shot(owner.page, testInfo, 'owner-credit-note-375');
  await owner.page.setViewportSize({ width: 1280, height: 800 });
  await shot(owner.page, testInfo, 'owner-credit-note-1280');
  await owner.ctx.close();
});

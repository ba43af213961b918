import fs from 'node:fs';
import { expect, test } from '@playwright/test';
import { shot, signedIn } from './support/journey';

// The demo's card payments are real in the Stripe fake started by docker-free-scripts/test.sh; its
// control endpoint stands in for the processor's own payout schedule.
const API = process.env.STRIPE_API_URL ?? 'http://127.0.0.1:12112';
const KEY = process.env.STRIPE_SECRET_KEY ?? '';

test.describe('@accounts closing the week', () => {
  test.skip(!KEY, 'STRIPE_SECRET_KEY is set by npm test');

  test('when accounts runs a payout, then it reconciles; the planted exception is resolved with a note; the VAT summary is exported', async ({ browser, baseURL }, testInfo) => {
    test.skip(testInfo.project.name !== 'desktop', 'the accounts desk works on a desktop');
    // A journey of several pages, like the others: the 60 s default ran out once at load 29.
    test.setTimeout(180_000);
    const { ctx, page } = await signedIn(browser, baseURL, 'accounts@brackenfold.example');

    // The processor pays out what is available (the demo's card payments are past their two days).
    // The processor holds card money for two days before it may be paid out: move the fake's clock on.
    const clock = await fetch(`${API}/control/clock`, { method: 'POST', headers: { Authorization: `Bearer ${KEY}`, 'Content-Type': 'application/x-www-form-urlencoded' }, body: 'advance_seconds=172860' });
    expect(clock.status).toBe(200);
    const run = await fetch(`${API}/control/payouts/run`, { method: 'POST', headers: { Authorization: `Bearer ${KEY}` } });
    expect(run.status).toBe(200);
    const made = ((await run.json()) as { data: { id: string }[] }).data;

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Accounts' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Accounts' })).toBeVisible();
    await expect(page.getByRole('table')).toContainText('Deposit: Propeller sent out for overhaul');
    await page.getByRole('navigation', { name: 'Accounts sections' }).getByRole('link', { name: 'Payouts' }).click();
    await page.getByRole('button', { name: 'Fetch payouts now' }).click();
    await expect(page.getByRole('status').filter({ hasText: /Fetched \d+ payout/ })).toBeVisible();
    const row = made.length > 0 ? page.getByRole('row', { name: new RegExp(made[0]!.id) }) : page.getByRole('row').nth(1);
    await expect(row).toContainText('Adds up');
    await shot(page, testInfo, 'payouts');
    await row.getByRole('link').click();
    await expect(page.getByRole('heading', { level: 1, name: /Payout po_/ })).toBeVisible();
    await expect(page.getByRole('table')).toContainText('Card payment');

    await page.getByRole('navigation', { name: 'Accounts sections' }).getByRole('link', { name: 'Exceptions' }).click();
    const planted = page.getByRole('listitem').filter({ hasText: 'Amount not as asked' });
    await expect(planted).toContainText('300.00 GBP was asked and 290.00 was received');
    // A note is required.
    await planted.getByRole('button', { name: 'Resolve with this note' }).click();
    await expect(planted.getByText(/note saying how it was settled is required/i)).toBeVisible();
    await planted.getByLabel('How it was settled').fill('Owner paid the £10.00 short by bank transfer; see the offline payment.');
    await planted.getByRole('button', { name: 'Resolve with this note' }).click();
    await expect(page.getByRole('listitem').filter({ hasText: 'Amount not as asked' })).toHaveCount(0);
    await page.getByRole('button', { name: 'Resolved' }).click();
    await expect(page.getByRole('listitem').filter({ hasText: 'Amount not as asked' })).toContainText('by Moira Kettleby: Owner paid the £10.00 short');

    await page.getByRole('navigation', { name: 'Accounts sections' }).getByRole('link', { name: 'VAT summary' }).click();
    await expect(page.getByRole('table').first()).toContainText('20%');
    await shot(page, testInfo, 'vat-summary');
    const download = page.waitForEvent('download');
    await page.getByRole('link', { name: 'Export VAT summary (CSV)' }).click();
    const file = await (await download).path();
    const csv = fs.readFileSync(file, 'utf8');
    expect(csv.split('\r\n')[0]).toBe('section,kind,reference,job,tax_point,rate,net,vat,gross');
    expect(csv).toMatch(/\r\ntotal,/);
    await ctx.close();
  });
});

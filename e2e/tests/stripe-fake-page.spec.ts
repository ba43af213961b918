import { expect, test } from '@playwright/test';

// The local Stripe fake's hosted page, as the owner's phone will meet it once deposits are taken:
// started by docker-free-scripts/test.sh, reached with the key and address the app itself uses.
const API = process.env.STRIPE_API_URL ?? 'http://127.0.0.1:12112';
const KEY = process.env.STRIPE_SECRET_KEY ?? '';

async function openSession(successUrl: string, cancelUrl: string): Promise<{ id: string; url: string }> {
  const form = new URLSearchParams({
    mode: 'payment',
    success_url: successUrl,
    cancel_url: cancelUrl,
    'line_items[0][quantity]': '1',
    'line_items[0][price_data][currency]': 'gbp',
    'line_items[0][price_data][unit_amount]': '12000',
    'line_items[0][price_data][product_data][name]': 'Deposit: propeller overhaul ordered',
  });
  const res = await fetch(`${API}/v1/checkout/sessions`, { method: 'POST', headers: { Authorization: `Bearer ${KEY}` }, body: form });
  expect(res.status, await res.clone().text()).toBe(200);
  return (await res.json()) as { id: string; url: string };
}

test.describe('@payment the test payment page', () => {
  test.skip(!KEY, 'STRIPE_SECRET_KEY is set by npm test');

  test('when the decline card is used, then the reason is shown, and the success card then returns to the app', async ({ page, baseURL }, testInfo) => {
    const session = await openSession(`${baseURL}/?paid={CHECKOUT_SESSION_ID}`, `${baseURL}/?cancelled=1`);
    await page.goto(session.url);
    await expect(page.getByRole('note')).toHaveText('Test payment page — no real card is charged.');
    await expect(page.getByRole('heading', { level: 1, name: 'Pay by card' })).toBeVisible();
    await expect(page.getByLabel('Amount to pay')).toHaveText('£120.00');

    await page.getByLabel('Card number').fill('4000 0000 0000 0002');
    await page.getByLabel('Expiry (MM/YY)').fill('12/34');
    await page.getByLabel('Security code').fill('123');
    const pay = page.getByRole('button', { name: 'Pay £120.00' });
    // Tap targets on the owner's phone pages are at least 44 px (product.md, "Look and feel").
    expect((await pay.boundingBox())!.height).toBeGreaterThanOrEqual(44);
    await pay.click();
    await expect(page.getByRole('alert')).toContainText('Your card was declined.');
    await expect(page.getByLabel('Card number')).toHaveAttribute('aria-describedby', 'pay-problem');
    await page.screenshot({ path: testInfo.outputPath('declined.png'), fullPage: true });

    await page.getByLabel('Card number').fill('4242 4242 4242 4242');
    await page.getByLabel('Expiry (MM/YY)').fill('12/34');
    await page.getByLabel('Security code').fill('123');
    await page.getByRole('button', { name: 'Pay £120.00' }).click();
    await page.waitForURL(`**/?paid=${session.id}`);

    const back = await fetch(`${API}/v1/checkout/sessions/${session.id}`, { headers: { Authorization: `Bearer ${KEY}` } });
    expect(await back.json()).toMatchObject({ status: 'complete', payment_status: 'paid' });
  });

  test('when the payer cancels, then the page returns to the app and the session stays open', async ({ page, baseURL }) => {
    const session = await openSession(`${baseURL}/?paid={CHECKOUT_SESSION_ID}`, `${baseURL}/?cancelled=1`);
    await page.goto(session.url);
    await page.getByRole('button', { name: 'Cancel and go back' }).click();
    await page.waitForURL('**/?cancelled=1');
    const back = await fetch(`${API}/v1/checkout/sessions/${session.id}`, { headers: { Authorization: `Bearer ${KEY}` } });
    expect(await back.json()).toMatchObject({ status: 'open', payment_status: 'unpaid' });
  });
});

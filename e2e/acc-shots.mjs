import { chromium } from '@playwright/test';
const base = 'http://127.0.0.1:3440';
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox'] });
for (const [name, vp] of [['d', { width: 1280, height: 900 }], ['m', { width: 375, height: 812 }]]) {
  const ctx = await browser.newContext({ viewport: vp, locale: 'en-GB', timezoneId: 'Europe/London' });
  const page = await ctx.newPage();
  await page.goto(base + '/sign-in');
  await page.getByLabel('E-mail').fill('accounts@brackenfold.example');
  await page.getByLabel('Password').fill('wingstage-demo');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.includes('sign-in'));
  for (const p of ['accounts', 'accounts/exceptions', 'accounts/aged-debt', 'accounts/weeks', 'accounts/vat']) {
    await page.goto(`${base}/${p}`);
    await page.waitForTimeout(1500);
    await page.screenshot({ path: `/tmp/acc-${name}-${p.replace('/', '-')}.png`, fullPage: true });
  }
  await ctx.close();
}
await browser.close();

import { expect, test, type APIRequestContext, type TestInfo } from '@playwright/test';
import { MAILDEV, PHONE, shot, signIn, type MaildevEmail } from './support/journey';

/**
 * A manager adds a new owner, their aircraft and a job, and invites the owner. The owner accepts
 * the e-mailed invitation on a phone and sees exactly that job; another owner does not.
 */

function unique(testInfo: TestInfo) {
  const stamp = `${Date.now().toString(36)}${testInfo.project.name.slice(0, 1)}${testInfo.workerIndex}`;
  const letters = Array.from({ length: 4 }, () => String.fromCharCode(65 + Math.floor(Math.random() * 26))).join('');
  return {
    ownerName: `Orla Fenwright ${stamp}`,
    ownerEmail: `orla.${stamp}@owners.example`,
    registration: `Q-${letters}`,
    jobTitle: `Annual permit inspection ${stamp}`,
  };
}

/** Polls maildev until the invitation for `recipient` arrives; returns the link inside it. */
async function invitationLink(request: APIRequestContext, recipient: string): Promise<string> {
  let link = '';
  await expect
    .poll(
      async () => {
        const res = await request.get(`${MAILDEV}/api/email`);
        if (!res.ok()) return '';
        const mails = (await res.json()) as MaildevEmail[];
        const mine = mails.filter((m) => m.to.some((t) => t.address.toLowerCase() === recipient));
        for (const m of mine.reverse()) {
          const found = `${m.text ?? ''} ${m.html ?? ''}`.match(/https?:\/\/[^\s"'<>]+\/accept-invitation\?token=[A-Za-z0-9_-]+/);
          if (found) {
            link = found[0];
            return link;
          }
        }
        return '';
      },
      { timeout: 30_000, message: `an invitation e-mail for ${recipient}` },
    )
    .not.toBe('');
  return link;
}

test('a new owner accepts an invitation and sees only their own job', async ({ page, browser, request, baseURL }, testInfo) => {
  // Three people, two browser contexts and an e-mail round trip: longer than one page's budget.
  test.setTimeout(180_000);
  const u = unique(testInfo);

  await test.step('the manager signs in', async () => {
    await signIn(page, 'manager@brackenfold.example');
    await expect(page.getByRole('heading', { level: 1, name: 'Jobs' })).toBeVisible();
    await shot(page, testInfo, '01-manager-jobs');
  });

  await test.step('the manager adds the owner', async () => {
    await page.goto('/owners');
    await page.getByRole('link', { name: 'Add owner' }).click();
    // The form page loads on demand: wait for it, or the list's search box ("Search name, …") takes the typing.
    await expect(page.getByRole('heading', { level: 1, name: 'Add owner' })).toBeVisible();
    await page.getByRole('textbox', { name: 'Name', exact: true }).fill(u.ownerName);
    await page.getByRole('textbox', { name: 'E-mail', exact: true }).fill(u.ownerEmail);
    await page.getByRole('textbox', { name: 'Phone', exact: true }).fill('01632 960 417');
    await shot(page, testInfo, '02-add-owner');
    await page.getByRole('button', { name: 'Add owner' }).click();
    await expect(page.getByRole('heading', { level: 1, name: u.ownerName })).toBeVisible();
  });
  const ownerUrl = page.url();

  await test.step('the manager adds the aircraft', async () => {
    await page.getByRole('link', { name: 'Add aircraft' }).click();
    // Started from the owner's page, the owner picker opens with their name.
    await expect(page.getByRole('combobox', { name: 'Owner' })).toHaveValue(u.ownerName);
    await page.getByLabel('Registration').fill(u.registration);
    await page.getByLabel('Type').fill('Two-seat flex-wing trike');
    await page.getByLabel('Engine', { exact: true }).fill('80 hp flat-four four-stroke');
    await page.getByLabel('Airframe hours').fill('212.5');
    await shot(page, testInfo, '03-add-aircraft');
    await page.getByRole('button', { name: 'Add aircraft' }).click();
    await expect(page.getByRole('heading', { level: 1, name: u.registration })).toBeVisible();
  });

  await test.step('the manager books the aircraft in', async () => {
    await page.getByRole('link', { name: 'Book in' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Book in' })).toBeVisible();
    // Booked in from the aircraft's page: the aircraft picker opens with it chosen.
    await expect(page.getByRole('combobox', { name: 'Aircraft' })).toHaveValue(`${u.registration} — ${u.ownerName}`);
    await page.getByLabel('Kind of work').selectOption({ label: 'Annual permit inspection' });
    await page.getByLabel('Title').fill(u.jobTitle);
    await shot(page, testInfo, '04-book-in');
    await page.getByRole('button', { name: 'Book in' }).click();
    await expect(page.getByRole('heading', { level: 1, name: new RegExp(u.jobTitle) })).toBeVisible();
    await expect(page.getByText('Booked in', { exact: true }).first()).toBeVisible();
    await shot(page, testInfo, '05-job-booked-in');
  });

  await test.step('the manager invites the owner', async () => {
    await page.goto(ownerUrl);
    await page.getByRole('button', { name: 'Invite to Wingstage' }).click();
    await expect(page.getByText('Invitation sent')).toBeVisible();
    await shot(page, testInfo, '06-invited');
  });

  const link = await test.step('the invitation arrives by e-mail', () => invitationLink(request, u.ownerEmail));
  // Open the link on the app under test, whatever host name APP_URL gave the e-mail.
  const invitationPath = new URL(link).pathname + new URL(link).search;

  await test.step('the owner accepts the invitation on a phone and sees exactly that job', async () => {
    const ctx = await browser.newContext({ baseURL, viewport: PHONE, isMobile: true, hasTouch: true });
    const phone = await ctx.newPage();
    await phone.goto(invitationPath);
    await expect(phone.getByText('Brackenfold Light Aircraft Engineering', { exact: true })).toBeVisible();
    await expect(phone.getByText(u.ownerEmail, { exact: true })).toBeVisible();
    await shot(phone, testInfo, '07-owner-invitation');
    await phone.getByLabel('Choose a password').fill('harbour-light-9417');
    await phone.getByLabel('Password again').fill('harbour-light-9417');
    await phone.getByRole('button', { name: 'Accept and sign in' }).click();

    // Setting a password hashes it on purpose slowly; allow for a busy machine.
    await expect(phone.getByRole('heading', { level: 1, name: 'My aircraft' })).toBeVisible({ timeout: 30_000 });
    // One aircraft, one job: the one the manager booked in, and nothing of anyone else's.
    await expect(phone.getByRole('heading', { level: 2 })).toHaveText([u.registration]);
    // The job entries themselves (each holds lists of its own, such as its documents).
    const jobs = phone.getByRole('list', { name: `Jobs for ${u.registration}` }).locator(':scope > li');
    await expect(jobs).toHaveCount(1);
    await expect(jobs.first().getByRole('heading', { level: 3 })).toHaveText(u.jobTitle);
    await expect(jobs.first().getByText('Booked in', { exact: true })).toBeVisible();
    await expect(phone.getByText('Q-BRKE')).toHaveCount(0);
    await shot(phone, testInfo, '08-owner-my-aircraft');
    await ctx.close();
  });

  await test.step('another owner signs in on a phone and does not see it', async () => {
    const ctx = await browser.newContext({ baseURL, viewport: PHONE, isMobile: true, hasTouch: true });
    const other = await ctx.newPage();
    await signIn(other, 'elspeth@owners.example');
    await expect(other.getByRole('heading', { level: 1, name: 'My aircraft' })).toBeVisible();
    await expect(other.getByRole('heading', { level: 2, name: 'Q-BRKE' })).toBeVisible();
    await expect(other.getByText(u.registration)).toHaveCount(0);
    await expect(other.getByText(u.jobTitle)).toHaveCount(0);
    await shot(other, testInfo, '09-other-owner');
    await ctx.close();
  });
});

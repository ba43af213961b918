import { randomUUID } from 'node:crypto';
import { expect, test, type Browser } from '@playwright/test';
import { PHONE, apiCall, context, csrfOf, decisionLink, shot, signedIn } from './support/journey';

/**
 * What the owner's e-mailed link does as the manager acts on the request. The manager sends two
 * findings that share the cowling (one of them airworthiness, with a photo); the owner opens the
 * link on a phone, looks at the photo full screen and tries part-way choices, whose running total
 * charges the cowling once. The manager revokes the link: it shows the closed page and its plain
 * reason. The manager re-sends: the old link no longer decides and says a newer link was sent, the
 * new one from the e-mail works. Re-sent again from the job screen, the owner decides on the newest
 * link, which from then on shows the decided page; the older links still only point to the newest.
 *
 * The job is booked in by the test itself for the demo aircraft Q-MRLW, so it never collides with
 * the other journeys.
 */

const OWNER_EMAIL = 'tomasz@owners.example';
const OWNER_NAME = 'Tomasz Wrenfield';

/** An invented close-up (a cracked spring on a dark exhaust), drawn in the browser and saved as JPEG. */
async function inventedPhoto(browser: Browser): Promise<Buffer> {
  const ctx = await browser.newContext({ viewport: { width: 1200, height: 900 } });
  const page = await ctx.newPage();
  await page.setContent(`<body style="margin:0">
    <svg width="1200" height="900" xmlns="http://www.w3.org/2000/svg">
      <defs><linearGradient id="g" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="#5b5148"/><stop offset="1" stop-color="#2a2622"/></linearGradient></defs>
      <rect width="1200" height="900" fill="url(#g)"/>
      <rect x="0" y="380" width="1200" height="160" fill="#8d7f70"/>
      <path d="M200 460 q40 -90 80 0 t80 0 t80 0 t80 0 t80 0 t80 0 t80 0 t80 0 t80 0" stroke="#c9c2b6" stroke-width="18" fill="none"/>
      <path d="M610 400 l22 40 -16 18 26 44" stroke="#17120e" stroke-width="7" fill="none"/>
      <circle cx="620" cy="455" r="90" stroke="#f0d25a" stroke-width="8" fill="none"/>
    </svg></body>`);
  const jpeg = await page.screenshot({ type: 'jpeg', quality: 85 });
  await ctx.close();
  return jpeg;
}

test('the owner’s link follows what the manager does: revoked, re-sent, decided @approval', async ({ browser, baseURL, request }, testInfo) => {
  test.skip(testInfo.project.name === 'phone', 'Changes demo data: runs once, with its own phone and desktop windows.');
  // Two requests, three links and their e-mails: room for a busy machine.
  test.setTimeout(540_000);
  const stamp = Date.now().toString(36);
  const springTitle = `Exhaust spring cracked ${stamp}`;
  const bootTitle = `Carburettor boot perished ${stamp}`;
  let jobId = '';
  let jobNumber = '';
  let requestId = '';
  const since = Date.now();

  const manager = await signedIn(browser, baseURL, 'manager@brackenfold.example');
  // The owner's phone keeps another clock than the server (UTC) and the workshop (UK time): the
  // page's dates still read on the workshop's clock, the same in the server's HTML and once hydrated.
  const owner = await context(browser, baseURL, true, { deviceScaleFactor: 2, timezoneId: 'America/New_York' });
  const phone = await owner.newPage();
  const bar = phone.getByTestId('running-total');
  const total = (which: string) => bar.locator(`[data-total="${which}"]`);

  await test.step('the manager books Q-MRLW in, prices two findings that share the cowling, adds a photo and sends them', async () => {
    const { page } = manager;
    const aircraft = await apiCall<{ items: { id: string; registration: string }[] }>(page, 'GET', '/api/aircraft?q=Q-MRLW');
    const mrlw = aircraft.items.find((a) => a.registration === 'Q-MRLW')!;
    const job = await apiCall<{ id: string; number: string; version: number }>(page, 'POST', '/api/jobs', {
      aircraftId: mrlw.id,
      title: `Yearly look-over, links journey ${stamp}`,
      type: 'annual_permit_inspection',
      bookedInOn: new Date().toISOString().slice(0, 10),
    });
    jobId = job.id;
    jobNumber = job.number;
    await apiCall(page, 'POST', `/api/jobs/${job.id}/transition`, { to: 'inspecting', version: job.version });
    const raise = (title: string, category: string, location: string, seen: string) =>
      apiCall<{ id: string }>(page, 'POST', `/api/jobs/${job.id}/findings`, { title, category, location, seen });
    const spring = await raise(springTitle, 'airworthiness', 'Exhaust, rear cylinder', 'One retaining spring cracked through at the hook.');
    const boot = await raise(bootTitle, 'recommended', 'Carburettor, left', 'The rubber boot is cracked round its clamp.');

    const est = await apiCall<{ version: number }>(page, 'GET', `/api/jobs/${job.id}/estimate`);
    const cowl = randomUUID();
    // VAT at 20 % is exact on every figure here, so any rounding method gives the same pence.
    await apiCall(page, 'PUT', `/api/jobs/${job.id}/estimate`, {
      version: est.version,
      accessTasks: [{ id: cowl, name: 'Cowling off', hours: '1.5', ratePerHour: '62.00', vatRate: 'standard' }],
      lines: [
        { id: randomUUID(), stage: 'inspection', kind: 'labour', description: 'Look-over', quantity: '1', ratePerHour: '62.00', vatRate: 'standard' },
        { id: randomUUID(), stage: 'discovered', kind: 'labour', description: 'Replace the spring', quantity: '0.5', ratePerHour: '62.00', vatRate: 'standard', findingId: spring.id, accessTaskId: cowl },
        { id: randomUUID(), stage: 'discovered', kind: 'labour', description: 'Fit a new boot', quantity: '1', ratePerHour: '62.00', vatRate: 'standard', findingId: boot.id, accessTaskId: cowl },
        { id: randomUUID(), stage: 'discovered', kind: 'part', description: 'Carburettor boot', quantity: '1', unitPrice: '18.40', vatRate: 'standard', findingId: boot.id },
      ],
    });
    // The owner agreed the look-over on the phone: it counts as agreed, so the request holds only the findings.
    const priced = await apiCall<{ version: number }>(page, 'GET', `/api/jobs/${job.id}/estimate`);
    await apiCall(page, 'POST', `/api/jobs/${job.id}/quote/phone-agreement`, {
      agreedWith: 'Tomasz Wrenfield, the owner',
      agreedAt: new Date(Date.now() - 60_000).toISOString(),
      note: 'Agreed when booking in.',
      estimateVersion: priced.version,
    });
    const upload = await page.request.post(`/api/jobs/${job.id}/findings/${spring.id}/photos`, {
      headers: { 'X-CSRF-Token': await csrfOf(page) },
      multipart: { photos: { name: 'spring.jpg', mimeType: 'image/jpeg', buffer: await inventedPhoto(browser) } },
    });
    expect(upload.status(), await upload.text()).toBe(201);
    const now = await apiCall<{ version: number }>(page, 'GET', `/api/jobs/${job.id}/estimate`);
    const sent = await apiCall<{ request: { id: string } }>(page, 'POST', `/api/jobs/${job.id}/approval-requests`, {
      findingIds: [spring.id, boot.id],
      message: 'Both need the cowling off, so doing them together saves you the opening-up once.',
      estimateVersion: now.version,
    });
    requestId = sent.request.id;
  });

  const first = new URL(await decisionLink(request, OWNER_EMAIL, since, jobNumber)).pathname;

  await test.step('the owner opens the link on a phone: photo full screen, and part-way choices charge the cowling once', async () => {
    const scripts = new Set<string>();
    const asked: string[] = [];
    const problems: string[] = [];
    phone.on('response', (r) => {
      if (r.request().resourceType() === 'script') scripts.add(new URL(r.url()).pathname);
      if (/^\/api\/decide\/[\w-]+$/.test(new URL(r.url()).pathname)) asked.push(r.url());
    });
    phone.on('console', (m) => void ((m.type() === 'error' || /hydrat/i.test(m.text())) && problems.push(m.text())));
    phone.on('pageerror', (e) => void problems.push(e.message));
    // The first view comes in the HTML, rendered on the server: the letter and the first finding
    // are there before any script runs.
    const html = (await (await phone.request.get(first)).text()).replace(/<!-- -->/g, '');
    expect(html).toContain('Finding 1 of 2');
    const servedUntil = /This link works until ([^<]+)\./.exec(html)?.[1];
    expect(servedUntil).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4}, \d{2}:\d{2}$/);
    const answer = await phone.goto(first);
    expect(answer?.status()).toBe(200);
    await expect(phone.getByText('Finding 1 of 2')).toBeVisible();
    // React takes over that markup (its handlers are on the server's elements) without asking for
    // the data again, and without a mismatch to complain of.
    await expect.poll(() => phone.locator('main h1').evaluate((h) => Object.keys(h).some((k) => k.startsWith('__react')))).toBe(true);
    expect(asked, 'the page asked the API for data it already had').toEqual([]);
    // The hydrated page shows the date the server wrote, though the phone's clock is five hours behind.
    await expect(phone.getByText(/^This link works until /)).toHaveText(`This link works until ${servedUntil}.`);
    expect(await phone.evaluate(() => Intl.DateTimeFormat().resolvedOptions().timeZone)).toBe('America/New_York');
    expect(problems, problems.join('\n')).toEqual([]);
    // The page's own entry: not the app with its router and shell.
    expect([...scripts].some((s) => /\/assets\/main-/.test(s)), [...scripts].join(' ')).toBe(false);
    const photo = phone.getByRole('img', { name: `Photo 1 of F-1: ${springTitle}` });
    await expect(photo).toBeVisible();
    await expect.poll(() => photo.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBeGreaterThan(0);
    // Full column width at 375 px: the column is the screen less its 16 px margins.
    const opener = phone.getByRole('button', { name: /^Photo 1 of F-1/ });
    expect(Math.round((await opener.boundingBox())!.width)).toBe(PHONE.width - 32);
    await shot(phone, testInfo, '01-owner-finding-with-photo-375', false);
    await opener.click();
    const viewer = phone.getByRole('dialog', { name: `Photo 1 of F-1: ${springTitle}` });
    await expect(viewer).toBeVisible();
    await shot(phone, testInfo, '02-owner-photo-full-screen-375', false);
    await phone.keyboard.press('Escape');
    await expect(viewer).toHaveCount(0);

    // F-1 alone carries the cowling: 31.00 + 93.00 = 124.00 net, 148.80 incl. VAT.
    await phone.getByRole('radio', { name: /^Approve/ }).check();
    await expect(total('approving-now')).toHaveText('£148.80');
    // Still open, F-2 without the cowling: 62.00 + 18.40 = 80.40 net, 96.48 incl. VAT.
    await expect(total('undecided')).toHaveText('£96.48');
    await phone.getByRole('button', { name: 'Next finding →' }).click();
    // With F-1 approved, F-2 adds only its own work: the cowling is already counted once.
    await expect(phone.getByTestId('decide-price')).toContainText('£96.48 incl. VAT');
    await expect(phone.getByTestId('decide-needs-opening-up')).toContainText('already counted once');
    await phone.getByRole('radio', { name: /^Approve/ }).check();
    // Both, the cowling once: 204.40 net, 245.28 (not 148.80 + 208.08 = 356.88).
    await expect(total('approving-now')).toHaveText('£245.28');
    await expect(bar).not.toContainText('may come out lower');
    await phone.getByRole('button', { name: '← Back' }).click();
    await phone.getByRole('radio', { name: /^Decline/ }).check();
    // F-2 alone now carries the cowling: 62.00 + 18.40 + 93.00 = 173.40 net, 208.08.
    await expect(total('approving-now')).toHaveText('£208.08');
    await expect(phone.getByText(/While it is open, we will not mark Q-\w+ ready for release in Wingstage/)).toBeVisible();
    await shot(phone, testInfo, '03-owner-declined-airworthiness-part-way-375', false);
    await shot(phone, testInfo, '03b-owner-declined-airworthiness-part-way-375-full', true);
    // The same letter on a desktop screen.
    const wide = await context(browser, baseURL, false);
    const widePage = await wide.newPage();
    await widePage.goto(first);
    await expect(widePage.getByRole('img', { name: `Photo 1 of F-1: ${springTitle}` })).toBeVisible();
    await shot(widePage, testInfo, '04-owner-finding-with-photo-1280', false);
    await widePage.getByRole('radio', { name: /^Decline/ }).check();
    await widePage.getByRole('button', { name: 'Next finding →' }).click();
    await widePage.getByRole('radio', { name: /^Approve/ }).check();
    await expect(widePage.getByTestId('running-total').locator('[data-total="approving-now"]')).toHaveText('£208.08');
    await shot(widePage, testInfo, '04b-owner-part-way-1280', true);
    await wide.close();
  });

  await test.step('the manager revokes the link: the owner sees the closed page with its plain reason', async () => {
    const { page } = manager;
    await page.goto(`/jobs/${jobId}`);
    const requests = page.getByRole('list', { name: 'Approval requests' });
    await requests.getByRole('button', { name: 'Revoke link' }).click();
    await expect(requests.locator('[data-request-state="revoked"]')).toHaveCount(1);
    await shot(page, testInfo, '05-manager-revoked-1280', false);

    await phone.reload();
    const closed = phone.getByTestId('decision-closed');
    await expect(closed.getByText('The workshop revoked this link', { exact: true })).toBeVisible();
    // The workshop's phone and e-mail, from its settings (the demo's).
    await expect(closed.getByText(/The workshop revoked this link on \d+ \w+\. If you expected to decide here, contact .+: 01632 960418, office@brackenfold\.example\./)).toBeVisible();
    await expect(closed.locator('[data-request-state="revoked"]')).toHaveText('Revoked by the workshop');
    await expect(phone.getByRole('radio')).toHaveCount(0);
    await expect(phone.getByTestId('running-total')).toHaveCount(0);
    // The choices the owner had not confirmed on this phone are cleared, and the page says so.
    await expect(phone.getByTestId('draft-discarded')).toContainText('Nothing was sent');
    await shot(phone, testInfo, '06-owner-revoked-375', false);
  });

  let fresh = '';
  let second = '';
  let firstOfSecond = '';
  await test.step('the manager sends a new request and re-sends it: the older link says a newer one was sent, the new one from the e-mail works', async () => {
    // A revoked request stays finished (it cannot be re-sent): the manager sends a new request for the same findings.
    const refused = await manager.page.request.post(`/api/approval-requests/${requestId}/resend`, { headers: { 'X-CSRF-Token': await csrfOf(manager.page) } });
    expect(refused.status()).toBe(409);
    const findings = await apiCall<{ id: string; state: string }[]>(manager.page, 'GET', `/api/jobs/${jobId}/findings`);
    const now = await apiCall<{ version: number }>(manager.page, 'GET', `/api/jobs/${jobId}/estimate`);
    const sent = await apiCall<{ request: { id: string } }>(manager.page, 'POST', `/api/jobs/${jobId}/approval-requests`, {
      findingIds: findings.filter((f) => f.state === 'priced').map((f) => f.id),
      message: 'Sent again, as we discussed.',
      estimateVersion: now.version,
    });
    requestId = sent.request.id;
    fresh = new URL(await decisionLink(request, OWNER_EMAIL, since, jobNumber, [first])).pathname;
    // Re-sent while it waits: a new link for the same request.
    await apiCall(manager.page, 'POST', `/api/approval-requests/${requestId}/resend`);
    second = new URL(await decisionLink(request, OWNER_EMAIL, since, jobNumber, [first, fresh])).pathname;
    expect(second).not.toBe(fresh);
    await phone.goto(fresh);
    const closed = phone.getByTestId('decision-closed');
    await expect(closed).toHaveAttribute('data-superseded', 'true');
    await expect(closed.getByText('A newer link was sent to you', { exact: true })).toBeVisible();
    await expect(closed.getByText(/^A newer link was sent to you on \d{1,2} [A-Z][a-z]{2}: use the link in the newest e-mail\.$/)).toBeVisible();
    await expect(closed.locator('[data-request-state="sent"]')).toBeVisible();
    await expect(phone.getByRole('radio')).toHaveCount(0);
    await expect(phone.getByTestId('running-total')).toHaveCount(0);
    await expect(phone.getByRole('img', { name: /^Photo / })).toHaveCount(0);
    await shot(phone, testInfo, '07-owner-old-link-375', false);
    const wide = await context(browser, baseURL, false);
    const widePage = await wide.newPage();
    await widePage.goto(fresh);
    await expect(widePage.getByTestId('decision-closed').getByText('A newer link was sent to you', { exact: true })).toBeVisible();
    await shot(widePage, testInfo, '07b-owner-old-link-1280', false);
    await wide.close();
    // A link never issued still opens nothing.
    await phone.goto(`/decide/${'Q'.repeat(43)}`);
    await expect(phone.getByRole('heading', { level: 1, name: 'This link does not open a request' })).toBeVisible();
    await phone.goto(second);
    await expect(phone.getByText('Finding 1 of 2')).toBeVisible();
    await expect(phone.getByRole('radio', { name: /^Approve/ })).not.toBeChecked();
    await shot(phone, testInfo, '08-owner-new-link-375', false);
    // A choice made on one link of a request is still there on its newer link (same request, same hash).
    await phone.getByRole('radio', { name: /^Decline/ }).check();
    firstOfSecond = second;
  });

  let third = '';
  await test.step('re-sent again from the job screen, the owner decides on the newest link', async () => {
    const { page } = manager;
    await page.goto(`/jobs/${jobId}`);
    const requests = page.getByRole('list', { name: 'Approval requests' });
    await expect(requests.locator('[data-request-state="sent"]')).toHaveCount(1);
    await requests.getByRole('button', { name: 'Resend' }).click();
    await expect(requests.getByText('A new link is on its way to the owner')).toBeVisible();
    // Every link e-mailed so far is left out, the new request's first one too: until the newest
    // e-mail arrives, that older (now superseded) link is the only other one for this job.
    third = new URL(await decisionLink(request, OWNER_EMAIL, since, jobNumber, [first, fresh, second])).pathname;
    await phone.goto(second);
    await expect(phone.getByTestId('decision-closed')).toHaveAttribute('data-superseded', 'true');

    await phone.goto(third);
    expect(firstOfSecond).toBe(second);
    await expect(phone.getByTestId('draft-restored')).toBeVisible();
    await expect(phone.getByRole('radio', { name: /^Decline/ })).toBeChecked();
    await phone.getByRole('radio', { name: /^Approve/ }).check();
    await phone.getByRole('button', { name: 'Next finding →' }).click();
    await phone.getByRole('radio', { name: /^Approve/ }).check();
    await expect(total('new-total')).toHaveText('£319.68'); // 74.40 agreed by phone + 245.28
    await phone.getByRole('button', { name: 'Check your choices' }).click();
    // Each finding without the cowling (74.40 + 96.48) and the cowling once (111.60, 93.00 net) = 245.28.
    await expect(phone.locator('[data-opening-up]')).toHaveCount(1);
    await expect(phone.locator('[data-opening-up]')).toContainText('Opening-up work shared by F-1 and F-2');
    await expect(phone.getByTestId('choice-rows-total')).toContainText('£245.28');
    await phone.getByLabel('Type your full name to confirm').fill(OWNER_NAME);
    await shot(phone, testInfo, '09-owner-review-375', false);
    await phone.getByRole('button', { name: 'Confirm decisions' }).click();
    await expect(phone.getByTestId('decision-receipt').getByRole('heading', { name: 'Your decisions are recorded' })).toBeVisible();
  });

  await test.step('the decided request’s link shows the decided page, on any phone', async () => {
    const later = await context(browser, baseURL, true, { deviceScaleFactor: 2 });
    const again = await later.newPage();
    await again.goto(third);
    const receipt = again.getByTestId('decision-receipt');
    await expect(receipt.getByRole('heading', { name: 'Your decisions are recorded' })).toBeVisible();
    await expect(receipt).toContainText(`Thank you, ${OWNER_NAME}`);
    await expect(receipt.locator('[data-decision="approve"]')).toHaveCount(2);
    await expect(receipt.locator('[data-total="new-total"]')).toHaveText('£319.68');
    await expect(again.getByRole('radio')).toHaveCount(0);
    await shot(again, testInfo, '10-owner-decided-375', true);
    // An older link says the request has since been decided, without showing the decisions.
    await again.goto(second);
    const closed = again.getByTestId('decision-closed');
    await expect(closed.getByText(/^A newer link was sent to you on .+, and the request has since been decided\./)).toBeVisible();
    await expect(again.getByTestId('decision-receipt')).toHaveCount(0);
    await later.close();
    await owner.close();
    await manager.ctx.close();
  });
});

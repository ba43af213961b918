import { fileURLToPath } from 'node:url';
import { expect, test } from '@playwright/test';
import { apiCall, context, decisionLink, expectLoaded, mailTo, shot, signedIn } from './support/journey';

/**
 * The approval journey. The manager books the job in and sends the quote (the template's inspection
 * scope); the owner accepts it on a phone before anything else. Then an engineer at phone width records a spark plug gap outside the template's
 * example limit and raises the proposed finding, plus a second (airworthiness) finding; the manager
 * at desktop width prices both, saves, and sends one request. The owner opens the e-mailed link on
 * a phone, approves the plug work and declines the airworthiness item, types their name and
 * confirms; a reload half-way through the findings keeps their choices. The manager hears about it:
 * an e-mail, and a flag on the job and in the jobs list (the stronger one: an airworthiness item was
 * declined and the owner left a note) until they mark it seen. The manager's estimate, the owner's
 * own page and the job's history all show the result.
 *
 * The engineer attaches a photo to the plug finding (and sees a text file named .jpg refused in the
 * form); the manager sees its thumbnail on the finding's card and opens it large.
 *
 * The job is booked in by the test itself (for the demo aircraft Q-SALT, from the demo annual
 * permit template), so it never collides with the other journeys on the seeded demo jobs.
 */

const OWNER_EMAIL = 'group@owners.example';
const OWNER_NAME = 'Hazel Brambury';
// Above the example wear limit of 0.9 mm in the demo template.
const GAP = '0.98';
// An invented drawing (a retaining spring with a crack marked), made once with sharp; about 26 kB.
const PHOTO = fileURLToPath(new URL('../fixtures/finding-photo.jpg', import.meta.url));

test('an engineer raises findings, the manager sends one request, the owner decides on a phone @approval', async ({ browser, baseURL, request }, testInfo) => {
  test.skip(testInfo.project.name === 'phone', 'Changes demo data: runs once, with its own phone and desktop windows.');
  // The quote's own round trip comes first now: a longer journey.
  test.setTimeout(540_000);
  const stamp = `${Date.now().toString(36)}`;
  const jobTitle = `Annual permit inspection, journey ${stamp}`;
  const plugTitle = `Spark plug gap ${GAP} mm, over the wear limit`;
  const springTitle = `Exhaust spring cracked ${stamp}`;
  let jobId = '';
  let jobNumber = '';
  let quoteLink = '';

  await test.step('the manager books the job in from the annual permit template and starts the inspection', async () => {
    const { ctx, page } = await signedIn(browser, baseURL, 'manager@brackenfold.example', false);
    const aircraft = await apiCall<{ items: { id: string; registration: string }[] }>(page, 'GET', '/api/aircraft?q=Q-SALT');
    const salt = aircraft.items.find((a) => a.registration === 'Q-SALT');
    expect(salt).toBeTruthy();
    const templates = await apiCall<{ id: string; name: string; jobType: string }[]>(page, 'GET', '/api/templates');
    const annual = templates.find((t) => t.jobType === 'annual_permit_inspection') ?? templates.find((t) => /annual/i.test(t.name));
    expect(annual, 'the demo annual permit template').toBeTruthy();
    const today = new Date().toISOString().slice(0, 10);
    const job = await apiCall<{ id: string; number: string; version: number }>(page, 'POST', '/api/jobs', {
      aircraftId: salt!.id,
      title: jobTitle,
      type: 'annual_permit_inspection',
      bookedInOn: today,
      templateId: annual!.id,
    });
    jobId = job.id;
    jobNumber = job.number;
    await apiCall(page, 'POST', `/api/jobs/${job.id}/transition`, { to: 'inspecting', version: job.version });
    await ctx.close();
  });

  await test.step('the manager sends the quote and the owner accepts it on a phone first', async () => {
    const quoteSince = Date.now();
    const { ctx, page } = await signedIn(browser, baseURL, 'manager@brackenfold.example', false);
    await page.goto(`/jobs/${jobId}`);
    const quote = page.getByTestId('quote-panel');
    await expect(quote.locator('[data-quote-state="not_sent"]')).toHaveText('Quote not sent');
    await quote.getByRole('button', { name: 'Send quote to owner' }).click();
    const panel = page.getByRole('region', { name: 'Send for approval' });
    await expect(panel.getByRole('checkbox', { name: /^Quote: the inspection scope not yet agreed/ })).toBeChecked();
    await expect(panel.getByTestId('send-preview')).toContainText('The quote');
    await panel.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '00a-manager-quote-ticked-1280', false);
    await panel.getByRole('button', { name: 'Send for approval' }).click();
    // Sending waits for the job's figures to reload; a busy machine can take a while.
    await expect(panel.getByTestId('request-sent')).toContainText('with the quote', { timeout: 45_000 });
    await expect(quote.locator('[data-quote-state="sent"]')).toBeVisible();
    await ctx.close();

    const link = new URL(await decisionLink(request, OWNER_EMAIL, quoteSince, jobNumber)).pathname;
    quoteLink = link;
    const wide = await context(browser, baseURL, false);
    const widePage = await wide.newPage();
    await widePage.goto(link);
    await expect(widePage.getByTestId('decide-quote')).toBeVisible();
    await shot(widePage, testInfo, '00b-owner-quote-1280', false);
    await wide.close();

    const phone = await context(browser, baseURL, true);
    const owner = await phone.newPage();
    await owner.goto(link);
    await expect(owner.getByRole('heading', { level: 1, name: 'Our quote for Q-SALT' })).toBeVisible();
    await expect(owner.getByText('Waiting for your decision', { exact: true })).toBeVisible();
    const price = (await owner.getByTestId('decide-price').locator('p.text-2xl').textContent()) ?? '';
    await shot(owner, testInfo, '00c-owner-quote-375', false);
    await owner.getByRole('radio', { name: /^Accept/ }).check();
    const bar = owner.getByTestId('running-total');
    await expect(bar.locator('[data-total="approving-now"]')).toHaveText(price.replace(' incl. VAT', ''));
    await owner.getByRole('button', { name: 'Check your choices' }).click();
    await owner.getByLabel('Type your full name to confirm').fill(OWNER_NAME);
    await shot(owner, testInfo, '00d-owner-quote-review-375', false);
    await owner.getByRole('button', { name: 'Confirm decisions' }).click();
    await expect(owner.getByTestId('decision-receipt').getByRole('heading', { name: 'Your decisions are recorded' })).toBeVisible();
    await expect(owner.getByTestId('decision-receipt').locator('[data-receipt="quote"]')).toContainText('Accepted');
    await shot(owner, testInfo, '00e-owner-quote-receipt-375', false);
    await phone.close();

    const again = await signedIn(browser, baseURL, 'manager@brackenfold.example', false);
    await again.page.goto(`/jobs/${jobId}`);
    await expect(again.page.getByTestId('quote-panel').locator('[data-quote-state="agreed"]')).toHaveText('Quote agreed');
    await again.ctx.close();
  });

  await test.step('the engineer records an out-of-limit plug gap on a phone and raises two findings', async () => {
    const { ctx, page } = await signedIn(browser, baseURL, 'priya@brackenfold.example', true);
    await page.goto(`/hangar/${jobId}`);
    await expect(page.getByRole('heading', { level: 1, name: /Q-SALT/ })).toBeVisible();
    const item = page.getByRole('article', { name: 'Spark plug electrode gap, each plug' });
    await item.getByRole('button', { name: 'Record value' }).click();
    await item.getByLabel(/Measured value/).fill(GAP);
    await item.getByRole('button', { name: 'Save value' }).click();
    await expect(item.getByText('Outside the example limit (at most 0.9 mm)')).toBeVisible();
    await item.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '01-engineer-out-of-limit-375');

    await item.getByRole('button', { name: 'Raise finding' }).click();
    let form = page.getByRole('form', { name: 'Raise finding' });
    await form.getByLabel('Title').fill(plugTitle);
    await form.getByLabel('Where on the aircraft').fill('Engine, cylinder 1 lower plug');
    await form.locator('label[data-category="recommended"]').click();
    await form.getByLabel('What should be done').fill('Fit a new set of plugs gapped to the manufacturer’s figure.');
    await form.getByLabel('Hours').fill('0.5');
    await form.getByRole('button', { name: '+ Part from the catalogue' }).click();
    // The part is found by searching the catalogue on the server, then picked from the list.
    await form.getByRole('combobox', { name: 'Part 1' }).fill('WS-1201');
    await form.getByRole('option', { name: /WS-1201 — Spark plug, resistor type, 12 mm thread/ }).click();
    await expect(form.getByRole('combobox', { name: 'Part 1' })).toHaveValue('WS-1201 — Spark plug, resistor type, 12 mm thread');
    await form.getByLabel('Qty').fill('4');

    // A text file given a .jpg name is refused in the form, by name, before anything is sent.
    const choose = form.getByLabel('Choose pictures');
    await choose.setInputFiles({ name: 'torque-notes.jpg', mimeType: 'image/jpeg', buffer: Buffer.from('Prop bolts: torque to the maker’s figure.\n') });
    await expect(form.getByRole('alert').filter({ hasText: 'torque-notes.jpg is not a JPEG, PNG or WebP picture' })).toBeVisible();
    await expect(form.getByRole('list', { name: 'Chosen photos' })).toHaveCount(0);
    await shot(page, testInfo, '01b-engineer-text-file-refused-375', false);
    await choose.setInputFiles(PHOTO);
    const preview = form.getByRole('img', { name: 'Chosen photo 1: finding-photo.jpg' });
    await expectLoaded(preview);
    await expect(form.getByRole('alert').filter({ hasText: 'torque-notes.jpg' })).toHaveCount(0);
    await preview.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '01c-engineer-photo-chosen-375', false);
    await form.getByRole('button', { name: 'Raise finding' }).click();
    await expect(page.getByText(/is with the manager to price, with 1 photo\./)).toBeVisible();
    const plugCard = page.locator('li[data-finding]', { hasText: plugTitle });
    const plugThumb = plugCard.getByRole('img', { name: new RegExp(`^Photo 1 of F-\\d+: ${plugTitle}$`) });
    await expectLoaded(plugThumb);
    await plugCard.getByRole('button', { name: /^Photo 1 of F-/ }).click();
    const viewer = page.getByRole('dialog', { name: /Photo 1 of 1/ });
    await expectLoaded(viewer.getByRole('img'));
    await shot(page, testInfo, '01d-engineer-photo-viewer-375', false);
    await page.keyboard.press('Escape');
    await expect(viewer).toHaveCount(0);

    await page.getByRole('button', { name: 'Raise finding' }).click();
    form = page.getByRole('form', { name: 'Raise finding' });
    await form.getByLabel('Title').fill(springTitle);
    await form.getByLabel('Where on the aircraft').fill('Exhaust, rear cylinder');
    await form.locator('label[data-category="airworthiness"]').click();
    await form.getByLabel('What was seen').fill('One exhaust retaining spring cracked through at the hook.');
    await form.getByLabel('What should be done').fill('Replace the spring and check its partner.');
    await form.getByLabel('Hours').fill('0.5');
    await shot(page, testInfo, '02-engineer-second-finding-375');
    await form.getByRole('button', { name: 'Raise finding' }).click();
    await expect(page.locator('li[data-finding]', { hasText: springTitle })).toBeVisible();
    await ctx.close();
  });

  const since = Date.now();
  let sentClickedAt = 0;
  await test.step('the manager prices both findings, saves, and sends one request', async () => {
    const { ctx, page } = await signedIn(browser, baseURL, 'manager@brackenfold.example', false);
    await page.goto(`/jobs/${jobId}`);
    await expect(page.getByRole('heading', { name: /^Estimate/ })).toBeVisible();
    const plug = page.locator('li[data-finding]', { hasText: plugTitle });
    const spring = page.locator('li[data-finding]', { hasText: springTitle });
    await plug.getByRole('button', { name: 'Price finding' }).click();
    await spring.getByRole('button', { name: 'Price finding' }).click();
    await page.getByRole('button', { name: 'Save estimate' }).click();
    await expect(page.getByTestId('estimate-save-state')).toHaveText(/Saved/);
    await expect(plug.getByText('Priced', { exact: true })).toBeVisible();
    await expect(spring.getByText('Priced', { exact: true })).toBeVisible();

    // The engineer's photo is on the plug finding's card; the spring finding has none.
    await expectLoaded(plug.getByRole('img', { name: new RegExp(`^Photo 1 of F-\\d+: ${plugTitle}$`) }));
    await expect(spring.getByRole('img', { name: /^Photo / })).toHaveCount(0);
    await plug.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '02b-manager-card-thumbnail-1280', false);
    await plug.getByRole('button', { name: /^Photo 1 of F-/ }).click();
    const viewer = page.getByRole('dialog', { name: /Photo 1 of 1/ });
    await expectLoaded(viewer.getByRole('img'));
    await shot(page, testInfo, '02c-manager-photo-viewer-1280', false);
    await viewer.getByRole('button', { name: 'Close' }).click();
    await expect(viewer).toHaveCount(0);

    await plug.getByLabel(/Include F-\d+ in the request/).check();
    await spring.getByLabel(/Include F-\d+ in the request/).check();
    const panel = page.getByRole('region', { name: 'Send for approval' });
    await expect(panel.getByText('An airworthiness finding is ticked')).toBeVisible();
    await panel.getByLabel('A short message to the owner (optional)').fill('Two things turned up on the inspection; the plugs are cheap to do while the cowl is off.');
    await panel.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '03-manager-ticked-1280');
    await panel.getByRole('button', { name: 'Send for approval' }).click();
    sentClickedAt = Date.now();
    await expect(panel.getByTestId('request-sent')).toContainText(`Request sent to Saltmarsh Flyers Group`);
    const requests = page.getByRole('list', { name: 'Approval requests' });
    await expect(requests.locator('[data-request-state="sent"]')).toHaveCount(1);
    await expect(requests.getByRole('button', { name: 'Revoke link' })).toBeVisible();
    await expect(requests.getByRole('button', { name: 'Resend' })).toBeVisible();
    await expect(plug.locator('[data-finding-state="sent"]')).toBeVisible();
    await shot(page, testInfo, '04-manager-sent-1280');
    await ctx.close();
  });

  let newTotal = '';
  let decidedAt = 0;
  await test.step('the owner opens the e-mailed link on a phone, approves one finding and declines the other', async () => {
    const link = await decisionLink(request, OWNER_EMAIL, since, jobNumber, [quoteLink]);
    // An upper bound (the manager's steps after sending and the poll interval count too).
    const sendToMail = Date.now() - sentClickedAt;
    testInfo.annotations.push({ type: 'send → e-mail in maildev (ms, upper bound)', description: String(sendToMail) });
    // Printed so a CI log records the measurement (the list reporter shows a test's output).
    console.log(`[measure] send → e-mail in maildev: ${sendToMail} ms (upper bound)`);
    // The same letter on a desktop screen (looking changes nothing).
    const wide = await context(browser, baseURL, false);
    const widePage = await wide.newPage();
    await widePage.goto(new URL(link).pathname);
    await expect(widePage.getByText('Finding 1 of 2')).toBeVisible();
    await shot(widePage, testInfo, '05a-owner-finding-1-1280', false);
    await wide.close();

    const ctx = await context(browser, baseURL, true);
    const page = await ctx.newPage();
    // Which scripts a phone downloads to open the link (first load only).
    const scripts = new Set<string>();
    const onResponse = (r: import('@playwright/test').Response) => {
      if (r.request().resourceType() === 'script') scripts.add(new URL(r.url()).pathname);
    };
    page.on('response', onResponse);
    await page.goto(new URL(link).pathname);
    await expect(page.getByRole('heading', { level: 1, name: 'Work found on Q-SALT' })).toBeVisible();
    await expect(page.getByText('Finding 1 of 2')).toBeVisible();
    // The engineer's photo, frozen in the request, shown large through the link alone.
    const ownerPhoto = page.getByRole('img', { name: new RegExp(`^Photo 1 of F-\\d+: ${plugTitle}$`) });
    await expectLoaded(ownerPhoto);
    expect((await ownerPhoto.boundingBox())?.width ?? 0, 'the photo spans the phone column').toBeGreaterThanOrEqual(300);
    await page.evaluate(() => window.scrollTo(0, 0));
    const bar = page.getByTestId('running-total');
    await expect(bar).toBeInViewport();
    await shot(page, testInfo, '05-owner-finding-1-375', false);
    page.off('response', onResponse);
    testInfo.annotations.push({ type: 'owner page scripts', description: [...scripts].sort().join(' ') });
    console.log(`[measure] scripts the owner's phone loads: ${[...scripts].sort().join(' ')}`);

    await page.getByRole('radio', { name: /Approve/ }).check();
    for (const b of await page.getByRole('button').all()) {
      const box = await b.boundingBox();
      expect(box?.height ?? 0, `${await b.textContent()} is a 44 px tap target`).toBeGreaterThanOrEqual(44);
    }
    await expect(bar.locator('[data-total="approving-now"]')).not.toHaveText('£0.00');
    await page.getByRole('button', { name: 'Next finding →' }).click();
    await expect(page.getByText('Finding 2 of 2')).toBeVisible();
    // The phone drops the tab (a trip to the mail app): the reload keeps the choice and the place.
    await page.reload();
    await expect(page.getByText('Finding 2 of 2')).toBeVisible();
    await expect(page.getByTestId('draft-restored')).toBeVisible();
    await page.getByRole('button', { name: '← Back' }).click();
    await expect(page.getByRole('radio', { name: /^Approve/ })).toBeChecked();
    await page.getByRole('button', { name: 'Next finding →' }).click();
    await expect(page.getByRole('heading', { level: 2, name: new RegExp(springTitle) })).toBeVisible();
    await page.getByRole('radio', { name: /Decline/ }).check();
    await expect(page.getByText('This is an airworthiness item')).toBeVisible();
    await expect(page.getByText(/we will not mark Q-\w+ ready for release in Wingstage\. Whether the aircraft may fly is the inspector's decision under the authority's rules/)).toBeVisible();
    await page.getByLabel('A note for the workshop (optional)').fill('We will get the spring from the group stores. Please ring me.');
    await expect(bar).toBeInViewport();
    await shot(page, testInfo, '06-owner-declined-airworthiness-375', false);

    await page.getByRole('button', { name: 'Check your choices' }).click();
    await expect(page.getByRole('heading', { name: 'Check your choices' })).toBeVisible();
    await expect(page.locator('[data-decision="approve"]')).toHaveCount(1);
    await expect(page.locator('[data-decision="decline"]')).toHaveCount(1);
    await page.getByRole('button', { name: 'Confirm decisions' }).click();
    await expect(page.getByText('Type your name to confirm.')).toBeVisible();
    await page.getByLabel('Type your full name to confirm').fill(OWNER_NAME);
    newTotal = (await bar.locator('[data-total="new-total"]').textContent()) ?? '';
    await shot(page, testInfo, '07-owner-review-375', false);
    decidedAt = Date.now();
    await page.getByRole('button', { name: 'Confirm decisions' }).click();
    const receipt = page.getByTestId('decision-receipt');
    await expect(receipt.getByRole('heading', { name: 'Your decisions are recorded' })).toBeVisible();
    await expect(receipt).toContainText(`Thank you, ${OWNER_NAME}`);
    await expect(receipt.locator('[data-total="new-total"]')).toHaveText(newTotal);
    await shot(page, testInfo, '08-owner-receipt-375');

    // The same link afterwards shows the record, not the choices.
    await page.reload();
    await expect(page.getByTestId('decision-receipt')).toBeVisible();
    await ctx.close();
  });

  await test.step("the manager's estimate and the job's history show the decisions", async () => {
    const { ctx, page } = await signedIn(browser, baseURL, 'manager@brackenfold.example', false);
    await page.goto(`/jobs/${jobId}`);
    await expect(page.getByTestId('total-committed-gross')).toHaveText(`${newTotal} incl. VAT`);
    const requests = page.getByRole('list', { name: 'Approval requests' });
    // The quote's request and the findings' request.
    await expect(requests.locator('[data-request-state="decided"]')).toHaveCount(2);
    await expect(requests).toContainText(`by ${OWNER_NAME}`);
    await expect(page.locator('li[data-finding]', { hasText: plugTitle }).getByText('Approved', { exact: true })).toBeVisible();
    await expect(page.locator('li[data-finding]', { hasText: springTitle }).getByText('Declined', { exact: true })).toBeVisible();
    await expect(page.getByText(`${OWNER_NAME} decided the approval request`).first()).toBeVisible();

    // The flag: the stronger mark, its reasons in words, until the manager marks it seen.
    const toSee = page.getByTestId('decisions-to-see');
    await expect(toSee.getByTestId('decisions-flag')).toHaveAttribute('data-strength', 'strong');
    await expect(toSee).toContainText('Airworthiness item declined · The owner left a note');
    await shot(page, testInfo, '09-manager-after-decision-1280');
    await page.goto(`/jobs?q=${encodeURIComponent(jobNumber)}`);
    const row = page.getByRole('row', { name: new RegExp(jobNumber) });
    await expect(row.getByTestId('decisions-flag')).toContainText('Airworthiness item declined');
    await shot(page, testInfo, '09b-manager-jobs-list-flag-1280', false);

    // The e-mail to the manager leads with what needs a call.
    let subject = '';
    await expect
      .poll(
        async () => {
          const mails = await mailTo(request, 'manager@brackenfold.example', decidedAt);
          const m = mails.find((x) => `${x.text ?? ''}`.includes(`job ${jobNumber})`));
          subject = m?.subject ?? '';
          return m ? `${m.text ?? ''}` : '';
        },
        { timeout: 60_000, message: 'the decision e-mail to the manager' },
      )
      .toContain('ACTION NEEDED');
    expect(subject).toMatch(/^Action needed: Q-SALT: the owner decided/);

    await page.goto(`/jobs/${jobId}`);
    await page.getByTestId('decisions-to-see').getByRole('button', { name: 'Mark as seen' }).click();
    await expect(page.getByTestId('decisions-to-see')).toHaveCount(0);
    await ctx.close();
  });

  await test.step("the owner's own page shows the new total", async () => {
    const { ctx, page } = await signedIn(browser, baseURL, OWNER_EMAIL, true);
    await page.goto('/my-aircraft');
    const entry = page.locator('li', { hasText: jobTitle });
    await expect(entry.locator('[data-owner-total="committed"]')).toHaveText(`${newTotal} incl. VAT`);
    await expect(entry.getByTestId('decision-waiting')).toHaveCount(0);
    // What was found, with the engineer's photo.
    await expectLoaded(entry.getByRole('region', { name: 'What we found' }).getByRole('img', { name: new RegExp(`^Photo 1 of F-\\d+: ${plugTitle}$`) }));
    await shot(page, testInfo, '10-owner-my-aircraft-375');
    await ctx.close();
  });
});

import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { expect, test, type Browser } from '@playwright/test';
import { DESKTOP, PHONE, expectLoaded, shot, signIn } from './support/journey';

/**
 * An engineer at phone width records a spark plug gap outside the template's example limit on the
 * demo annual inspection of Q-BRKA and raises the proposed finding; the manager at desktop width
 * prices it in the estimate builder, saves, and sees the discovered-work total change. Photos: the
 * engineer attaches one with the finding, adds a second from its card, looks at both large and
 * removes the second; the manager sees the one left, and tries the form's photo section at desktop width.
 *
 * It changes the demo job, so it runs once (desktop project) against a freshly seeded database,
 * as docker-free-scripts/test.sh provides.
 */

// Above the example wear limit of 0.9 mm in the demo template.
const GAP = '0.97';
// An invented drawing made once with sharp (see journey-approval.spec.ts).
const PHOTO = fileURLToPath(new URL('../fixtures/finding-photo.jpg', import.meta.url));

// A 1×1 PNG, to show a second kind of picture in the previews.
const PNG_1PX = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkaPhfDwAE/wH+Yb5XbwAAAABJRU5ErkJggg==', 'base64');

async function signedIn(browser: Browser, baseURL: string | undefined, email: string, size: { width: number; height: number }, phone: boolean) {
  const ctx = await browser.newContext({ baseURL, viewport: size, isMobile: phone, hasTouch: phone, locale: 'en-GB', timezoneId: 'Europe/London' });
  const page = await ctx.newPage();
  await signIn(page, email);
  return { ctx, page };
}

test('an out-of-limit plug gap becomes a finding the manager prices @approval', async ({ browser, baseURL }, testInfo) => {
  test.skip(testInfo.project.name !== 'desktop', 'Changes the demo job: runs once, with its own phone and desktop windows.');
  test.setTimeout(180_000);
  let jobPath = '';
  const findingTitle = `Spark plug gap ${GAP} mm, over the wear limit`;

  await test.step('the engineer opens the job in the hangar on a phone', async () => {
    const { ctx, page } = await signedIn(browser, baseURL, 'priya@brackenfold.example', PHONE, true);
    await page.goto('/hangar');
    await expect(page.getByRole('heading', { level: 1, name: 'Hangar' })).toBeVisible();
    await shot(page, testInfo, '01-engineer-hangar-375');
    await page.getByRole('link', { name: /Q-BRKA.*Annual permit inspection/ }).filter({ hasNotText: 'payment journey' }).click();
    await expect(page.getByRole('heading', { level: 1, name: /Q-BRKA/ })).toBeVisible();
    jobPath = new URL(page.url()).pathname.replace('/hangar/', '/jobs/');
    await expect(page.getByText("Follow the manufacturer's current data and the authority's rules").first()).toBeVisible();

    const item = page.getByRole('article', { name: 'Spark plug electrode gap, each plug' });
    await item.getByRole('button', { name: 'Record value' }).click();
    await item.getByLabel(/Measured value/).fill(GAP);
    await item.getByRole('button', { name: 'Save value' }).click();
    await expect(item.getByText(`Measured ${GAP} mm`)).toBeVisible();
    await expect(item.getByText('Outside the example limit (at most 0.9 mm)')).toBeVisible();
    // Every button the engineer taps on the phone is at least 44 px tall.
    for (const b of await item.getByRole('button').all()) {
      const box = await b.boundingBox();
      expect(box?.height ?? 0).toBeGreaterThanOrEqual(44);
    }
    await item.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '02-engineer-out-of-limit-375');

    await item.getByRole('button', { name: 'Raise finding' }).click();
    const form = page.getByRole('form', { name: 'Raise finding' });
    await expect(form.getByLabel('Title')).toHaveValue(/Spark plug electrode gap/);
    await expect(form.getByLabel('Where on the aircraft')).toHaveValue('Engine');
    await expect(form.getByLabel('What was seen')).toHaveValue(new RegExp(`Measured ${GAP} mm`));
    await form.getByLabel('Title').fill(findingTitle);
    await form.getByLabel('Where on the aircraft').fill('Engine, cylinder 1 lower plug');
    // Each category choice carries its word, its icon and its meaning.
    const recommended = form.locator('label[data-category="recommended"]');
    await expect(recommended).toContainText('Not an airworthiness item');
    await expect(recommended.locator('svg')).toHaveCount(1);
    await recommended.click();
    await form.getByLabel('What should be done').fill('Fit a new set of plugs gapped to the manufacturer’s figure.');
    await form.getByLabel('Hours').fill('0.5');
    await form.getByRole('button', { name: '+ Part from the catalogue' }).click();
    // The part is found by searching the catalogue on the server, then picked from the list.
    await form.getByRole('combobox', { name: 'Part 1' }).fill('WS-1201');
    await form.getByRole('option', { name: /WS-1201 — Spark plug, resistor type, 12 mm thread/ }).click();
    await expect(form.getByRole('combobox', { name: 'Part 1' })).toHaveValue('WS-1201 — Spark plug, resistor type, 12 mm thread');
    await form.getByLabel('Qty').fill('4');
    // A good photo and one cut short in transfer: the browser cannot tell, the server can.
    await form.getByLabel('Choose pictures').setInputFiles([
      { name: 'finding-photo.jpg', mimeType: 'image/jpeg', buffer: readFileSync(PHOTO) },
      { name: 'cut-short.jpg', mimeType: 'image/jpeg', buffer: readFileSync(PHOTO).subarray(0, 3000) },
    ]);
    await expectLoaded(form.getByRole('img', { name: 'Chosen photo 1: finding-photo.jpg' }));
    await expect(form.getByRole('img', { name: 'Chosen photo 2: cut-short.jpg' })).toBeVisible();
    await shot(page, testInfo, '03-engineer-raise-finding-375');
    await form.getByRole('button', { name: 'Raise finding' }).click();

    // The finding is kept; the photos are not, and the notice says why in the server's words.
    const notice = page.getByRole('alert').filter({ hasText: 'Finding saved; photos not attached' });
    await expect(notice).toContainText(/is saved and is with the manager to price, but its 2 photos were not attached: “cut-short\.jpg” could not be read as a picture/);
    await expect(notice).toContainText('Nothing you typed is lost.');
    await shot(page, testInfo, '03b-engineer-photos-not-attached-375', false);
    const raised = page.locator('li[data-finding]', { hasText: findingTitle });
    await expect(raised.getByText('Recommended', { exact: true })).toBeVisible();
    await expect(raised.getByText('Draft', { exact: true })).toBeVisible();
    await expect(raised.getByRole('img', { name: /^Photo \d of F-/ })).toHaveCount(0);

    // Both photos wait on the finding's card; without the damaged one, the other goes up.
    const retry = raised.getByRole('group', { name: /^Add photos to F-/ });
    await expect(retry.getByRole('alert')).toContainText('cut-short.jpg');
    await notice.getByRole('button', { name: /^Go to F-\d+$/ }).click();
    await expect(retry.getByRole('alert')).toBeInViewport();
    await shot(page, testInfo, '03c-engineer-retry-on-card-375', false);
    await retry.getByRole('button', { name: 'Remove chosen photo 2 (cut-short.jpg)' }).click();
    await retry.getByRole('button', { name: 'Try again' }).click();
    await expect(raised.getByText(/^1 photo attached to F-\d+\.$/)).toBeVisible();
    await expectLoaded(raised.getByRole('img', { name: /^Photo 1 of F-\d+: Spark plug gap/ }));
    await shot(page, testInfo, '04-engineer-finding-raised-375');

    // A second photo from the card, both seen large, then the second one removed again.
    await raised.getByRole('button', { name: 'Add photos' }).click();
    const adding = raised.getByRole('group', { name: /^Add photos to F-/ });
    await adding.getByLabel('Choose pictures').setInputFiles(PHOTO);
    await adding.getByRole('button', { name: 'Attach 1 photo' }).click();
    await expect(raised.getByRole('img', { name: /^Photo \d of F-/ })).toHaveCount(2);
    await expectLoaded(raised.getByRole('img', { name: /^Photo 2 of F-\d+: Spark plug gap/ }));
    await raised.scrollIntoViewIfNeeded();
    await shot(page, testInfo, '04b-engineer-card-two-photos-375', false);
    await raised.getByRole('button', { name: /^Photo 1 of F-/ }).click();
    const viewer = page.getByRole('dialog', { name: /^Photo 1 of 2/ });
    await expectLoaded(viewer.getByRole('img'));
    await viewer.getByRole('button', { name: 'Next photo →' }).click();
    await expect(page.getByRole('dialog', { name: /^Photo 2 of 2/ })).toBeVisible();
    await shot(page, testInfo, '04c-engineer-viewer-375', false);
    await page.keyboard.press('Escape');
    await expect(page.getByRole('dialog')).toHaveCount(0);
    await raised.getByRole('button', { name: /^Remove photo 2 of F-/ }).click();
    await raised.getByRole('group', { name: 'Confirm removal' }).getByRole('button', { name: 'Remove photo 2' }).click();
    await expect(raised.getByText(/^Photo removed from F-\d+\.$/)).toBeVisible();
    await expect(raised.getByRole('img', { name: /^Photo \d of F-/ })).toHaveCount(1);
    await ctx.close();
  });

  await test.step('the manager prices the finding in the builder and saves', async () => {
    const { ctx, page } = await signedIn(browser, baseURL, 'manager@brackenfold.example', DESKTOP, false);
    await page.goto(jobPath);
    await expect(page.getByRole('heading', { name: /^Estimate/ })).toBeVisible();
    const discovered = page.getByTestId('stage-head-discovered');
    const before = await discovered.textContent();
    const finding = page.locator('li[data-finding]', { hasText: findingTitle });
    await expect(finding.getByText('Draft', { exact: true })).toBeVisible();
    await expectLoaded(finding.getByRole('img', { name: /^Photo 1 of F-\d+: Spark plug gap/ }));
    await expect(finding.getByRole('img', { name: /^Photo \d of F-/ })).toHaveCount(1);
    await shot(page, testInfo, '05-manager-job-1280');

    await finding.getByRole('button', { name: 'Price finding' }).click();
    // The lines arrive from the engineer's proposal and the totals follow at once, before saving.
    const section = page.locator('section[data-stage="discovered"]');
    await expect(section.locator('[data-line-kind="labour"]')).toHaveCount(1);
    await expect(section.locator('[data-line-kind="part"]')).toHaveCount(1);
    await expect(discovered).not.toHaveText(before ?? '');
    const live = await discovered.textContent();
    await expect(page.getByText('Unsaved changes')).toBeVisible();
    await shot(page, testInfo, '06-manager-priced-unsaved-1280');

    await page.getByRole('button', { name: 'Save estimate' }).click();
    await expect(page.getByTestId('estimate-save-state')).toHaveText(/Saved/);
    await expect(finding.getByText('Priced', { exact: true })).toBeVisible();
    await page.reload();
    // What the server priced and stored is what the builder showed live.
    await expect(page.getByTestId('stage-head-discovered')).toHaveText(live ?? '');
    await shot(page, testInfo, '07-manager-saved-1280');

    // The form's photo section at desktop width; cancelling raises nothing and sends nothing.
    await page.goto(jobPath.replace('/jobs/', '/hangar/'));
    await page.getByRole('button', { name: 'Raise finding' }).first().click();
    const form = page.getByRole('form', { name: 'Raise finding' });
    await form.getByLabel('Choose pictures').setInputFiles([
      { name: 'finding-photo.jpg', mimeType: 'image/jpeg', buffer: readFileSync(PHOTO) },
      { name: 'cowl-inside.png', mimeType: 'image/png', buffer: PNG_1PX },
    ]);
    await expectLoaded(form.getByRole('img', { name: 'Chosen photo 2: cowl-inside.png' }));
    await form.locator('fieldset', { hasText: 'Photos' }).first().scrollIntoViewIfNeeded();
    await shot(page, testInfo, '08-manager-form-photos-1280', false);
    await form.getByRole('button', { name: 'Cancel' }).click();
    await expect(page.getByRole('form', { name: 'Raise finding' })).toHaveCount(0);
    await ctx.close();
  });
});

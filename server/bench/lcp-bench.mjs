// npm run bench:lcp drives this (docker-free-scripts/bench-lcp.sh starts the app as npm start serves
// it). Opens an owner's decision link in Debian's Chromium at 375 px with 4× CPU throttling and a
// slow-4G profile (150 ms, 1.6 Mbit/s down, 750 kbit/s up), a cold cache each run, and reports the
// largest contentful paint, when the decision data was on screen, and the JavaScript transferred.
//   BENCH_APP_URL=… BENCH_MAILDEV_URL=… [BENCH_LCP_RUNS=3] node server/bench/lcp-bench.mjs
import os from 'node:os';
import { chromium } from '@playwright/test';

const APP = process.env.BENCH_APP_URL;
const MAILDEV = process.env.BENCH_MAILDEV_URL;
const RUNS = Number(process.env.BENCH_LCP_RUNS ?? 3);
if (!APP || !MAILDEV) throw new Error('BENCH_APP_URL and BENCH_MAILDEV_URL are required.');

const cookiesOf = (res) => res.headers.getSetCookie().map((c) => c.split(';')[0]);

/** A fresh decision link: the manager re-sends an open request of the demo, and the mail carries it. */
async function freshLink() {
  const signIn = await fetch(`${APP}/api/auth/sign-in`, {
    method: 'POST', headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'manager@brackenfold.example', password: 'wingstage-demo' }),
  });
  if (!signIn.ok) throw new Error(`sign-in failed: ${signIn.status}`);
  const cookies = cookiesOf(signIn);
  const cookie = cookies.join('; ');
  const csrf = decodeURIComponent(cookies.find((c) => c.startsWith('ws_csrf='))?.slice('ws_csrf='.length) ?? '');
  const get = async (p) => (await fetch(`${APP}/api${p}`, { headers: { cookie } })).json();
  const jobs = (await get('/jobs?state=awaiting_owner&pageSize=100')).items;
  for (const job of jobs) {
    const open = (await get(`/jobs/${job.id}/approval-requests`)).find((r) => r.state === 'sent');
    if (!open) continue;
    const since = Date.now() - 2000;
    const resent = await fetch(`${APP}/api/approval-requests/${open.id}/resend`, { method: 'POST', headers: { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json' }, body: '{}' });
    if (!resent.ok) throw new Error(`resend failed: ${resent.status} ${await resent.text()}`);
    for (let i = 0; i < 60; i += 1) {
      const mails = await (await fetch(`${MAILDEV}/api/email`)).json();
      // maildev lists oldest first and stamps whole seconds.
      const mail = mails.filter((m) => new Date(m.time ?? m.date ?? 0).getTime() >= since).reverse().find((m) => /\/decide\/[A-Za-z0-9_-]+/.test(m.text ?? m.html ?? ''));
      const link = mail && /https?:\/\/[^\s"<]+\/decide\/[A-Za-z0-9_-]+/.exec(mail.text ?? mail.html)?.[0];
      if (link) return { link, job: job.number };
      await new Promise((r) => setTimeout(r, 500));
    }
    throw new Error('the re-sent link did not arrive in maildev');
  }
  throw new Error('no open approval request in the demo workshop to open');
}

const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)];

const { link, job } = await freshLink();
console.log(`\nOwner's decision page (${job}), Chromium 375 px, 4× CPU throttle, slow 4G (150 ms, 1.6 Mbit/s), cold cache; load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}\n`);
const browser = await chromium.launch({
  executablePath: process.env.BENCH_CHROMIUM ?? '/usr/bin/chromium',
  args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-quic', '--no-first-run'],
});
const runs = [];
try {
  for (let i = 0; i < RUNS; i += 1) {
    const context = await browser.newContext({ viewport: { width: 375, height: 740 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true, locale: 'en-GB' });
    const page = await context.newPage();
    const cdp = await context.newCDPSession(page);
    await cdp.send('Network.enable');
    await cdp.send('Network.setCacheDisabled', { cacheDisabled: true });
    await cdp.send('Network.emulateNetworkConditions', { offline: false, latency: 150, downloadThroughput: (1.6 * 1024 * 1024) / 8, uploadThroughput: (750 * 1024) / 8 });
    await cdp.send('Emulation.setCPUThrottlingRate', { rate: 4 });
    await page.addInitScript(() => {
      const w = window;
      w.__lcp = { time: 0, what: '' };
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) {
          w.__lcp = { time: e.startTime, what: `${e.element?.tagName ?? '?'} ${(e.element?.textContent ?? '').trim().slice(0, 40)}` };
          (w.__candidates ??= []).push(`${(e.startTime / 1000).toFixed(2)} s ${e.size} px² ${e.element?.tagName ?? '?'}`);
        }
      }).observe({ type: 'largest-contentful-paint', buffered: true });
      // When the owner's letter (its h1) is first in the page; that element is marked, so a later
      // look tells whether React took over the server's markup (same element) or replaced it.
      new MutationObserver((_, obs) => {
        const h1 = document.querySelector('main h1');
        if (h1) {
          w.__shown = performance.now();
          h1.__first = true;
          obs.disconnect();
        }
      }).observe(document, { childList: true, subtree: true });
    });
    let jsBytes = 0;
    let scripts = 0;
    let lastScriptDone = 0;
    let dataAsked = 0;
    const urls = new Map();
    cdp.on('Network.requestWillBeSent', (e) => {
      urls.set(e.requestId, e.request.url);
      // The page's data (not its photos): asked for only when the HTML came without it.
      if (/\/api\/decide\/[A-Za-z0-9_-]+$/.test(new URL(e.request.url).pathname) && !dataAsked) dataAsked = e.timestamp;
    });
    cdp.on('Network.loadingFinished', (e) => {
      if (urls.get(e.requestId)?.endsWith('.js')) {
        jsBytes += e.encodedDataLength;
        scripts += 1;
        lastScriptDone = Math.max(lastScriptDone, e.timestamp);
      }
    });
    const problems = [];
    page.on('console', (msg) => {
      if (msg.type() === 'error') problems.push(msg.text().slice(0, 120));
    });
    page.on('pageerror', (err) => problems.push(String(err).slice(0, 120)));
    // BENCH_LCP_TRACE=<folder>: a Chromium trace of each run (open in DevTools' Performance panel).
    if (process.env.BENCH_LCP_TRACE) await browser.startTracing(page, { path: `${process.env.BENCH_LCP_TRACE}/lcp-run-${i + 1}.json`, screenshots: true });
    const navStart = Date.now();
    await page.goto(link, { waitUntil: 'load', timeout: 120_000 });
    await page.locator('main h1').first().waitFor({ timeout: 120_000 });
    // Until React has run (the page's buttons answer), then a little longer for a late paint.
    await page.waitForFunction(() => Object.keys(document.querySelector('main h1') ?? {}).some((k) => k.startsWith('__react')), null, { timeout: 120_000 });
    await page.waitForTimeout(1500);
    const m = await page.evaluate(() => ({
      lcp: window.__lcp,
      shown: window.__shown ?? 0,
      nav: performance.getEntriesByType('navigation')[0]?.responseEnd ?? 0,
      kept: document.querySelector('main h1')?.__first === true,
      inHtml: document.getElementById('wingstage-decide-data') !== null,
      candidates: window.__candidates ?? [],
      fonts: performance.getEntriesByType('resource').filter((r) => /\.woff2?$/.test(r.name)).map((r) => (r.responseEnd / 1000).toFixed(2)),
    }));
    if (process.env.BENCH_LCP_TRACE) await browser.stopTracing();
    if (process.env.BENCH_LCP_VERBOSE) console.log(`  largest-paint candidates: ${m.candidates.join(', ')}; fonts arrived at ${m.fonts.join(', ') || 'none'} s`);
    // Seconds between asking for the decision data and the last script arriving: positive means the
    // data was asked for while the scripts were still on their way.
    const ahead = lastScriptDone && dataAsked ? lastScriptDone - dataAsked : 0;
    runs.push({ lcp: m.lcp.time, lcpElement: m.lcp.what, shown: m.shown, htmlDone: m.nav, jsBytes, scripts, dataInHtml: m.inHtml, markupKept: m.kept, problems, dataAskedAheadOfScripts: ahead, wall: Date.now() - navStart });
    const data = m.inHtml && !dataAsked ? 'data in the HTML' : `data asked ${ahead >= 0 ? `${ahead.toFixed(2)} s before` : `${(-ahead).toFixed(2)} s after`} the last script arrived`;
    console.log(
      `run ${i + 1}: LCP ${(m.lcp.time / 1000).toFixed(2)} s (${m.lcp.what}), letter on screen ${(m.shown / 1000).toFixed(2)} s, HTML done ${(m.nav / 1000).toFixed(2)} s, ` +
        `${scripts} scripts, ${jsBytes} B of JavaScript transferred, ${data}, ${m.kept ? "React took over the server's markup" : 'the page was drawn by the scripts'}` +
        `${problems.length ? `; console errors: ${problems.join(' | ')}` : ''}`,
    );
    await context.close();
  }
} finally {
  await browser.close();
}
console.log(`\nmedian of ${RUNS}: LCP ${(median(runs.map((r) => r.lcp)) / 1000).toFixed(2)} s (goal ≤ 1.5 s), letter on screen ${(median(runs.map((r) => r.shown)) / 1000).toFixed(2)} s, JavaScript ${median(runs.map((r) => r.jsBytes))} B transferred in ${median(runs.map((r) => r.scripts))} files`);

// npm run bench:api drives this (docker-free-scripts/bench-api.sh starts both servers first).
// Each read of the issue's table against the app and against the bare baseline, autocannon at 32
// connections, alternating baseline/app for BENCH_ROUNDS rounds of BENCH_SECONDS each; then every
// list's first page with a filter, one user, one request at a time, for its p95. Prints ratios of
// the baseline (absolute numbers on a shared machine mean little) and writes the raw numbers as JSON.
import { mkdirSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import pg from 'pg';

const APP = process.env.BENCH_APP_URL;
const BASE = process.env.BENCH_BASELINE_URL;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 2);
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 32);
const LIST_SAMPLES = Number(process.env.BENCH_LIST_SAMPLES ?? 100);
const OUT = process.env.BENCH_OUT_DIR;
// BENCH_ONLY=lists skips the throughput reads (and needs no baseline): the lists' p95 alone.
const ONLY_LISTS = process.env.BENCH_ONLY === 'lists';
if (!APP || (!BASE && !ONLY_LISTS)) throw new Error('BENCH_APP_URL and BENCH_BASELINE_URL are required.');

// What a browser sends: it takes compressed answers.
const BROWSER = { 'accept-encoding': 'gzip, deflate, br', accept: 'application/json' };

async function signIn(email, password) {
  const res = await fetch(`${APP}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  if (!res.ok) throw new Error(`sign-in as ${email} failed: ${res.status} ${await res.text()}`);
  return res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
}

async function getJson(url, cookie) {
  const res = await fetch(url, { headers: { cookie, accept: 'application/json' } });
  if (!res.ok) throw new Error(`GET ${url}: ${res.status} ${await res.text()}`);
  return res.json();
}

function cannon(url, headers) {
  return new Promise((resolve, reject) => {
    autocannon({ url, connections: CONNECTIONS, duration: SECONDS, headers }, (err, r) => {
      if (err) return reject(err);
      resolve({ rps: r.requests.average, p975: r.latency.p97_5, p50: r.latency.p50, non2xx: r.non2xx, errors: r.errors + r.timeouts, bytesPerReq: r.requests.total ? Math.round(r.throughput.total / r.requests.total) : 0 });
    });
  });
}

const median = (xs) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

async function p95Of(url, cookie) {
  for (let i = 0; i < 5; i += 1) await fetch(url, { headers: { cookie, ...BROWSER } }).then((r) => r.arrayBuffer());
  const times = [];
  let total = null;
  for (let i = 0; i < LIST_SAMPLES; i += 1) {
    const t = process.hrtime.bigint();
    const res = await fetch(url, { headers: { cookie, ...BROWSER } });
    const body = await res.json();
    times.push(Number(process.hrtime.bigint() - t) / 1e6);
    if (!res.ok) throw new Error(`GET ${url}: ${res.status} ${JSON.stringify(body)}`);
    total = body.total ?? body.received?.total ?? body.rows?.length ?? (Array.isArray(body) ? body.length : null);
  }
  const s = times.sort((a, b) => a - b);
  return { p50: s[Math.floor(s.length * 0.5)], p95: s[Math.ceil(s.length * 0.95) - 1], total };
}

const cookie = await signIn('manager@brackenfold.example', 'wingstage-demo');
const big = (await getJson(`${APP}/api/jobs?q=J-10001&pageSize=1`, cookie)).items[0];
const other = (await getJson(`${APP}/api/jobs?q=J-15000&pageSize=1`, cookie)).items[0];
if (!big || !other) throw new Error('The scale data set is missing (J-10001, J-15000): run npm run seed:scale.');
const lineCount = (await getJson(`${APP}/api/jobs/${big.id}/estimate`, cookie)).lines.length;
const aircraftId = other.aircraftId;

const reads = [
  { name: 'GET /api/jobs/:id (manager)', url: `${APP}/api/jobs/${other.id}` },
  { name: `GET /api/jobs/:id/estimate, ${lineCount} lines`, url: `${APP}/api/jobs/${big.id}/estimate` },
  { name: 'GET /api/auth/session', url: `${APP}/api/auth/session` },
  { name: 'GET /api/health', url: `${APP}/api/health`, anonymous: true },
];
const baseUrl = `${BASE}/row/${other.id}`;

const load = os.loadavg().map((l) => l.toFixed(2)).join(' ');
console.log(`\nWingstage API benchmark: ${CONNECTIONS} connections, ${SECONDS} s a run, ${ROUNDS} round(s) alternating baseline/app; load average at start ${load}\n`);
const results = [];
for (const read of ONLY_LISTS ? [] : reads) {
  const base = [];
  const app = [];
  for (let r = 0; r < ROUNDS; r += 1) {
    base.push(await cannon(baseUrl, BROWSER));
    app.push(await cannon(read.url, read.anonymous ? BROWSER : { ...BROWSER, cookie }));
  }
  const row = {
    read: read.name,
    app: { rps: median(app.map((x) => x.rps)), p975: median(app.map((x) => x.p975)), bytesPerReq: app[0].bytesPerReq, non2xx: app.reduce((s, x) => s + x.non2xx + x.errors, 0) },
    baseline: { rps: median(base.map((x) => x.rps)), p975: median(base.map((x) => x.p975)), non2xx: base.reduce((s, x) => s + x.non2xx + x.errors, 0) },
    runs: { app, base },
  };
  row.throughputRatio = row.app.rps / row.baseline.rps;
  row.tailRatio = row.app.p975 / Math.max(row.baseline.p975, 1);
  results.push(row);
  console.log(
    `${row.read.padEnd(40)} throughput ${(row.throughputRatio * 100).toFixed(0).padStart(3)}% of baseline, p97.5 ${row.tailRatio.toFixed(1)}× baseline` +
      `   (app ${row.app.rps.toFixed(0)} req/s p97.5 ${row.app.p975} ms, ${row.app.bytesPerReq} B/answer; baseline ${row.baseline.rps.toFixed(0)} req/s p97.5 ${row.baseline.p975} ms)` +
      (row.app.non2xx || row.baseline.non2xx ? `  ! ${row.app.non2xx} app / ${row.baseline.non2xx} baseline answers were errors` : ''),
  );
}

// Lists: the first page with a filter, as one person clicking would see it.
const lists = [
  { name: 'jobs, state in work', url: `${APP}/api/jobs?state=in_work&page=1&pageSize=20` },
  { name: 'jobs, search "gearbox"', url: `${APP}/api/jobs?q=gearbox&page=1&pageSize=20` },
  { name: 'jobs, sorted by due date, awaiting owner', url: `${APP}/api/jobs?state=awaiting_owner&sort=dueOn&dir=desc&page=1&pageSize=20` },
  { name: 'jobs of one aircraft', url: `${APP}/api/jobs?aircraftId=${aircraftId}&page=1&pageSize=20` },
  { name: 'owners, search "owner 04"', url: `${APP}/api/customers?q=owner%2004&page=1&pageSize=20` },
  { name: 'aircraft, search "Q-ZB"', url: `${APP}/api/aircraft?q=Q-ZB&page=1&pageSize=20` },
  { name: "a job's findings (waiting and decided)", url: `${APP}/api/jobs/${other.id}/findings` },
  // The money lists (100,000 payments, ~2,900 invoices, 2,000 deposits): accounts' first views.
  { name: 'ledger, newest first (all 103k rows)', url: `${APP}/api/accounts/ledger?page=1&pageSize=50` },
  { name: 'ledger, one month, card balances', url: `${APP}/api/accounts/ledger?from=2024-03-01&to=2024-03-31&kind=balance&page=1&pageSize=50` },
  { name: 'ledger, page 500 by gross', url: `${APP}/api/accounts/ledger?sort=gross&dir=desc&page=500&pageSize=20` },
  { name: 'ledger, job-number search "J-1042"', url: `${APP}/api/accounts/ledger?q=J-1042&page=1&pageSize=50` },
  { name: 'invoices, issued (still owed)', url: `${APP}/api/invoices?state=issued&page=1&pageSize=20` },
  { name: 'invoices, search "Scale owner 04"', url: `${APP}/api/invoices?q=Scale%20owner%2004&page=1&pageSize=20` },
  { name: 'credit notes, one quarter', url: `${APP}/api/credit-notes?from=2024-04-01&to=2024-06-30&page=1&pageSize=20` },
  { name: 'deposits waiting, oldest first', url: `${APP}/api/deposits/waiting?page=1&pageSize=20` },
  { name: "accounts' deposits page", url: `${APP}/api/deposits/accounts` },
  { name: 'aged debt (every owner owing)', url: `${APP}/api/accounts/aged-debt` },
];
console.log(`\nLists on the scale set, one user, ${LIST_SAMPLES} requests each (goal: p95 ≤ 100 ms)\n`);
const listResults = [];
for (const l of lists) {
  const r = await p95Of(l.url, cookie);
  listResults.push({ list: l.name, ...r });
  console.log(`${l.name.padEnd(44)} p95 ${r.p95.toFixed(1).padStart(6)} ms   p50 ${r.p50.toFixed(1).padStart(6)} ms   ${r.total == null ? '' : `(${r.total} rows match)`}`);
}
// The estimate's first read after a write, beside the read after it: one user, one request at a
// time. The write is an update of the estimate's row (its revision moves, migration 0200), so the
// answer kept from before no longer matches and the first read reads, prices and compresses again.
const AFTER_WRITE_SAMPLES = Number(process.env.BENCH_AFTER_WRITE_SAMPLES ?? 40);
let afterWrite = null;
if (process.env.DATABASE_URL && !ONLY_LISTS) {
  const db = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await db.connect();
  const url = `${APP}/api/jobs/${big.id}/estimate`;
  const timed = async () => {
    const t = process.hrtime.bigint();
    const res = await fetch(url, { headers: { cookie, ...BROWSER } });
    await res.arrayBuffer();
    if (!res.ok) throw new Error(`GET ${url}: ${res.status}`);
    return Number(process.hrtime.bigint() - t) / 1e6;
  };
  const first = [];
  const next = [];
  for (let i = 0; i < AFTER_WRITE_SAMPLES; i += 1) {
    await db.query('UPDATE estimates SET updated_at = updated_at WHERE job_id = $1', [big.id]);
    first.push(await timed());
    next.push(await timed());
  }
  await db.end();
  const pct = (xs, p) => [...xs].sort((a, b) => a - b)[Math.ceil(xs.length * p) - 1];
  afterWrite = { samples: AFTER_WRITE_SAMPLES, first: { p50: pct(first, 0.5), p95: pct(first, 0.95) }, next: { p50: pct(next, 0.5), p95: pct(next, 0.95) } };
  console.log(
    `\nEstimate (${lineCount} lines), one user, ${AFTER_WRITE_SAMPLES} writes: first read after a write p50 ${afterWrite.first.p50.toFixed(1)} ms p95 ${afterWrite.first.p95.toFixed(1)} ms;` +
      ` the read after it p50 ${afterWrite.next.p50.toFixed(1)} ms p95 ${afterWrite.next.p95.toFixed(1)} ms`,
  );
}

console.log(`\nload average at end ${os.loadavg().map((l) => l.toFixed(2)).join(' ')} on ${os.cpus().length} cores`);

if (OUT) {
  mkdirSync(OUT, { recursive: true });
  const file = path.join(OUT, `api-${new Date().toISOString().replace(/[:.]/g, '-')}.json`);
  writeFileSync(file, JSON.stringify({ at: new Date().toISOString(), load, settings: { SECONDS, ROUNDS, CONNECTIONS, LIST_SAMPLES }, results, lists: listResults, afterWrite }, null, 2));
  console.log(`raw numbers: ${file}`);
}

import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { PASSWORD, makeWorkshop, startTestServer, uniq, type TestServer, type WorkshopFixture } from '../test/helpers.js';
import { fuzzRoutes, fuzzWorld } from '../test/support/http-fuzz.js';

/**
 * The long probes behind the reliability figures (not part of `npm test`): thousands of fuzzed
 * writes, sign-in bursts on one account, and a signed-in read timed during a burst of sign-ins.
 * Run with the test PostgreSQL and maildev up: `npm run probe -w server` (see README).
 */
const FUZZ_PER_ROUTE = Number(process.env.PROBE_FUZZ_PER_ROUTE ?? 170);

let server: TestServer;
let w: WorkshopFixture;
let base: string;
let close: () => Promise<void>;

beforeAll(async () => {
  server = await startTestServer({ MAIL_WORKER: 'false' });
  w = await makeWorkshop('Probe');
  const http = server.app.listen(0, '127.0.0.1');
  await new Promise((r) => http.once('listening', r));
  base = `http://127.0.0.1:${(http.address() as AddressInfo).port}`;
  close = async () => {
    http.closeAllConnections();
    await new Promise((r) => http.close(r));
  };
});
afterAll(async () => {
  await close?.();
  await server?.close();
});

const signInAt = async (email: string, password: string) => {
  const r = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  await r.arrayBuffer();
  return r;
};

it('probe: fuzzed writes over HTTP', async () => {
  const world = await fuzzWorld(server.app);
  const started = Date.now();
  const tally = await fuzzRoutes(server.app, world, FUZZ_PER_ROUTE, 20261202);
  console.log(
    `[probe] fuzz: ${tally.sent} requests over ${world.routes.length} write routes in ${Math.round((Date.now() - started) / 1000)} s; ` +
      `5xx: ${tally.serverErrors.length}; refused-but-written: ${tally.writesOnRefusal.length}; by status: ${JSON.stringify(tally.byStatus)}`,
  );
  for (const e of tally.serverErrors.slice(0, 5)) console.log('[probe] 5xx', JSON.stringify(e).slice(0, 500));
  expect(tally.serverErrors).toEqual([]);
}, 3_600_000);

for (const n of [30, 90]) {
  it(`probe: ${n} parallel wrong passwords on one account`, async () => {
    const s = await makeWorkshop(`Burst ${n}`);
    const before = server.parts.passwords.checked;
    const res = await Promise.all(Array.from({ length: n }, (_, i) => signInAt(s.users.accounts.email, `wrong-${i}`)));
    const by: Record<number, number> = {};
    for (const r of res) by[r.status] = (by[r.status] ?? 0) + 1;
    console.log(`[probe] ${n}-way burst on one account: passwords checked ${server.parts.passwords.checked - before}; answers ${JSON.stringify(by)}`);
  }, 600_000);
}

for (const n of [40, 60, 90]) {
  it(`probe: signed-in read during ${n} sign-ins with unknown e-mails`, async () => {
    const login = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: w.users.manager.email, password: PASSWORD }) });
    const cookie = login.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const time = async () => {
      const t = performance.now();
      const r = await fetch(`${base}/api/jobs`, { headers: { cookie } });
      await r.arrayBuffer();
      return { ms: performance.now() - t, status: r.status };
    };
    const quiet = await time();
    const burst = Promise.all(Array.from({ length: n }, (_, i) => signInAt(`stranger-${i}-${uniq()}@test.example`, 'a-guessed-password')));
    await new Promise((r) => setTimeout(r, 150));
    const during = [];
    for (let i = 0; i < 5; i += 1) during.push(await time());
    const res = await burst;
    const by: Record<number, number> = {};
    for (const r of res) by[r.status] = (by[r.status] ?? 0) + 1;
    console.log(
      `[probe] ${n} sign-ins: signed-in read ${Math.round(quiet.ms)} ms before, during ${during.map((d) => `${Math.round(d.ms)} ms/${d.status}`).join(', ')}; sign-in answers ${JSON.stringify(by)}`,
    );
  }, 600_000);
}

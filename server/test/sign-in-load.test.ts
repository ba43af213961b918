import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Sequelize } from 'sequelize';
import { createApp } from '../src/app.js';
import { User } from '../src/models/index.js';
import { PasswordHasher } from '../src/lib/passwords.js';
import { createSequelize } from '../src/db/sequelize.js';
import { PASSWORD, limitNamespace, makeWorkshop, startTestServer, testConfig, uniq, type TestServer, type WorkshopFixture } from './helpers.js';

/**
 * Sign-in under a burst, over real HTTP on a listening socket: the per-account limit holds when the
 * attempts arrive all at once, bcrypt never runs on the thread that answers requests, and the
 * limits are counted in PostgreSQL so that two app processes count together.
 */
let server: TestServer;
let w: WorkshopFixture;
let http: Server;
let base: string;

async function listen(app: ReturnType<typeof createApp>): Promise<{ http: Server; base: string }> {
  const h = app.listen(0, '127.0.0.1');
  await new Promise((r) => h.once('listening', r));
  return { http: h, base: `http://127.0.0.1:${(h.address() as AddressInfo).port}` };
}

async function close(h: Server): Promise<void> {
  h.closeAllConnections();
  await new Promise((r) => h.close(r));
}

interface Answer {
  status: number;
  body: { error?: { code: string; message: string } };
  retryAfter: string | null;
  cookie: string | null;
}

async function signInAt(at: string, email: string, password: string): Promise<Answer> {
  const r = await fetch(`${at}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  return { status: r.status, body: (await r.json()) as Answer['body'], retryAfter: r.headers.get('retry-after'), cookie: r.headers.get('set-cookie') };
}

const count = (answers: Answer[], status: number) => answers.filter((a) => a.status === status).length;

beforeAll(async () => {
  server = await startTestServer();
  w = await makeWorkshop('Sign-in load');
  ({ http, base } = await listen(server.app));
});
afterAll(async () => {
  if (http) await close(http);
  await server?.close();
});

describe('the per-account limit under a burst', () => {
  it('when 30 wrong passwords for one account arrive at once, then at most 10 are checked and the rest get 429 with Retry-After', async () => {
    // A server whose password queue holds the whole burst, so what answers is the account limit, not
    // the pool turning an overflow away with 503 (the busy test below covers that).
    const pool = new PasswordHasher({ threads: 1, queue: 64 });
    const app = createApp({ ...server.parts, passwords: pool, config: { ...server.parts.config, RATE_LIMIT_NAMESPACE: limitNamespace() } });
    const listening = await listen(app);
    try {
      await burstOnOneAccount(pool, listening.base);
    } finally {
      await close(listening.http);
      await pool.close();
    }
  });

  async function burstOnOneAccount(pool: PasswordHasher, base: string) {
    const email = w.owners[0].user.email;
    const before = pool.checked;
    const answers = await Promise.all(Array.from({ length: 30 }, (_, i) => signInAt(base, email, `not-the-password-${i}`)));
    const checked = pool.checked - before;
    expect(checked).toBeLessThanOrEqual(10);
    expect(count(answers, 401)).toBe(checked);
    expect(count(answers, 429)).toBe(30 - checked);
    expect(count(answers, 401) + count(answers, 429)).toBe(30);
    const refused = answers.find((a) => a.status === 429)!;
    expect(refused.body.error!.code).toBe('too_many_requests');
    expect(Number(refused.retryAfter)).toBeGreaterThan(0);
    // The right password is refused too until the window passes: the guesses used the allowance.
    expect((await signInAt(base, email, PASSWORD)).status).toBe(429);
  }

  it('when a sign-in has been switched off, then its right password gets exactly the answer a wrong one gets', async () => {
    const s = await makeWorkshop('Switched off');
    await User.update({ active: false }, { where: { id: s.users.engineer.id } });
    const right = await signInAt(base, s.users.engineer.email, PASSWORD);
    const wrong = await signInAt(base, s.users.accounts.email, 'not-the-password');
    const unknown = await signInAt(base, `nobody-${uniq()}@test.example`, PASSWORD);
    for (const a of [right, wrong, unknown]) {
      expect(a.status).toBe(401);
      expect(a.cookie).toBeNull();
      expect({ code: a.body.error!.code, message: a.body.error!.message }).toEqual({ code: 'unauthenticated', message: 'The e-mail or password is not right.' });
    }
  });
});

describe('password checks off the request thread', () => {
  it('when 60 sign-ins run at once, then a signed-in read still answers within 1 s and the overflow is told to retry, never a 500', async () => {
    const manager = await signInAt(base, w.users.manager.email, PASSWORD);
    expect(manager.status).toBe(200);
    const cookie = manager.cookie!.split(/,(?=\s*ws_)/).map((c) => c.split(';')[0]!.trim()).join('; ');

    const quiet = performance.now();
    expect((await fetch(`${base}/api/jobs`, { headers: { cookie } })).status).toBe(200);
    const tookQuiet = performance.now() - quiet;

    const burst = Promise.all(Array.from({ length: 60 }, (_, i) => signInAt(base, `stranger-${i}-${uniq()}@test.example`, 'a-guessed-password')));
    // Let the burst reach the server and fill the password pool first.
    await new Promise((r) => setTimeout(r, 150));
    const started = performance.now();
    const read = await fetch(`${base}/api/jobs`, { headers: { cookie } });
    const took = performance.now() - started;
    expect(read.status).toBe(200);
    const answers = await burst;

    // 1 s, as long as the machine answers the read in a quarter of that when quiet; a machine
    // shared with other heavy work gets four times its own quiet time instead. Before the pool,
    // 40 sign-ins made this read take 15 s.
    const bound = Math.max(1000, 4 * tookQuiet);
    expect(took, `the same read took ${Math.round(tookQuiet)} ms before the burst`).toBeLessThan(bound);
    expect(answers.every((a) => a.status === 401 || a.status === 503)).toBe(true);
    const busy = answers.filter((a) => a.status === 503);
    // A bounded queue: the pool does not hold 60 passwords, it turns the overflow away at once.
    expect(busy.length).toBeGreaterThan(0);
    expect(busy[0]!.body.error!.code).toBe('unavailable');
    expect(Number(busy[0]!.retryAfter)).toBeGreaterThan(0);
  });
});

describe('two app processes on one database', () => {
  let stores: Sequelize[] = [];
  let first: { http: Server; base: string };
  let other: { http: Server; base: string };

  /**
   * Two apps as two processes behind a load balancer would run them: each built by createApp with
   * its own rate-limit objects over its own connection pool, sharing only the database and the
   * deployment's namespace. (Models bind to one connection per process, so the rest of the work
   * goes through the test server's.)
   */
  async function twoApps(overrides: Record<string, string>) {
    const config = testConfig({ RATE_LIMIT_NAMESPACE: limitNamespace(), ...overrides });
    const own = () => {
      const s = createSequelize(config.DATABASE_URL, undefined, 2);
      stores.push(s);
      return s;
    };
    return Promise.all([listen(createApp({ ...server.parts, config, sequelize: own() })), listen(createApp({ ...server.parts, config, sequelize: own() }))]);
  }

  afterAll(async () => {
    for (const h of [first, other]) if (h) await close(h.http);
    for (const s of stores) await s.close();
    stores = [];
  });

  it('when wrong passwords for one account alternate between the two, then they share one limit', async () => {
    [first, other] = await twoApps({ SIGNIN_ACCOUNT_LIMIT: '3' });
    const email = w.owners[1].user.email;
    const answers: Answer[] = [];
    for (let i = 0; i < 6; i += 1) answers.push(await signInAt(i % 2 === 0 ? first.base : other.base, email, `wrong-${i}`));
    expect(answers.map((a) => a.status)).toEqual([401, 401, 401, 429, 429, 429]);
    // Refused on both, whichever one the next request reaches.
    expect((await signInAt(first.base, email, PASSWORD)).status).toBe(429);
    expect((await signInAt(other.base, email, PASSWORD)).status).toBe(429);
  });

  it('when unknown decision links are tried through both, then they share one per-address limit', async () => {
    const [a, b] = await twoApps({ DECIDE_ADDRESS_LIMIT: '4' });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 6; i += 1) statuses.push((await fetch(`${i % 2 === 0 ? a.base : b.base}/api/decide/${uniq()}${'B'.repeat(40)}`)).status);
      expect(statuses).toEqual([404, 404, 404, 404, 429, 429]);
    } finally {
      await close(a.http);
      await close(b.http);
    }
  });

  it('when sign-ins from one address alternate between the two, then they share one per-address limit', async () => {
    const [a, b] = await twoApps({ SIGNIN_ADDRESS_LIMIT: '3' });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 5; i += 1) statuses.push((await signInAt(i % 2 === 0 ? a.base : b.base, `someone-${i}-${uniq()}@test.example`, 'a-guessed-password')).status);
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
    } finally {
      await close(a.http);
      await close(b.http);
    }
  });
});

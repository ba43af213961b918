import { spawn, type ChildProcess } from 'node:child_process';
import { rmSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import bcrypt from 'bcryptjs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { PASSWORD, limitNamespace, makeWorkshop, startTestServer, tempStorageDir, uniq, type TestServer, type WorkshopFixture } from './helpers.js';

/**
 * Two separate OS processes of the real server (src/index.ts, the file npm start runs), on one
 * database and different ports, as two app processes behind a load balancer would run. Nothing is
 * shared between them but PostgreSQL: the sign-in limits must be counted there, not in either
 * process's memory. The test's own in-process server only makes the workshop and its sign-ins.
 */
const serverDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const ACCOUNT_LIMIT = 3;
const DECIDE_LIMIT = 4;

let fixtures: TestServer;
let w: WorkshopFixture;
const children: ChildProcess[] = [];
const dirs: string[] = [];
let bases: [string, string];

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number };
      s.close(() => resolve(port));
    });
  });
}

/** One app process, started as npm start starts it (tsx's loader, src/index.ts), answering /api/health. */
async function startProcess(env: Record<string, string>): Promise<string> {
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', 'src/index.ts'], {
    cwd: serverDir,
    env: { ...process.env, ...env, PORT: String(port), HOST: '127.0.0.1' },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  children.push(child);
  let stderr = '';
  child.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
  const base = `http://127.0.0.1:${port}`;
  // Each process compiles the TypeScript on start (tsx), a few seconds on a quiet machine.
  const until = Date.now() + 50_000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`The app process ended (${child.exitCode}): ${stderr}`);
    const ok = await fetch(`${base}/api/health`).then((r) => r.ok, () => false);
    if (ok) return base;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`The app process on ${base} did not answer in time: ${stderr}`);
}

async function stopProcess(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const ended = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  const timer = setTimeout(() => child.kill('SIGKILL'), 8_000);
  await ended;
  clearTimeout(timer);
}

const ownDir = () => {
  const d = tempStorageDir();
  dirs.push(d);
  return d;
};

async function signIn(base: string, email: string, password: string): Promise<number> {
  const r = await fetch(`${base}/api/auth/sign-in`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  await r.arrayBuffer();
  return r.status;
}

beforeAll(async () => {
  // Both processes: the same database and deployment namespace, each its own port, mail queue name
  // and photo folder (as two hosts would have their own disks; S3 is what they would share).
  const env = {
    NODE_ENV: 'test',
    DATABASE_URL: inject('databaseUrl'),
    JWT_SECRET: 'two-processes-secret-that-is-long-enough-0123',
    APP_URL: 'http://127.0.0.1:3100',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: process.env.SMTP_PORT ?? '1026',
    LOG_LEVEL: 'silent',
    COOKIE_SECURE: 'false',
    SIGNIN_ACCOUNT_LIMIT: String(ACCOUNT_LIMIT),
    SIGNIN_ADDRESS_LIMIT: '10000',
    DECIDE_ADDRESS_LIMIT: String(DECIDE_LIMIT),
    APPROVAL_CHASER: 'false',
    PASSWORD_THREADS: '1',
    CLIENT_DIST: '/nonexistent-client-dist',
    RATE_LIMIT_NAMESPACE: limitNamespace(),
    MAIL_QUEUE: `mail-${uniq()}`,
    STRIPE_SECRET_KEY: 'sk_test_wingstage_api_tests',
    STRIPE_WEBHOOK_SECRET: 'whsec_wingstage_api_tests',
    STRIPE_API_URL: 'http://127.0.0.1:9',
  };
  // The workshop is made while the two processes start.
  const made = (async () => {
    fixtures = await startTestServer();
    w = await makeWorkshop('Two processes');
    // The test counts attempts, not hashing: the two owners' passwords get a cheap bcrypt hash, so a
    // wrong password costs milliseconds instead of a quarter second of a busy machine's CPU.
    const cheap = bcrypt.hashSync(PASSWORD, 4);
    for (const o of w.owners) await o.user.update({ passwordHash: cheap });
  })();
  const [a, b] = await Promise.all([startProcess({ ...env, STORAGE_DIR: ownDir() }), startProcess({ ...env, STORAGE_DIR: ownDir() }), made]);
  bases = [a, b];
}, 60_000);

afterAll(async () => {
  await Promise.all(children.map(stopProcess));
  await fixtures?.close();
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

describe('two app processes on one database', () => {
  it('when wrong passwords for one account alternate between the two processes, then the limit is reached at the configured total and both refuse', async () => {
    const email = w.owners[0].user.email;
    const statuses: number[] = [];
    for (let i = 0; i < ACCOUNT_LIMIT + 2; i += 1) statuses.push(await signIn(bases[i % 2]!, email, `wrong-${i}`));
    // Counted per process, each would allow ACCOUNT_LIMIT: 10 wrong passwords before any 429.
    expect(statuses).toEqual([...Array(ACCOUNT_LIMIT).fill(401), 429, 429]);
    // Even the right password is refused now, by either process.
    expect(await signIn(bases[0], email, PASSWORD)).toBe(429);
    expect(await signIn(bases[1], email, PASSWORD)).toBe(429);
  });

  it('when 20 wrong passwords for one account arrive at once, split across both processes, then exactly the limit is checked', async () => {
    const email = w.owners[1].user.email;
    const statuses = await Promise.all(Array.from({ length: 20 }, (_, i) => signIn(bases[i % 2]!, email, `burst-${i}`)));
    expect(statuses.filter((s) => s === 401)).toHaveLength(ACCOUNT_LIMIT);
    expect(statuses.filter((s) => s === 429)).toHaveLength(20 - ACCOUNT_LIMIT);
  });

  it('when unknown decision links are tried alternately through both processes, then the per-address limit is counted once across both', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < DECIDE_LIMIT + 2; i += 1) {
      const r = await fetch(`${bases[i % 2]!}/api/decide/${uniq()}${'B'.repeat(40)}`);
      await r.arrayBuffer();
      statuses.push(r.status);
    }
    expect(statuses).toEqual([...Array(DECIDE_LIMIT).fill(404), 429, 429]);
  });
});

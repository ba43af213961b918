import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Express } from 'express';
import request from 'supertest';
import { inject } from 'vitest';
import type { Role } from '@wingstage/shared';
import { createApp, type AppParts } from '../src/app.js';
import { loadConfig, type Config } from '../src/config/config.js';
import bcrypt from 'bcryptjs';
import { Aircraft, ApprovalRequest, Customer, Finding, Job, User, Workshop } from '../src/models/index.js';
import { startParts, stopParts } from '../src/runtime.js';

export const PASSWORD = 'runway-heading-270';
export const TEST_STRIPE_KEY = 'sk_test_wingstage_api_tests';
export const TEST_WEBHOOK_SECRET = 'whsec_wingstage_api_tests';
export const MAILDEV_API = process.env.MAILDEV_API_URL ?? 'http://127.0.0.1:1081';

export function testConfig(overrides: Record<string, string> = {}): Config {
  return loadConfig({
    NODE_ENV: 'test',
    DATABASE_URL: inject('databaseUrl'),
    JWT_SECRET: 'test-secret-that-is-long-enough-0123456789',
    APP_URL: 'http://127.0.0.1:3100',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: process.env.SMTP_PORT ?? '1026',
    LOG_LEVEL: 'silent',
    COOKIE_SECURE: 'false',
    SIGNIN_ADDRESS_LIMIT: '10000',
    DECIDE_ADDRESS_LIMIT: '10000',
    APPROVAL_CHASER: 'false',
    CLIENT_DIST: '/nonexistent-client-dist',
    // Tests that call the processor start the fake in-process and pass its URL as STRIPE_API_URL.
    STRIPE_SECRET_KEY: TEST_STRIPE_KEY,
    STRIPE_WEBHOOK_SECRET: TEST_WEBHOOK_SECRET,
    ...overrides,
  });
}

export interface TestServer {
  app: Express;
  parts: AppParts;
  /** Another app on the same database and queue with different settings. */
  variant(overrides: Record<string, string>): Express;
  close(): Promise<void>;
}

/** A photo folder of the test file's own, removed when its server closes. */
export function tempStorageDir(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), 'ws-photos-'));
}

/** Rate-limit counters of its own, so test files running side by side on one database do not share a count. */
export const limitNamespace = () => `test-${uniq()}`;

export async function startTestServer(overrides: Record<string, string> = {}): Promise<TestServer> {
  const ownDir = overrides.STORAGE_DIR ? null : tempStorageDir();
  // Its own mail queue: a test server that stops while its worker holds a message would otherwise
  // leave another test file's e-mail waiting minutes for pg-boss to expire the job.
  const all = { RATE_LIMIT_NAMESPACE: limitNamespace(), MAIL_QUEUE: `mail-${uniq()}`, ...(ownDir ? { STORAGE_DIR: ownDir } : {}), ...overrides };
  const parts = await startParts(testConfig(all));
  return {
    app: createApp(parts),
    parts,
    // A variant counts its own attempts unless it is given the server's namespace on purpose.
    variant: (o) => createApp({ ...parts, config: testConfig({ ...all, RATE_LIMIT_NAMESPACE: limitNamespace(), ...o }) }),
    close: async () => {
      await stopParts(parts);
      if (ownDir) fs.rmSync(ownDir, { recursive: true, force: true });
    },
  };
}

/** The bcrypt cost of the fixture users' hash (production's is BCRYPT_COST, proved in auth.test.ts). */
export const FIXTURE_BCRYPT_COST = 4;

let hashed: Promise<string> | null = null;
/**
 * One bcrypt hash shared by the rows a file creates, at a low cost: every sign-in checks it, and at
 * production's cost each check takes a quarter of a second of CPU (several seconds on a loaded
 * machine). Sign-in checks the hash at the cost the hash itself names, so the code path is the same.
 */
export function passwordHash(): Promise<string> {
  hashed ??= bcrypt.hash(PASSWORD, FIXTURE_BCRYPT_COST);
  return hashed;
}

export const uniq = () => randomBytes(4).toString('hex');

export interface OwnerFixture {
  customer: Customer;
  user: User;
  aircraft: Aircraft;
  job: Job;
}

export interface WorkshopFixture {
  workshop: Workshop;
  users: Record<Exclude<Role, 'owner'>, User>;
  owners: [OwnerFixture, OwnerFixture];
}

let jobSeq = 0;

export async function makeJob(workshopId: string, aircraftId: string, state: Job['state'] = 'booked_in'): Promise<Job> {
  jobSeq += 1;
  return Job.create({
    workshopId,
    aircraftId,
    number: `T-${uniq()}-${jobSeq}`,
    title: 'Annual permit inspection',
    type: 'annual_permit_inspection',
    state,
    bookedInOn: '2026-11-20',
    dueOn: null,
  });
}

/** A workshop with a user of every staff role and two owners, each with an aircraft and a job. */
export async function makeWorkshop(label = 'Test'): Promise<WorkshopFixture> {
  const hash = await passwordHash();
  const tag = uniq();
  const workshop = await Workshop.create({
    name: `${label} Workshop ${tag}`,
    vatRates: { standard: '20', reduced: '5', zero: '0' },
    labourRates: [{ code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' }],
  });
  const staff = async (role: Exclude<Role, 'owner'>) =>
    User.create({ workshopId: workshop.id, email: `${role}-${tag}@test.example`, name: `${role} ${tag}`, role, passwordHash: hash, customerId: null });
  const users = {
    admin: await staff('admin'),
    manager: await staff('manager'),
    engineer: await staff('engineer'),
    accounts: await staff('accounts'),
  };
  const owner = async (n: number): Promise<OwnerFixture> => {
    const customer = await Customer.create({ workshopId: workshop.id, name: `Owner ${n} ${tag}`, email: `owner${n}-${tag}@test.example` });
    const user = await User.create({ workshopId: workshop.id, email: `owner${n}-${tag}@test.example`, name: `Owner ${n}`, role: 'owner', passwordHash: hash, customerId: customer.id });
    const aircraft = await Aircraft.create({ workshopId: workshop.id, customerId: customer.id, registration: `Q-${tag.slice(0, 3).toUpperCase()}${n}`, type: 'Three-axis high-wing microlight', airframeHours: '100.5' });
    const job = await makeJob(workshop.id, aircraft.id);
    return { customer, user, aircraft, job };
  };
  return { workshop, users, owners: [await owner(1), await owner(2)] };
}

export interface Client {
  agent: ReturnType<typeof request.agent>;
  csrf: string;
  get(path: string): request.Test;
  post(path: string, body?: object): request.Test;
  patch(path: string, body?: object): request.Test;
  put(path: string, body?: object): request.Test;
}

export function clientFor(agent: ReturnType<typeof request.agent>, csrf: string): Client {
  return {
    agent,
    csrf,
    get: (p) => agent.get(p),
    post: (p, body) => agent.post(p).set('X-CSRF-Token', csrf).send(body ?? {}),
    patch: (p, body) => agent.patch(p).set('X-CSRF-Token', csrf).send(body ?? {}),
    put: (p, body) => agent.put(p).set('X-CSRF-Token', csrf).send(body ?? {}),
  };
}

export async function signIn(app: Express, email: string, password = PASSWORD): Promise<Client> {
  const agent = request.agent(app);
  const res = await agent.post('/api/auth/sign-in').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return clientFor(agent, res.body.csrfToken as string);
}

interface MaildevMail {
  id: string;
  subject: string;
  text: string;
  html?: string;
  to: { address: string }[];
  date?: string;
  time: string;
}

/**
 * Polls maildev for a message to `to` that passes `match`; other tests' mail is ignored. Test files
 * run in parallel and share one mail queue, so on a loaded machine a backlog may take a while.
 */
export async function waitForMail(to: string, match: (m: MaildevMail) => boolean = () => true, timeoutMs = 45_000): Promise<MaildevMail> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const res = await fetch(`${MAILDEV_API}/api/email`);
    const all = (await res.json()) as MaildevMail[];
    const hits = all.filter((m) => m.to.some((t) => t.address.toLowerCase() === to.toLowerCase()) && match(m));
    if (hits.length) return hits[hits.length - 1]!;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`no e-mail to ${to} within ${timeoutMs} ms`);
}

export async function mailsTo(to: string): Promise<MaildevMail[]> {
  const res = await fetch(`${MAILDEV_API}/api/email`);
  const all = (await res.json()) as MaildevMail[];
  return all.filter((m) => m.to.some((t) => t.address.toLowerCase() === to.toLowerCase()));
}

export function tokenFrom(mail: MaildevMail): string {
  const m = /token=([A-Za-z0-9_-]+)/.exec(mail.text);
  if (!m) throw new Error(`no token link in e-mail "${mail.subject}"`);
  return m[1]!;
}

/** A finding straight in the database, for states the API reaches only through the owner's decision. */
export async function makeFinding(job: Job, over: Partial<{ state: Finding['state']; category: Finding['category']; seq: number; title: string }> = {}): Promise<Finding> {
  const seq = over.seq ?? ((await Finding.max<number, Finding>('seq', { where: { jobId: job.id } })) ?? 0) + 1;
  return Finding.create({
    workshopId: job.workshopId,
    jobId: job.id,
    seq,
    title: over.title ?? `Finding ${seq}`,
    location: 'Engine bay',
    category: over.category ?? 'recommended',
    seen: 'Seen during the inspection.',
    checklistItemId: null,
    measuredValue: null,
    limit: null,
    state: over.state ?? 'draft',
    remedy: { description: '', hours: null, labourRateCode: null, parts: [], accessTask: null },
    raisedBy: null,
  });
}

export const sha256Hex = (t: string) => createHash('sha256').update(t).digest('hex');

/**
 * The token of a request's current decision link, read from the mail maildev received for `email`
 * (only the hash is stored, so the e-mail is the one place the token exists). Several tests mail one
 * owner; the hash picks the right one.
 */
export async function decideTokenFromMail(email: string, requestId: string, timeoutMs = 45_000): Promise<string> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    const r = await ApprovalRequest.findByPk(requestId);
    for (const m of await mailsTo(email)) {
      const tok = /\/decide\/([A-Za-z0-9_-]+)/.exec(m.text)?.[1];
      if (tok && sha256Hex(tok) === r?.tokenHash) return tok;
    }
    await new Promise((x) => setTimeout(x, 250));
  }
  throw new Error('the approval e-mail did not arrive');
}

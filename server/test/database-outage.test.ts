import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../src/app.js';
import { createSequelize } from '../src/db/sequelize.js';
import { migrateUp } from '../src/db/migrator.js';
import { Customer } from '../src/models/index.js';
import { startParts, stopParts } from '../src/runtime.js';
import type { AppParts } from '../src/app.js';
import { makeWorkshop, signIn, tempStorageDir, testConfig, type Client, type WorkshopFixture } from './helpers.js';

/**
 * PostgreSQL stopped under a running app, then started again. This file starts a PostgreSQL of its
 * own (in a temporary folder, on a free port), never the one the other tests share.
 */
const bin = ['17', '16', '15'].map((v) => `/usr/lib/postgresql/${v}/bin`).find((d) => fs.existsSync(path.join(d, 'pg_ctl')));
if (!bin) throw new Error('PostgreSQL server binaries were not found under /usr/lib/postgresql (npm test installs them).');
const root = process.getuid?.() === 0;
// initdb refuses to run as root; PostgreSQL's own user runs it then.
const asPostgres = (cmd: string, args: string[]) => execFileSync(root ? 'runuser' : cmd, root ? ['-u', 'postgres', '--', cmd, ...args] : args, { stdio: 'pipe' });

let dir: string;
let port: number;
let parts: AppParts | undefined;
let app: ReturnType<typeof createApp>;
let w: WorkshopFixture;
let manager: Client;

async function freePort(): Promise<number> {
  const s = net.createServer().listen(0, '127.0.0.1');
  await new Promise((r) => s.once('listening', r));
  const p = (s.address() as net.AddressInfo).port;
  await new Promise((r) => s.close(r));
  return p;
}

const pgCtl = (...args: string[]) => asPostgres(path.join(bin, 'pg_ctl'), ['-D', path.join(dir, 'data'), ...args]);
const startPg = () =>
  pgCtl('-l', path.join(dir, 'postgres.log'), '-w', '-t', '60', '-o', `-p ${port} -k ${path.join(dir, 'data')} -c listen_addresses=127.0.0.1 -c fsync=off`, 'start');
const stopPg = () => pgCtl('-m', 'fast', '-w', 'stop');

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'ws-pg-outage-'));
  if (root) execFileSync('chown', ['postgres', dir]);
  asPostgres(path.join(bin, 'initdb'), ['-D', path.join(dir, 'data'), '-A', 'trust', '-U', 'postgres', '-E', 'UTF8', '--locale=C.UTF-8']);
  port = await freePort();
  startPg();
  const admin = createSequelize(`postgres://postgres@127.0.0.1:${port}/postgres`, undefined, 1);
  await admin.query('CREATE DATABASE outage');
  await admin.close();
  const url = `postgres://postgres@127.0.0.1:${port}/outage`;
  const migrate = createSequelize(url, undefined, 1);
  await migrateUp(migrate);
  await migrate.close();
  parts = await startParts(testConfig({ DATABASE_URL: url, STORAGE_DIR: tempStorageDir(), MAIL_WORKER: 'false' }));
  app = createApp(parts);
  w = await makeWorkshop('Outage');
  manager = await signIn(app, w.users.manager.email);
});

afterAll(async () => {
  if (parts) await stopParts(parts).catch(() => undefined);
  try {
    stopPg();
  } catch {
    // Already stopped by a failed test.
  }
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe('the database going away and coming back', () => {
  it('when PostgreSQL stops, then requests get 503 with Retry-After and a plain message; when it starts again, the same requests succeed without restarting the app', async () => {
    expect((await manager.get('/api/jobs')).status).toBe(200);

    stopPg();
    const read = await manager.get('/api/jobs');
    expect(read.status).toBe(503);
    expect(read.body.error.code).toBe('unavailable');
    expect(read.body.error.message).toMatch(/cannot reach its database/);
    expect(Number(read.headers['retry-after'])).toBeGreaterThan(0);
    const name = `Written during the outage ${Date.now()}`;
    const write = await manager.post('/api/customers', { name, email: 'outage@test.example' });
    expect(write.status).toBe(503);
    const signInWhileDown = await request(app).post('/api/auth/sign-in').send({ email: w.users.engineer.email, password: 'whatever-it-is' });
    expect(signInWhileDown.status).toBe(503);
    const health = await request(app).get('/api/health');
    expect(health.status).toBe(503);

    startPg();
    const again = await manager.get('/api/jobs');
    expect(again.status).toBe(200);
    expect((await request(app).get('/api/health')).status).toBe(200);
    // The refused write left nothing behind; a new one goes through.
    expect(await Customer.count({ where: { name } })).toBe(0);
    expect((await manager.post('/api/customers', { name, email: 'outage@test.example' })).status).toBe(201);
  });
});

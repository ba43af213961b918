import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import express from 'express';
import helmet from 'helmet';
import { pino } from 'pino';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp, helmetOptions } from '../src/app.js';
import { Job } from '../src/models/index.js';
import { PASSWORD, makeWorkshop, startTestServer, type TestServer, type WorkshopFixture } from './helpers.js';

/*
 * What every hot read carries, after the per-request chain was made lighter: the security headers
 * helmet would set (same names, same order, same bytes), a request id, Cache-Control, compression
 * of bodies over 1 KB as the browser asks with Vary, and one access-log line per request with the
 * same fields.
 */

let server: TestServer;
let w: WorkshopFixture;
let dist: string;
let app: express.Express;
let cookie: string;
const lines: string[] = [];
const BROWSER = 'gzip, deflate, br';

/** Header name/value pairs in the order they were sent, names as written. */
function rawPairs(res: request.Response): [string, string][] {
  const raw = (res as unknown as { res: { rawHeaders: string[] } }).res.rawHeaders;
  const out: [string, string][] = [];
  for (let i = 0; i < raw.length; i += 2) out.push([raw[i]!, raw[i + 1]!]);
  return out;
}

beforeAll(async () => {
  server = await startTestServer();
  w = await makeWorkshop('Hot headers');
  dist = fs.mkdtempSync(path.join(os.tmpdir(), 'ws-dist-'));
  // A page with an inline script (its hash joins the policy) and a script file over the 1 KB threshold.
  fs.writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>shell</title><script>window.early = 1;</script>');
  fs.writeFileSync(path.join(dist, 'app.js'), `console.log(${JSON.stringify('wingstage '.repeat(400))});\n`);
  const logger = pino({ level: 'info', base: { app: 'wingstage' } }, { write: (l: string) => void lines.push(l) });
  const config = { ...server.parts.config, CLIENT_DIST: dist };
  app = createApp({ ...server.parts, config, logger });
  const signedIn = await request(app).post('/api/auth/sign-in').send({ email: w.users.manager.email, password: PASSWORD });
  expect(signedIn.status).toBe(200);
  cookie = (signedIn.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; ');
});
afterAll(async () => {
  await server?.close();
  if (dist) fs.rmSync(dist, { recursive: true, force: true });
});

/** What helmet itself sets on a response, with our settings, in its own order. */
async function helmetsOwn(): Promise<[string, string][]> {
  const bare = express();
  bare.disable('x-powered-by');
  bare.use(helmet(helmetOptions({ ...server.parts.config, CLIENT_DIST: dist })));
  bare.get('/', (_req, res) => void res.end());
  const res = await request(bare).get('/');
  const node = new Set(['date', 'connection', 'keep-alive', 'content-length', 'transfer-encoding']);
  return rawPairs(res).filter(([n]) => !node.has(n.toLowerCase()));
}

describe('the hot reads keep every header', () => {
  it('when the job, the session, health and a static file are read, then each carries exactly the security headers helmet sets, in its order, byte for byte', async () => {
    const expected = await helmetsOwn();
    // A check that the comparison holds something: the policy with the page's script hash, and the rest.
    const names = expected.map(([n]) => n);
    expect(names).toEqual([
      'Content-Security-Policy',
      'Cross-Origin-Opener-Policy',
      'Cross-Origin-Resource-Policy',
      'Origin-Agent-Cluster',
      'Referrer-Policy',
      'X-Content-Type-Options',
      'X-DNS-Prefetch-Control',
      'X-Download-Options',
      'X-Frame-Options',
      'X-Permitted-Cross-Domain-Policies',
      'X-XSS-Protection',
    ]);
    const csp = expected[0]![1];
    expect(csp).toMatch(/^default-src 'self';script-src 'self' 'sha256-[A-Za-z0-9+/=]+';style-src 'self' 'unsafe-inline';/);
    expect(csp).toContain("frame-ancestors 'none'");

    const job = w.owners[0].job;
    for (const url of [`/api/jobs/${job.id}`, '/api/auth/session', '/api/health', '/app.js', '/jobs/deep/link']) {
      const res = await request(app).get(url).set('Cookie', cookie).set('Accept-Encoding', BROWSER);
      expect(res.status, url).toBe(200);
      const pairs = rawPairs(res);
      // The request id first, then helmet's headers in helmet's order, as before.
      expect(pairs[0]![0], url).toBe('X-Request-Id');
      expect(pairs.slice(1, 1 + expected.length), url).toEqual(expected);
    }
  });

  it('when an API read is answered, then it has a request id (echoed when well formed), no-store, Vary and no ETag; a static file keeps its cache time and ETag', async () => {
    const job = w.owners[0].job;
    for (const url of [`/api/jobs/${job.id}`, '/api/auth/session', '/api/health']) {
      const res = await request(app).get(url).set('Cookie', cookie).set('Accept-Encoding', BROWSER);
      expect(res.headers['x-request-id'], url).toMatch(/^[0-9a-f-]{36}$/);
      expect(res.headers['cache-control'], url).toBe('no-store');
      expect(res.headers['vary'], url).toBe('Accept-Encoding');
      expect(res.headers['content-type'], url).toBe('application/json; charset=utf-8');
      // Under 1 KB: sent as it is.
      expect(res.headers['content-encoding'], url).toBeUndefined();
      // Every res.json answer is no-store, so no ETag is made for it.
      expect(res.headers['etag'], url).toBeUndefined();
      const echoed = await request(app).get(url).set('Cookie', cookie).set('X-Request-Id', 'trace-hot-read-0001');
      expect(echoed.headers['x-request-id'], url).toBe('trace-hot-read-0001');
    }
    const file = await request(app).get('/app.js').set('Accept-Encoding', BROWSER);
    expect(file.headers['cache-control']).toBe('public, max-age=3600');
    expect(file.headers['etag']).toMatch(/^W\/"/);
    expect(file.headers['vary']).toBe('Accept-Encoding');
    expect(file.headers['content-encoding']).toBe('br');
    const page = await request(app).get('/jobs/deep/link').set('Accept-Encoding', BROWSER);
    expect(page.headers['cache-control']).toBe('no-cache');
    expect(page.headers['etag']).toMatch(/^W\/"[0-9a-f]+-[0-9a-f]+"$/);
    const again = await request(app).get('/jobs/other/link').set('If-None-Match', page.headers['etag'] as string);
    expect(again.status).toBe(304);
  });

  it('when a job answer is over 1 KB, then it travels compressed as the client asks (br for a browser, gzip when only gzip is taken) and reads back the same', async () => {
    const job = w.owners[1].job;
    await Job.update({ notes: `Long notes. ${'Checked the aileron hinge pins and the cable runs. '.repeat(40)}` }, { where: { id: job.id } });
    const plain = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', cookie).set('Accept-Encoding', 'identity');
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(Number(plain.headers['content-length'])).toBeGreaterThan(1024);
    const br = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', cookie).set('Accept-Encoding', BROWSER);
    expect(br.headers['content-encoding']).toBe('br');
    expect(br.headers['vary']).toBe('Accept-Encoding');
    expect(br.body).toEqual(plain.body);
    const gz = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', cookie).set('Accept-Encoding', 'gzip');
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.body).toEqual(plain.body);
    expect(gz.body.notes).toContain('aileron hinge pins');
  });
});

describe('the access log', () => {
  it('when requests are answered, then each but health gets one line with the same fields, its id the response id', async () => {
    const job = w.owners[0].job;
    const urls = [`/api/jobs/${job.id}`, '/api/auth/session', '/api/health', '/app.js', `/api/jobs/${job.id}`];
    lines.length = 0;
    const ids: string[] = [];
    for (const url of urls) {
      const res = await request(app).get(url).set('Cookie', cookie);
      ids.push(res.headers['x-request-id'] as string);
    }
    const entries = lines.map((l) => JSON.parse(l) as Record<string, unknown>);
    // Health checks are not logged; every other request is, once.
    expect(entries).toHaveLength(4);
    const logged = urls.map((u, i) => ({ u, id: ids[i] })).filter(({ u }) => u !== '/api/health');
    entries.forEach((e, i) => {
      expect(Object.keys(e).sort()).toEqual(['app', 'level', 'msg', 'req', 'res', 'responseTime', 'time']);
      expect(e).toMatchObject({ level: 30, app: 'wingstage', msg: 'request completed', res: { statusCode: 200 } });
      expect(e.req).toEqual({ id: logged[i]!.id, method: 'GET', url: logged[i]!.u });
      expect(typeof e.responseTime).toBe('number');
    });
  });

  it('when a request fails as not found, then its line is a warning with the same fields', async () => {
    lines.length = 0;
    const res = await request(app).get('/api/no-such-route').set('X-Request-Id', 'trace-hot-read-0404');
    expect(res.status).toBe(404);
    expect(lines).toHaveLength(1);
    const e = JSON.parse(lines[0]!) as Record<string, unknown>;
    expect(e).toMatchObject({ level: 40, msg: 'request completed', req: { id: 'trace-hot-read-0404', method: 'GET', url: '/api/no-such-route' }, res: { statusCode: 404 } });
  });
});

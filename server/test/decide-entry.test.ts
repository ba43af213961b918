import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from './helpers.js';

let server: TestServer;
const withDecide = mkdtempSync(path.join(tmpdir(), 'ws-dist-'));
const withoutDecide = mkdtempSync(path.join(tmpdir(), 'ws-dist-'));

beforeAll(async () => {
  for (const dir of [withDecide, withoutDecide]) {
    mkdirSync(path.join(dir, 'assets'));
    writeFileSync(path.join(dir, 'index.html'), '<!doctype html><title>app shell</title>');
    writeFileSync(path.join(dir, 'assets', 'x.js'), 'console.log(1)');
  }
  writeFileSync(path.join(withDecide, 'decide.html'), '<!doctype html><title>decision page</title>');
  server = await startTestServer({ CLIENT_DIST: withDecide });
});
afterAll(async () => {
  await server?.close();
  rmSync(withDecide, { recursive: true, force: true });
  rmSync(withoutDecide, { recursive: true, force: true });
});

describe("the owner's decision page has its own entry", () => {
  it('when a decision link is opened, then decide.html is served, never cached stale; other pages get the app shell', async () => {
    const link = await request(server.app).get('/decide/AbCdEf0123456789_-xyz');
    expect(link.status).toBe(200);
    expect(link.type).toBe('text/html');
    expect(link.text).toContain('decision page');
    expect(link.headers['cache-control']).toBe('no-cache');
    expect((await request(server.app).get('/decide/AbCdEf0123456789_-xyz/')).text).toContain('decision page');
    for (const p of ['/', '/jobs', '/jobs/123', '/my-aircraft', '/decided']) {
      const res = await request(server.app).get(p);
      expect(res.status, p).toBe(200);
      expect(res.text, p).toContain('app shell');
    }
    expect((await request(server.app).get('/assets/x.js')).headers['cache-control']).toContain('immutable');
  });

  it('when the API path of a link is asked for, then it is still the API (JSON), not a page', async () => {
    const res = await request(server.app).get('/api/decide/not-a-real-token-0123456789');
    expect(res.status).toBe(404);
    expect(res.type).toBe('application/json');
  });

  it('when a build has no decide.html, then a decision link falls back to the app shell', async () => {
    const res = await request(server.variant({ CLIENT_DIST: withoutDecide })).get('/decide/AbCdEf0123456789_-xyz');
    expect(res.status).toBe(200);
    expect(res.text).toContain('app shell');
  });
});

import { createHash } from 'node:crypto';
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestServer, type TestServer } from './helpers.js';

let server: TestServer;
const EARLY = "window.early = fetch('/api/decide/x');";
const withDecide = mkdtempSync(path.join(tmpdir(), 'ws-dist-'));
const withoutDecide = mkdtempSync(path.join(tmpdir(), 'ws-dist-'));

beforeAll(async () => {
  for (const dir of [withDecide, withoutDecide]) {
    mkdirSync(path.join(dir, 'assets'));
    writeFileSync(path.join(dir, 'index.html'), '<!doctype html><title>app shell</title>');
    writeFileSync(path.join(dir, 'assets', 'x.js'), 'console.log(1)');
  }
  writeFileSync(path.join(withDecide, 'decide.html'), `<!doctype html><title>decision page</title><script>${EARLY}</script><script type="module" src="/assets/x.js"></script>`);
  writeFileSync(path.join(withDecide, 'assets', 'big.js'), `// ${'a long comment that compresses well '.repeat(200)}\nconsole.log(1)`);
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
    // It may carry the owner's letter (its first view is rendered on the server): never stored.
    expect(link.headers['cache-control']).toBe('no-store');
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

describe('what the decision page is served with', () => {
  it('when decide.html carries an inline script, then the Content-Security-Policy allows exactly that script by its SHA-256', async () => {
    const csp = (await request(server.app).get('/decide/AbCdEf0123456789_-xyz')).headers['content-security-policy'] as string;
    const scriptSrc = csp.split(';').find((d) => d.trim().startsWith('script-src'))!;
    const hash = createHash('sha256').update(EARLY, 'utf8').digest('base64');
    expect(scriptSrc).toContain(`'sha256-${hash}'`);
    expect(scriptSrc).not.toContain('unsafe-inline');
  });

  it('when a browser accepts gzip, then scripts and JSON come compressed; without it, plain', async () => {
    const gz = await request(server.app).get('/assets/big.js').set('Accept-Encoding', 'gzip');
    expect(gz.status).toBe(200);
    expect(gz.headers['content-encoding']).toBe('gzip');
    const plain = await request(server.app).get('/assets/big.js').set('Accept-Encoding', 'identity');
    expect(plain.headers['content-encoding']).toBeUndefined();
    const json = await request(server.app).get('/api/decide/not-a-real-token-0123456789').set('Accept-Encoding', 'gzip');
    // An error this small is not worth compressing; the threshold is 1 KB.
    expect(json.headers['content-encoding']).toBeUndefined();
    expect(json.type).toBe('application/json');
    // Only one of the two compressors (API, files) touches an answer: unzipped once, it is the file.
    expect(gz.text).toContain('console.log(1)');
  });
});

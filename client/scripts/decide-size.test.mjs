// @vitest-environment node
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { execFileSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DECIDE_JS_BUDGET, measure, scriptsOf } from './decide-size.mjs';

const clientDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const out = mkdtempSync(path.join(tmpdir(), 'ws-decide-size-'));

describe('the decision page bundle', () => {
  beforeAll(() => {
    // A build of its own, as `npm run build` makes it: the test runner's NODE_ENV would give React's development build.
    const vite = path.join(path.dirname(createRequire(import.meta.url).resolve('vite/package.json')), 'bin', 'vite.js');
    execFileSync(process.execPath, [vite, 'build', '--outDir', out, '--emptyOutDir', '--logLevel', 'error'], {
      cwd: clientDir,
      env: { ...process.env, NODE_ENV: 'production' },
      stdio: 'pipe',
    });
  }, 180_000);
  afterAll(() => rmSync(out, { recursive: true, force: true }));

  it('reads the scripts and module preloads an HTML page names, and nothing else', () => {
    const html = `<script type="module" crossorigin src="/assets/a.js"></script>
      <link rel="modulepreload" crossorigin href="/assets/b.js"><link rel="stylesheet" href="/assets/c.css"><link rel="icon" href="/favicon.svg">`;
    expect(scriptsOf(html)).toEqual(['/assets/a.js', '/assets/b.js']);
  });

  it(`when built, then the JavaScript decide.html names stays within the budget of ${DECIDE_JS_BUDGET} B (gzip -9)`, () => {
    const m = measure(out);
    expect(m.files.length).toBeGreaterThan(0);
    expect(m.gzip).toBeLessThanOrEqual(DECIDE_JS_BUDGET);
  });

  it('when built, then the page loads neither the router nor the app shell, and the app still does', () => {
    const code = (page) => measure(out, page).files.map((f) => readFileSync(path.join(out, f.file)).toString('utf8')).join('\n');
    const decide = code('decide.html');
    const app = code('index.html');
    // A warning string inside the router's navigate, and a label of the app shell's menu.
    expect(app).toContain('You should call navigate');
    expect(decide).not.toContain('You should call navigate');
    expect(app).toContain('Sign out');
    expect(decide).not.toContain('Sign out');
    expect(decide).toContain('Opening your request');
  });
});

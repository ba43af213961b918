// @vitest-environment node
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { execFileSync } from 'node:child_process';
import { beforeAll, describe, expect, it } from 'vitest';
import { DECIDE_JS_BUDGET, measure, scriptsOf } from './decide-size.mjs';

const clientDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const out = path.join(clientDir, 'dist');

describe('the decision page bundle', () => {
  beforeAll(() => {
    // The build npm start serves, made by the same script (it skips the build when client/dist is
    // newer than every source, so the browser stage of npm test reuses it). The test runner's
    // NODE_ENV=test is passed on on purpose: the script must make a production build regardless.
    execFileSync('bash', [path.join(clientDir, '..', 'docker-free-scripts', 'build-client.sh')], {
      env: { ...process.env, NODE_ENV: 'test' },
      stdio: 'pipe',
    });
  }, 300_000);

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

  it('when built, then it is React\'s production build (what npm start serves), not the development one', () => {
    const decide = measure(out).files.map((f) => readFileSync(path.join(out, f.file)).toString('utf8')).join('\n');
    // A warning only React's development build carries.
    expect(decide).not.toMatch(/Each child in a list should have a unique/);
  });
});

import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EstimateDto, SendForApprovalResultDto } from '@wingstage/shared';
import { decideTokenFromMail, limitNamespace, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/**
 * The owner's decision page arrives with its first view in the HTML, rendered on the server by the
 * client's own components (the built renderer, client/dist-ssr), so it paints before any script has
 * run. Built the way npm start builds it: docker-free-scripts/build-client.sh.
 */
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
const dist = path.join(root, 'client', 'dist');

let server: TestServer;
let a: WorkshopFixture;
let manager: Client;

beforeAll(async () => {
  execFileSync('bash', [path.join(root, 'docker-free-scripts', 'build-client.sh')], { env: { ...process.env, NODE_ENV: 'test' }, stdio: 'pipe' });
  expect(existsSync(path.join(`${dist}-ssr`, 'decide-ssr.js'))).toBe(true);
  server = await startTestServer({ CLIENT_DIST: dist, RATE_LIMIT_NAMESPACE: limitNamespace(), DECIDE_ADDRESS_LIMIT: '3' });
  a = await makeWorkshop('First view');
  manager = await signIn(server.app, a.users.manager.email);
}, 300_000);
afterAll(async () => {
  await server?.close();
});

/** A job with a finding put to its owner: the e-mailed link's token. */
async function openRequest(): Promise<string> {
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const f = await makeFinding(job, { title: 'Cracked exhaust clamp' });
  const lines = [{ id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'New clamp <fitted> & checked $1', amount: '40.00', vatRate: 'standard', findingId: f.id }];
  expect((await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines, accessTasks: [] })).status).toBe(200);
  const est = (await manager.get(`/api/jobs/${job.id}/estimate`)).body as EstimateDto;
  const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { includeQuote: false, findingIds: [f.id], message: 'Found at the annual </script> look-over.', estimateVersion: est.version });
  expect(sent.status).toBe(201);
  return decideTokenFromMail(a.owners[0].customer.email, (sent.body as SendForApprovalResultDto).request!.id, 30_000);
}

describe("the decision page's first view comes in the HTML", () => {
  it('when an owner opens a link, then the letter, the first item and the data are in the page, styles inline, never cached', async () => {
    const token = await openRequest();
    const res = await request(server.app).get(`/decide/${token}`);
    expect(res.status).toBe(200);
    expect(res.type).toBe('text/html');
    expect(res.headers['cache-control']).toBe('no-store');
    // The letter and the first item, as React renders them.
    expect(res.text).toMatch(/<div id="root"><div class="[^"]*"><main id="main"/);
    // (React marks where one text node ends and the next begins with an empty comment.)
    const text = res.text.replace(/<!-- -->/g, '');
    expect(text).toContain(`Dear ${a.owners[0].customer.name.replace(/&/g, '&amp;')},`);
    expect(text).toContain('Cracked exhaust clamp');
    // No stylesheet to wait for: the page's CSS is in a <style> element.
    expect(res.text).not.toMatch(/<link rel="stylesheet"/);
    expect(res.text).toMatch(/<style>[\s\S]{1000,}?<\/style>/);
    // The data it was made from, which the browser takes instead of asking again; nothing in it
    // can end its element early (the manager's message says "</script>").
    const data = /<script type="application\/json" id="wingstage-decide-data">([\s\S]*?)<\/script>/.exec(res.text);
    expect(data).not.toBeNull();
    expect(data![1]).not.toContain('</script');
    const view = JSON.parse(data![1]!) as { token: string; page: { snapshot: { message: string } } };
    expect(view.token).toBe(token);
    expect(view.page.snapshot.message).toBe('Found at the annual </script> look-over.');
    // The same page the API answers.
    const api = await request(server.app).get(`/api/decide/${token}`);
    expect(api.body).toEqual(view.page);
  });

  it('when an unknown link is opened, then the page says so (404) with no data, and the look-ups count against the address', async () => {
    const unknown = `${'Z'.repeat(20)}${randomUUID().replace(/-/g, '')}`;
    const first = await request(server.app).get(`/decide/${unknown}`);
    expect(first.status).toBe(404);
    expect(first.text).toContain('data-testid="decision-unknown-link"');
    expect(first.text).toContain('"page":null');
    // The per-address limit (3 here) is the API's: two more failed look-ups, then the API refuses.
    for (let i = 0; i < 2; i += 1) expect((await request(server.app).get(`/decide/${unknown}x${i}`)).status).toBe(404);
    expect((await request(server.app).get(`/api/decide/${unknown}`)).status).toBe(429);
    // Blocked, the page goes out plain (no look-up, no data), and its request for data is refused.
    const blocked = await request(server.app).get(`/decide/${unknown}`);
    expect(blocked.status).toBe(200);
    expect(blocked.text).not.toContain('id="wingstage-decide-data"');
    expect(blocked.text).toContain('<div id="root"></div>');
  });
});

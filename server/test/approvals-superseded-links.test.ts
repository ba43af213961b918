import { randomBytes, randomUUID } from 'node:crypto';
import sharp from 'sharp';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decidePhotoUrl, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type FindingPhotoDto, type SendForApprovalResultDto } from '@wingstage/shared';
import { ApprovalRequest, boundSequelize } from '../src/models/index.js';
import { decideTokenFromMail, sha256Hex, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let manager: Client;

beforeAll(async () => {
  server = await startTestServer();
  a = await makeWorkshop('Older links');
  manager = await signIn(server.app, a.users.manager.email);
});
afterAll(async () => {
  await server?.close();
});

const hashOf = sha256Hex;
const anon = () => request(server.app);
const day = (iso: string) => new Date(iso).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', timeZone: 'UTC' });

const currentToken = (requestId: string) => decideTokenFromMail(a.owners[0].customer.email, requestId);

/** A sent request for one priced finding with a photo; its first link. */
async function sentRequest() {
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const f = await makeFinding(job, { title: 'Fairing bracket cracked' });
  const line: EstimateLineInputForm = { id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'Replace the bracket', vatRate: 'standard', amount: '48.00', findingId: f.id } as EstimateLineInputForm;
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [line], accessTasks: [] });
  expect(saved.status).toBe(200);
  const pic = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#557799' } }).jpeg().toBuffer();
  const up = await manager.agent.post(`/api/jobs/${job.id}/findings/${f.id}/photos`).set('X-CSRF-Token', manager.csrf).attach('photos', pic, { filename: 'bracket.jpg', contentType: 'image/jpeg' });
  expect(up.status).toBe(201);
  const photo = (up.body as FindingPhotoDto[])[0]!;
  const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [f.id], message: '', estimateVersion: (saved.body as EstimateDto).version });
  expect(sent.status).toBe(201);
  const requestId = (sent.body as SendForApprovalResultDto).request!.id;
  return { job, f, photo, requestId, first: await currentToken(requestId) };
}

async function resend(requestId: string): Promise<string> {
  const res = await manager.post(`/api/approval-requests/${requestId}/resend`);
  expect(res.status).toBe(200);
  return currentToken(requestId);
}

const decideBody = (page: DecisionPageDto, findingId: string) => ({ snapshotHash: page.snapshotHash, typedName: 'Owner One', decisions: [{ itemId: findingId, decision: 'approve', note: '' }] });

describe('a link superseded by re-sending the request', () => {
  it('when the owner opens the older link after a re-send, then the page shows the request closed and says a newer link was sent, with no decisions and no photos', async () => {
    const { requestId, first, photo } = await sentRequest();
    const second = await resend(requestId);
    expect(second).not.toBe(first);

    const res = await anon().get(`/api/decide/${first}`);
    expect(res.status).toBe(200);
    const page = res.body as DecisionPageDto;
    const sentAt = page.newerLinkSentAt!;
    expect(Date.now() - new Date(sentAt).getTime()).toBeLessThan(120_000);
    expect(page).toMatchObject({ state: 'sent', decisions: null, decidedByName: null, decidedAt: null });
    expect(page.closedReason).toBe(`A newer link was sent to you on ${day(sentAt)}: use the link in the newest e-mail.`);
    expect(page.snapshot.findings[0]!.photos).toEqual([]);
    // The newest link is the live one, photos included, and it shows the re-send's expiry, not the first send's.
    const live = (await anon().get(`/api/decide/${second}`)).body as DecisionPageDto;
    const row = await ApprovalRequest.findByPk(requestId);
    expect(live.expiresAt).toBe(row!.expiresAt.toISOString());
    expect(new Date(live.expiresAt).getTime()).toBeGreaterThan(new Date(live.snapshot.expiresAt).getTime());
    expect(live).toMatchObject({ state: 'sent', closedReason: null, newerLinkSentAt: null });
    expect(live.snapshot.findings[0]!.photos.map((p) => p.id)).toEqual([photo.id]);
    expect((await anon().get(decidePhotoUrl(second, photo.id, 'thumb'))).status).toBe(200);
    expect((await anon().get(decidePhotoUrl(first, photo.id, 'thumb'))).status).toBe(404);
    expect((await anon().get(decidePhotoUrl(first, photo.id, 'full'))).status).toBe(404);
  });

  it('when the owner decides through the older link, then it is refused with 409 and the reason, and nothing is recorded', async () => {
    const { requestId, first, f } = await sentRequest();
    const live = (await anon().get(`/api/decide/${first}`)).body as DecisionPageDto;
    const second = await resend(requestId);

    const refused = await anon().post(`/api/decide/${first}`).send(decideBody(live, f.id));
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('conflict');
    expect(refused.body.error.message).toMatch(/^A newer link was sent to you on \d{1,2} [A-Z][a-z]{2}: use the link in the newest e-mail\.$/);
    const r = (await ApprovalRequest.findByPk(requestId))!;
    expect(r.state).toBe('sent');
    expect(r.decidedAt).toBeNull();
    const [count] = await boundSequelize().query<{ n: number }>(`SELECT count(*)::int AS n FROM approval_decisions WHERE request_id = $1`, { bind: [requestId], type: QueryTypes.SELECT });
    expect(count?.n).toBe(0);
    // The newest link still decides.
    const ok = await anon().post(`/api/decide/${second}`).send(decideBody(live, f.id));
    expect(ok.status).toBe(200);
    expect((ok.body as DecisionPageDto).state).toBe('decided');
  });

  it('when the request is decided through the newest link, then an older link says so but does not show the decisions', async () => {
    const { requestId, first, f } = await sentRequest();
    const second = await resend(requestId);
    const live = (await anon().get(`/api/decide/${second}`)).body as DecisionPageDto;
    expect((await anon().post(`/api/decide/${second}`).send(decideBody(live, f.id))).status).toBe(200);

    const page = (await anon().get(`/api/decide/${first}`)).body as DecisionPageDto;
    expect(page.state).toBe('decided');
    expect(page.closedReason).toMatch(/^A newer link was sent to you on .+, and the request has since been decided\./);
    expect(page).toMatchObject({ decisions: null, decidedByName: null, decidedAt: null });
    const again = await anon().post(`/api/decide/${first}`).send(decideBody(live, f.id));
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/has since been decided/);
  });

  it('when a request is re-sent twice, then both older links are recognised and name the date of the newest', async () => {
    const { requestId, first } = await sentRequest();
    const second = await resend(requestId);
    const third = await resend(requestId);
    const one = (await anon().get(`/api/decide/${first}`)).body as DecisionPageDto;
    const two = (await anon().get(`/api/decide/${second}`)).body as DecisionPageDto;
    // The second link was superseded by the third, the newest: both older links name when that was sent.
    const [row] = await boundSequelize().query<{ at: Date }>(`SELECT superseded_at AS at FROM approval_superseded_links WHERE token_hash = $1`, { bind: [hashOf(second)], type: QueryTypes.SELECT });
    expect(one.newerLinkSentAt).toBe(new Date(row!.at).toISOString());
    expect(two.newerLinkSentAt).toBe(one.newerLinkSentAt);
    expect(((await anon().get(`/api/decide/${third}`)).body as DecisionPageDto).newerLinkSentAt).toBeNull();
  });

  it('when the request is revoked after a re-send, then an older link says the workshop revoked it', async () => {
    const { requestId, first } = await sentRequest();
    await resend(requestId);
    expect((await manager.post(`/api/approval-requests/${requestId}/revoke`)).status).toBe(200);
    const page = (await anon().get(`/api/decide/${first}`)).body as DecisionPageDto;
    expect(page.state).toBe('revoked');
    expect(page.closedReason).toMatch(/the workshop has since revoked the request/);
  });

  it('when re-sent, then only the SHA-256 of the older token is kept, never the token', async () => {
    const { requestId, first } = await sentRequest();
    await resend(requestId);
    const rows = await boundSequelize().query<Record<string, unknown>>(`SELECT * FROM approval_superseded_links WHERE request_id = $1`, { bind: [requestId], type: QueryTypes.SELECT });
    expect(rows).toHaveLength(1);
    expect(rows[0]!.token_hash).toBe(hashOf(first));
    expect(JSON.stringify(rows)).not.toContain(first);
  });

  it('when a token was never issued, then it is still 404 for the page, a decision and a photo', async () => {
    const { photo } = await sentRequest();
    const never = randomBytes(32).toString('base64url');
    const page = await anon().get(`/api/decide/${never}`);
    expect(page.status).toBe(404);
    expect(page.body.error.message).toMatch(/link is not valid/);
    const post = await anon().post(`/api/decide/${never}`).send({ snapshotHash: 'a'.repeat(64), typedName: 'Owner One', decisions: [{ itemId: randomUUID(), decision: 'approve', note: '' }] });
    expect(post.status).toBe(404);
    expect((await anon().get(decidePhotoUrl(never, photo.id))).status).toBe(404);
  });
});

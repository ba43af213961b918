import { createHash, randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STAFF_ONLY_WORDS, type ApprovalRequestDto, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type SendForApprovalResultDto } from '@wingstage/shared';
import { createApp } from '../src/app.js';
import { MailQueue } from '../src/mail/mail-queue.js';
import { ApprovalRequest, AuditEvent, Finding, Job } from '../src/models/index.js';
import { canonicalJson } from '../src/services/approvals/index.js';
import { chaseUndecided } from '../src/jobs/approval-reminders.js';
import { decideTokenFromMail, sha256Hex, makeFinding, makeJob, mailsTo, makeWorkshop, signIn, startTestServer, testConfig, uniq, waitForMail, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let b: WorkshopFixture;
let manager: Client;
let engineer: Client;
let owner: Client;
let otherOwner: Client;
let bManager: Client;

beforeAll(async () => {
  server = await startTestServer();
  [a, b] = await Promise.all([makeWorkshop('Approvals'), makeWorkshop('Elsewhere')]);
  // Workshop a gives its phone and e-mail (settings contactPhone/contactEmail); b gives neither.
  await a.workshop.update({ settings: { ...a.workshop.settings, contactPhone: '01632 960777', contactEmail: 'desk@approvals.example' } });
  [manager, engineer, owner, otherOwner, bManager] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.users.engineer.email),
    signIn(server.app, a.owners[0].user.email),
    signIn(server.app, a.owners[1].user.email),
    signIn(server.app, b.users.manager.email),
  ]);
});
afterAll(async () => {
  await server?.close();
});

const deps = () => ({ config: server.parts.config, mail: server.parts.mail, logger: server.parts.logger, photos: server.parts.photos });

/** A fee line at the standard rate (20%), so net 125.00 is 150.00 incl. VAT. */
const fee = (findingId: string, net: string): EstimateLineInputForm => ({
  id: randomUUID(), stage: 'discovered', kind: 'fee', description: `Remedy ${net}`, amount: net, vatRate: 'standard', findingId,
});

interface Priced {
  job: Job;
  findings: Finding[];
  estimate: EstimateDto;
  ownerEmail: string;
}

/** An inspecting job of owner 1 with findings priced through the estimate, one fee net each. */
async function pricedJob(nets: string[], categories: Finding['category'][] = []): Promise<Priced> {
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const findings: Finding[] = [];
  for (const [i] of nets.entries()) findings.push(await makeFinding(job, { category: categories[i] ?? 'recommended', title: `Worn part ${i + 1}` }));
  const lines = [
    { id: randomUUID(), stage: 'inspection', kind: 'labour', description: 'Inspection', quantity: '2', labourRateCode: 'standard', ratePerHour: '62.00' } as EstimateLineInputForm,
    ...nets.map((n, i) => fee(findings[i]!.id, n)),
  ];
  const res = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines, accessTasks: [] });
  expect(res.status).toBe(200);
  // The owner agreed the quote on the phone, so these tests are about the findings alone.
  const agreed = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Owner One', agreedAt: new Date(Date.now() - 60_000).toISOString(), note: '', estimateVersion: (res.body as EstimateDto).version });
  expect(agreed.status).toBe(200);
  return { job, findings, estimate: agreed.body as EstimateDto, ownerEmail: a.owners[0].customer.email };
}

async function send(p: Priced, findingIds = p.findings.map((f) => f.id), c: Client = manager) {
  const est = await manager.get(`/api/jobs/${p.job.id}/estimate`);
  return c.post(`/api/jobs/${p.job.id}/approval-requests`, { findingIds, message: 'Found while inspecting.', estimateVersion: est.body.version });
}

const hashOf = sha256Hex;

const tokenOf = (email: string, requestId: string) => decideTokenFromMail(email, requestId, 15_000);

/** Sends and returns the request and the token read from the e-mail maildev received. */
async function sendAndRead(p: Priced): Promise<{ request: ApprovalRequestDto; token: string }> {
  const res = await send(p);
  expect(res.status).toBe(201);
  const body = res.body as SendForApprovalResultDto;
  return { request: body.request!, token: await tokenOf(p.ownerEmail, body.request!.id) };
}

const anon = () => request(server.app);
const allDecisions = (page: DecisionPageDto, decide: (i: number) => 'approve' | 'decline') => ({
  snapshotHash: page.snapshotHash,
  typedName: 'Owner One',
  decisions: page.snapshot.findings.map((f, i) => ({ itemId: f.findingId, decision: decide(i), note: i === 0 ? 'Go ahead.' : '' })),
});

describe('sending findings for approval', () => {
  it('when a manager sends priced findings, then the owner is e-mailed a link, the findings are sent and the job awaits the owner', async () => {
    const p = await pricedJob(['125.00', '40.00']);
    const { request: r, token } = await sendAndRead(p);
    expect(r).toMatchObject({ state: 'sent', findingIds: p.findings.map((f) => f.id), gross: '198.00' });
    const mail = await waitForMail(p.ownerEmail, (m) => m.text.includes(token));
    expect(mail.subject).toContain('2 findings for your decision');
    expect(mail.text).toContain('£198.00 incl. VAT');
    expect(mail.text).toContain('The link works until');
    expect((await Job.findByPk(p.job.id))!.state).toBe('awaiting_owner');
    const states = (await Finding.findAll({ where: { jobId: p.job.id }, order: [['seq', 'ASC']] })).map((f) => f.state);
    expect(states).toEqual(['sent', 'sent']);
    const stored = await ApprovalRequest.findByPk(r.id);
    // Only the hash of the token is kept.
    expect(stored!.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));
    expect(JSON.stringify(stored!.toJSON())).not.toContain(token);
    const history = await AuditEvent.findAll({ where: { jobId: p.job.id, action: 'approval.sent' } });
    expect(history).toHaveLength(1);
  });

  it('when the owner opens the link, then the page shows the snapshot and its hash is the SHA-256 of its canonical JSON', async () => {
    const p = await pricedJob(['125.00']);
    const { request: r, token } = await sendAndRead(p);
    const page = await anon().get(`/api/decide/${token}`);
    expect(page.status).toBe(200);
    const body = page.body as DecisionPageDto;
    expect(body.state).toBe('sent');
    expect(body.closedReason).toBeNull();
    expect(body.snapshotHash).toBe(r.snapshotHash);
    expect(createHash('sha256').update(canonicalJson(body.snapshot)).digest('hex')).toBe(body.snapshotHash);
    // Key order does not change the canonical form.
    const reordered = Object.fromEntries(Object.entries(body.snapshot).reverse());
    expect(canonicalJson(reordered)).toBe(canonicalJson(body.snapshot));
    expect(body.snapshot.findings[0]).toMatchObject({ number: 'F-1', gross: '150.00', photos: [] });
    expect(body.snapshot.version).toBe(3);
    // The figures are the estimate's own.
    const est = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    expect(body.snapshot.totals.quoted.gross).toBe(est.priced.quoted.gross);
    // One finding with no opening-up: its fixed price is the engine's own price for it.
    expect(body.snapshot.findings[0]!.gross).toBe(est.priced.findings[0]!.price.gross);
  });

  it('when a finding is not priced, or belongs to another job, then sending is refused and nothing is sent', async () => {
    const p = await pricedJob(['10.00']);
    const draft = await makeFinding(p.job);
    const notPriced = await send(p, [p.findings[0]!.id, draft.id]);
    expect(notPriced.status).toBe(409);
    expect(notPriced.body.error.message).toMatch(/F-2 is draft/);
    const other = await pricedJob(['10.00']);
    const foreign = await send(p, [other.findings[0]!.id]);
    expect(foreign.status).toBe(404);
    expect(await ApprovalRequest.count({ where: { jobId: p.job.id } })).toBe(0);
    const stale = await manager.post(`/api/jobs/${p.job.id}/approval-requests`, { findingIds: [p.findings[0]!.id], estimateVersion: 0 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
  });
});

describe('roles and boundaries', () => {
  it('when anyone but an admin or manager sends, revokes or sets the limit, then it is refused; other workshops and owners get 404', async () => {
    const p = await pricedJob(['20.00']);
    const body = { findingIds: [p.findings[0]!.id], estimateVersion: 1 };
    expect((await engineer.post(`/api/jobs/${p.job.id}/approval-requests`, body)).status).toBe(403);
    expect((await owner.post(`/api/jobs/${p.job.id}/approval-requests`, body)).status).toBe(403);
    expect((await bManager.post(`/api/jobs/${p.job.id}/approval-requests`, body)).status).toBe(404);
    expect((await bManager.get(`/api/jobs/${p.job.id}/approval-requests`)).status).toBe(404);
    expect((await otherOwner.get(`/api/jobs/${p.job.id}/approval-requests`)).status).toBe(404);
    expect((await otherOwner.get(`/api/jobs/${p.job.id}/pre-authorisation`)).status).toBe(404);
    expect((await engineer.put(`/api/jobs/${p.job.id}/pre-authorisation`, { version: p.job.version, perFinding: '10.00', perJob: null, agreedHow: '' })).status).toBe(403);
    const { request: r } = await sendAndRead(p);
    expect((await owner.get(`/api/jobs/${p.job.id}/approval-requests`)).status).toBe(200);
    expect((await engineer.post(`/api/approval-requests/${r.id}/revoke`)).status).toBe(403);
    expect((await bManager.post(`/api/approval-requests/${r.id}/revoke`)).status).toBe(404);
    expect((await bManager.post(`/api/approval-requests/${r.id}/resend`)).status).toBe(404);
    expect((await anon().get(`/api/decide/${'x'.repeat(43)}`)).status).toBe(404);
    expect((await anon().get('/api/decide/short')).status).toBe(404);
  });
});

describe("the owner's decision", () => {
  it('when the owner approves one finding and declines the other, then lines, findings, request, job and history follow and a receipt is e-mailed', async () => {
    const p = await pricedJob(['125.00', '40.00'], ['recommended', 'airworthiness']);
    const { request: r, token } = await sendAndRead(p);
    const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    const res = await anon().post(`/api/decide/${token}`).set('User-Agent', 'phone-test').send(allDecisions(page, (i) => (i === 0 ? 'approve' : 'decline')));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ state: 'decided', decidedByName: 'Owner One' });
    expect(res.body.decisions).toEqual([
      { itemId: p.findings[0]!.id, decision: 'approve', note: 'Go ahead.' },
      { itemId: p.findings[1]!.id, decision: 'decline', note: '' },
    ]);
    const est = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    expect(est.lines.filter((l) => l.findingId === p.findings[0]!.id).map((l) => l.stage)).toEqual(['approved']);
    expect(est.lines.filter((l) => l.findingId === p.findings[1]!.id).map((l) => l.stage)).toEqual(['declined']);
    // Inspection 124.00 + 25% ... from the engine: 2 h × 62.00 = 124.00 net; approved 125.00 net; VAT 20%.
    expect(est.priced.committed.gross).toBe('298.80');
    const f = await Finding.findAll({ where: { jobId: p.job.id }, order: [['seq', 'ASC']] });
    expect(f.map((x) => x.state)).toEqual(['approved', 'declined']);
    expect((await Job.findByPk(p.job.id))!.state).toBe('in_work');
    const stored = await ApprovalRequest.findByPk(r.id);
    expect(stored).toMatchObject({ state: 'decided', decidedByName: 'Owner One', decidedUserAgent: 'phone-test' });
    expect(stored!.decidedIp).toBeTruthy();
    const receipt = await waitForMail(p.ownerEmail, (m) => m.subject.includes('your decisions are recorded') && m.text.includes(`${p.findings.length ? 'F-2' : ''}`) && m.text.includes(token));
    expect(receipt.text).toContain("While it is open, the workshop will not mark the aircraft ready for release. Whether it may fly is the inspector's decision under the authority's rules.");
    expect(receipt.text).not.toMatch(/cannot be released|fit to fly/);
    // The total agreed after the decision (one name: "Agreed so far"), and how to reach the workshop.
    expect(receipt.text).toMatch(/Agreed so far on this job: £[\d,]+\.\d{2} incl\. VAT\./);
    expect(receipt.text).toContain(`To change a decision, contact ${a.workshop.name}: 01632 960777, desk@approvals.example.`);
    expect(page.snapshot).toMatchObject({ workshopPhone: '01632 960777', workshopEmail: 'desk@approvals.example' });
    for (const word of STAFF_ONLY_WORDS) expect(receipt.text, word).not.toContain(word);
    // At 375 px the long address wraps: it sits in its own paragraph in a span that may break anywhere.
    expect(receipt.html).toContain(`into your browser:</p><p style="margin:0;color:#4a5565;font-size:14px"><span style="word-break:break-all;overflow-wrap:anywhere">`);
    const history = (await manager.get(`/api/jobs/${p.job.id}/history`)).body as { action: string; summary: string }[];
    expect(history.map((h) => h.action)).toEqual(expect.arrayContaining(['approval.sent', 'approval.decided', 'job.state_changed']));
    // A declined airworthiness finding stays open: the release guard refuses.
    const job = await Job.findByPk(p.job.id);
    const rel = await manager.post(`/api/jobs/${p.job.id}/transition`, { to: 'ready_for_release', version: job!.version });
    expect(rel.status).toBe(409);
    // Decided: the link still shows, but a second submission is refused in plain words.
    const again = await anon().post(`/api/decide/${token}`).send(allDecisions(page, () => 'approve'));
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already decided by Owner One/);
    const view = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    expect(view.closedReason).toMatch(/already decided/);
  });

  it('when two decisions arrive at once, then exactly one wins and the other is refused', async () => {
    const p = await pricedJob(['30.00', '31.00']);
    const { token } = await sendAndRead(p);
    const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    const [x, y] = await Promise.all([
      anon().post(`/api/decide/${token}`).send(allDecisions(page, () => 'approve')),
      anon().post(`/api/decide/${token}`).send(allDecisions(page, () => 'decline')),
    ]);
    expect([x.status, y.status].sort()).toEqual([200, 409]);
    const winner = x.status === 200 ? 'approved' : 'declined';
    const f = await Finding.findAll({ where: { jobId: p.job.id } });
    expect(f.map((z) => z.state)).toEqual([winner, winner]);
    const [{ n }] = (await server.parts.sequelize.query(`SELECT count(*)::int AS n FROM approval_decisions WHERE job_id = $1`, { bind: [p.job.id], plain: false, raw: true }))[0] as { n: number }[] as [{ n: number }];
    expect(n).toBe(2);
  });

  it('when the snapshot hash differs, or not every finding is decided, then the decision is refused and nothing moves', async () => {
    const p = await pricedJob(['12.00', '13.00']);
    const { token } = await sendAndRead(p);
    const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    const wrong = await anon().post(`/api/decide/${token}`).send({ ...allDecisions(page, () => 'approve'), snapshotHash: 'a'.repeat(64) });
    expect(wrong.status).toBe(409);
    expect(wrong.body.error.message).toMatch(/out of date/);
    const partial = allDecisions(page, () => 'approve');
    partial.decisions = partial.decisions.slice(0, 1);
    expect((await anon().post(`/api/decide/${token}`).send(partial)).status).toBe(400);
    const noName = await anon().post(`/api/decide/${token}`).send({ ...allDecisions(page, () => 'approve'), typedName: ' ' });
    expect(noName.status).toBe(400);
    expect((await Finding.findAll({ where: { jobId: p.job.id } })).map((f) => f.state)).toEqual(['sent', 'sent']);
  });

  it('when the link is revoked, then it explains so and refuses, and the revoked request cannot be re-sent (the table keeps it final)', async () => {
    const p = await pricedJob(['14.00']);
    const { request: r, token } = await sendAndRead(p);
    const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    const rev = await manager.post(`/api/approval-requests/${r.id}/revoke`);
    expect(rev.status).toBe(200);
    expect(rev.body.state).toBe('revoked');
    expect((await Finding.findByPk(p.findings[0]!.id))!.state).toBe('priced');
    const refused = await anon().post(`/api/decide/${token}`).send(allDecisions(page, () => 'approve'));
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/revoked this link/);
    expect(refused.body.error.message).toContain(`contact ${a.workshop.name}: 01632 960777, desk@approvals.example.`);

    const before = await ApprovalRequest.findByPk(r.id);
    const resent = await manager.post(`/api/approval-requests/${r.id}/resend`);
    expect(resent.status).toBe(409);
    expect(resent.body.error).toMatchObject({ code: 'invalid_transition' });
    expect(resent.body.error.message).toMatch(/only a request waiting for the owner can be re-sent\. Send a new request instead\./);
    const after = await ApprovalRequest.findByPk(r.id);
    expect(after).toMatchObject({ state: 'revoked', tokenHash: before!.tokenHash, linkNonce: before!.linkNonce });
    // The workshop sends a new request for the same finding instead.
    const again = await send(p);
    expect(again.status).toBe(201);
  });

  it('when a request waiting for the owner is re-sent, then it gets a new link and the old one only says a newer one was sent', async () => {
    const p = await pricedJob(['14.50']);
    const { request: r, token } = await sendAndRead(p);
    const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    const resent = await manager.post(`/api/approval-requests/${r.id}/resend`);
    expect(resent.status).toBe(200);
    expect(resent.body).toMatchObject({ state: 'sent', snapshotHash: r.snapshotHash });
    const fresh = await tokenOf(p.ownerEmail, r.id);
    expect(fresh).not.toBe(token);
    const old = await anon().get(`/api/decide/${token}`);
    expect(old.status).toBe(200);
    expect(old.body.closedReason).toMatch(/^A newer link was sent to you on .+: use the link in the newest e-mail\.$/);
    expect((await anon().post(`/api/decide/${token}`).send(allDecisions(page, () => 'approve'))).status).toBe(409);
    const ok = await anon().post(`/api/decide/${fresh}`).send(allDecisions(page, () => 'approve'));
    expect(ok.status).toBe(200);
  });

  it('when the link has expired, then it is marked expired on opening and the decision is refused', async () => {
    const p = await pricedJob(['15.00']);
    const { request: r, token } = await sendAndRead(p);
    const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    await ApprovalRequest.update({ expiresAt: new Date(Date.now() - 60_000) }, { where: { id: r.id } });
    const res = await anon().post(`/api/decide/${token}`).send(allDecisions(page, () => 'approve'));
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/expired/);
    expect((await ApprovalRequest.findByPk(r.id))!.state).toBe('expired');
    expect((await Finding.findByPk(p.findings[0]!.id))!.state).toBe('priced');
  });
});

describe('guessing links', () => {
  it('when one address tries many links, then it is slowed down with 429 and an unknown link never says more than 404', async () => {
    const limited = server.variant({ DECIDE_ADDRESS_LIMIT: '3' });
    const statuses: number[] = [];
    for (let i = 0; i < 5; i += 1) statuses.push((await request(limited).get(`/api/decide/${uniq()}${'A'.repeat(40)}`)).status);
    expect(statuses).toEqual([404, 404, 404, 429, 429]);
  });
});

describe('replacement when a price changes', () => {
  it('when the estimate changes the price of a sent finding, then the request is replaced, a new one is sent and the old link says why', async () => {
    const p = await pricedJob(['50.00', '20.00']);
    const { request: r, token } = await sendAndRead(p);
    const oldPage = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
    const est = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    const lines = est.lines.map((l) => (l.findingId === p.findings[0]!.id ? { ...l, amount: '60.00' } : l));
    const saved = await manager.put(`/api/jobs/${p.job.id}/estimate`, { version: est.version, lines, accessTasks: est.accessTasks });
    expect(saved.status).toBe(200);
    const old = await ApprovalRequest.findByPk(r.id);
    expect(old!.state).toBe('replaced');
    expect(old!.replacedById).toBeTruthy();
    const next = await ApprovalRequest.findByPk(old!.replacedById!);
    expect(next).toMatchObject({ state: 'sent', gross: '96.00' });
    const fresh = await tokenOf(p.ownerEmail, next!.id);
    const newPage = (await anon().get(`/api/decide/${fresh}`)).body as DecisionPageDto;
    expect(newPage.snapshot.findings.map((f) => f.gross)).toEqual(['72.00', '24.00']);
    const stale = await anon().post(`/api/decide/${token}`).send(allDecisions(oldPage, () => 'approve'));
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/replaced by a newer one on .*: the workshop changed a price\. Use the link in the newest e-mail\./);
    expect((await Finding.findAll({ where: { jobId: p.job.id } })).map((f) => f.state)).toEqual(['sent', 'sent']);
  });

  it('when a sent finding is withdrawn, then the request is replaced by one without it, and the withdrawn finding stays withdrawn', async () => {
    const p = await pricedJob(['21.00', '22.00']);
    const { request: r } = await sendAndRead(p);
    const w = await manager.post(`/api/jobs/${p.job.id}/findings/${p.findings[0]!.id}/withdraw`, { version: (await Finding.findByPk(p.findings[0]!.id))!.version, reason: 'Raised twice' });
    expect(w.status).toBe(200);
    const old = await ApprovalRequest.findByPk(r.id);
    expect(old!.state).toBe('replaced');
    const list = (await manager.get(`/api/jobs/${p.job.id}/approval-requests`)).body as ApprovalRequestDto[];
    expect(list[0]).toMatchObject({ id: old!.replacedById, state: 'sent', findingIds: [p.findings[1]!.id], gross: '26.40' });
    expect((await Finding.findAll({ where: { jobId: p.job.id }, order: [['seq', 'ASC']] })).map((f) => f.state)).toEqual(['withdrawn', 'sent']);
    const last = await manager.post(`/api/jobs/${p.job.id}/findings/${p.findings[1]!.id}/withdraw`, { version: (await Finding.findByPk(p.findings[1]!.id))!.version });
    expect(last.status).toBe(200);
    expect((await ApprovalRequest.findByPk(old!.replacedById!))!.state).toBe('revoked');
  });

  it('when the estimate is saved without changing a sent price, then the request stays as sent', async () => {
    const p = await pricedJob(['50.00']);
    const { request: r } = await sendAndRead(p);
    const est = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    const lines = est.lines.map((l) => (l.stage === 'inspection' ? { ...l, quantity: '3' } : l));
    expect((await manager.put(`/api/jobs/${p.job.id}/estimate`, { version: est.version, lines, accessTasks: [] })).status).toBe(200);
    expect((await ApprovalRequest.findByPk(r.id))!.state).toBe('sent');
  });
});

describe('pre-authorised limit', () => {
  // The product brief's example: the owner allows up to £150 per finding.
  it('when findings of £150.00 and £150.01 are sent under a £150.00 per-finding limit, then only the first is approved within it', async () => {
    const p = await pricedJob(['125.00', '125.01']);
    const put = await manager.put(`/api/jobs/${p.job.id}/pre-authorisation`, { version: (await Job.findByPk(p.job.id))!.version, perFinding: '150', perJob: '400.00', agreedHow: 'Phone call, 26 Nov' });
    expect(put.status).toBe(200);
    expect(put.body).toMatchObject({ perFinding: '150.00', perJob: '400.00', usedSoFar: '0.00', headroom: '400.00' });
    const est = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    const grossOf = (id: string) => est.priced.findings.find((f) => f.findingId === id)!.price.gross;
    expect([grossOf(p.findings[0]!.id), grossOf(p.findings[1]!.id)]).toEqual(['150.00', '150.01']);
    const res = await send(p);
    expect(res.status).toBe(201);
    const body = res.body as SendForApprovalResultDto;
    expect(body.approvedWithinLimit).toEqual([{ findingId: p.findings[0]!.id, number: 'F-1', gross: '150.00' }]);
    expect(body.request!.findingIds).toEqual([p.findings[1]!.id]);
    expect(body.request!.gross).toBe('150.01');
    const f = await Finding.findAll({ where: { jobId: p.job.id }, order: [['seq', 'ASC']] });
    expect(f.map((x) => x.state)).toEqual(['approved_within_limit', 'sent']);
    const after = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    expect(after.lines.filter((l) => l.findingId === p.findings[0]!.id).map((l) => l.stage)).toEqual(['approved']);
    const report = await waitForMail(p.ownerEmail, (m) => m.subject.includes('approved under your standing go-ahead') && m.text.includes('£150.00 incl. VAT') && m.text.includes('£250.00'));
    expect(report.text).toContain('F-1 Worn part 1');
    expect(report.text).toContain('under the standing go-ahead you gave them:');
    expect(report.text).toContain('Left of your standing go-ahead on this job: £250.00 incl. VAT.');
    expect(report.text).toContain(`contact the workshop before the work starts: ${a.workshop.name}: 01632 960777, desk@approvals.example.`);
    expect(report.text).not.toMatch(/limit/);
    // The owner is sent to their own page, never a staff-only one.
    expect(report.text).toMatch(/See your aircraft: http\S*\/my-aircraft\n/);
    expect(report.text).not.toContain('/jobs/');
    const history = (await manager.get(`/api/jobs/${p.job.id}/history`)).body as { action: string; summary: string }[];
    expect(history.find((h) => h.action === 'finding.approved_within_limit')!.summary).toBe("Approved under the owner's standing go-ahead: F-1 £150.00 incl. VAT");
    const pa = await owner.get(`/api/jobs/${p.job.id}/pre-authorisation`);
    expect(pa.body).toMatchObject({ usedSoFar: '150.00', headroom: '250.00' });
  });

  it('when every finding fits the limit, then no request is sent and the job does not wait for the owner', async () => {
    const p = await pricedJob(['10.00']);
    await manager.put(`/api/jobs/${p.job.id}/pre-authorisation`, { version: (await Job.findByPk(p.job.id))!.version, perFinding: null, perJob: '12.00', agreedHow: '' });
    const res = await send(p);
    expect(res.status).toBe(201);
    expect(res.body.request).toBeNull();
    expect(res.body.approvedWithinLimit).toHaveLength(1);
    expect((await Job.findByPk(p.job.id))!.state).toBe('inspecting');
  });

  it('when the limit is saved with a stale job version, then it is refused', async () => {
    const p = await pricedJob(['10.00']);
    const res = await manager.put(`/api/jobs/${p.job.id}/pre-authorisation`, { version: 999, perFinding: '1.00', perJob: null, agreedHow: '' });
    expect(res.status).toBe(409);
  });
});

describe('reminders and expiry', () => {
  it('when chaseAfterHours pass, then one reminder goes per interval; past the expiry the request is marked expired', async () => {
    const p = await pricedJob(['16.00']);
    const { request: r } = await sendAndRead(p);
    const sentAt = new Date(r.sentAt).getTime();
    const h = (n: number) => new Date(sentAt + n * 3_600_000);
    // The demo workshop setting is 48 h; the test workshop uses the default.
    const early = await chaseUndecided(deps(), h(47));
    expect((await ApprovalRequest.findByPk(r.id))!.lastRemindedAt).toBeNull();
    await chaseUndecided(deps(), h(48.5));
    const first = (await ApprovalRequest.findByPk(r.id))!.lastRemindedAt;
    expect(first?.getTime()).toBe(h(48.5).getTime());
    await chaseUndecided(deps(), h(60));
    expect((await ApprovalRequest.findByPk(r.id))!.lastRemindedAt?.getTime()).toBe(h(48.5).getTime());
    await chaseUndecided(deps(), h(97));
    expect((await ApprovalRequest.findByPk(r.id))!.lastRemindedAt?.getTime()).toBe(h(97).getTime());
    expect(early.expired).toBeGreaterThanOrEqual(0);
    // The owner's mailbox also holds other tests' reminders: this one's request is one finding at £19.20.
    const reminders = await waitForMail(p.ownerEmail, (m) => m.subject.startsWith('Reminder:') && m.text.includes('£19.20 incl. VAT in all'));
    expect(reminders.text).toContain('/decide/');
    expect(reminders.subject).toBe(`Reminder: your decision is needed on ${a.owners[0].aircraft.registration}`);
    expect(reminders.text).toMatch(/: 1 finding on \S+ \(.*\) is still waiting for your decision: £19\.20 incl\. VAT in all\./);
    expect(await AuditEvent.count({ where: { jobId: p.job.id, action: 'approval.reminded' } })).toBe(2);
    await chaseUndecided(deps(), h(15 * 24));
    expect((await ApprovalRequest.findByPk(r.id))!.state).toBe('expired');
  });
});

describe('mail outage', () => {
  it('when the mail server is down while a request is sent, then the e-mail arrives once it is back, once', { timeout: 60_000 }, async () => {
    const queue = `mail-approvals-${uniq()}`;
    const { sequelize, logger } = server.parts;
    const down = new MailQueue(testConfig({ SMTP_PORT: '1' }), sequelize, logger, { queue, retryDelaySeconds: 1, retryLimit: 5 });
    await down.start();
    const app = createApp({ ...server.parts, mail: down });
    const agent = request.agent(app);
    const signin = await agent.post('/api/auth/sign-in').send({ email: a.users.manager.email, password: 'runway-heading-270' });
    const p = await pricedJob(['17.00']);
    const est = (await manager.get(`/api/jobs/${p.job.id}/estimate`)).body as EstimateDto;
    const res = await agent.post(`/api/jobs/${p.job.id}/approval-requests`).set('X-CSRF-Token', signin.body.csrfToken).send({ findingIds: [p.findings[0]!.id], estimateVersion: est.version });
    expect(res.status).toBe(201);
    const r = await ApprovalRequest.findByPk(res.body.request.id);
    // Stop as soon as the first delivery has failed, before pg-boss's back-off grows long.
    const [job] = (await sequelize.query(`SELECT id FROM pgboss.job WHERE name = $1`, { bind: [queue] }))[0] as { id: string }[];
    const end0 = Date.now() + 20_000;
    for (;;) {
      const st = await down.status(job!.id);
      if (st && st.state === 'retry' && st.retryCount >= 1) break;
      if (Date.now() > end0) throw new Error('the first delivery did not fail in time');
      await new Promise((x) => setTimeout(x, 200));
    }
    await down.stop();
    const up = new MailQueue(testConfig(), sequelize, logger, { queue, retryDelaySeconds: 1, retryLimit: 5 });
    await up.start();
    try {
      const ours = async () => (await mailsTo(p.ownerEmail)).filter((m) => hashOf(/\/decide\/([A-Za-z0-9_-]+)/.exec(m.text)?.[1] ?? '') === r!.tokenHash);
      const end = Date.now() + 40_000;
      while (Date.now() < end && (await ours()).length === 0) await new Promise((x) => setTimeout(x, 300));
      await new Promise((x) => setTimeout(x, 2000));
      expect(await ours()).toHaveLength(1);
    } finally {
      await up.stop();
    }
  });
});

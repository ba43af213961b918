import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QUOTE_ITEM_ID, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type JobDto, type SendForApprovalResultDto } from '@wingstage/shared';
import { ApprovalRequest, AuditEvent, EstimateLine, Finding, Job, JobChecklistItem } from '../src/models/index.js';
import { decideTokenFromMail, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, waitForMail, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let manager: Client;

beforeAll(async () => {
  server = await startTestServer();
  a = await makeWorkshop('Quote');
  manager = await signIn(server.app, a.users.manager.email);
});
afterAll(async () => {
  await server?.close();
});

const anon = () => request(server.app);
const owner = () => a.owners[0];
const fee = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm => ({ id: randomUUID(), stage: 'inspection', kind: 'fee', description: 'Annual inspection', amount: '100.00', vatRate: 'standard', ...l }) as EstimateLineInputForm;
const estimate = async (jobId: string) => (await manager.get(`/api/jobs/${jobId}/estimate`)).body as EstimateDto;

/** A job with a £100 + VAT inspection scope and, optionally, a priced finding of £50 + VAT; checklist items open or done. */
async function jobWithQuote(p: { state?: Job['state']; finding?: boolean; checks?: 'open' | 'done' | 'none'; category?: Finding['category'] } = {}) {
  const job = await makeJob(a.workshop.id, owner().aircraft.id, p.state ?? 'inspecting');
  const f = p.finding ? await makeFinding(job, { title: 'Exhaust spring cracked', category: p.category ?? 'recommended' }) : null;
  if (p.checks !== 'none') {
    await JobChecklistItem.create({ workshopId: a.workshop.id, jobId: job.id, sortOrder: 0, section: 'Engine', text: 'Compression check', limit: null, ...(p.checks === 'done' ? { result: 'pass', recordedAt: new Date() } : {}) });
  }
  const lines = [fee({}), ...(f ? [fee({ stage: 'discovered', findingId: f.id, description: 'New spring', amount: '50.00' })] : [])];
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines, accessTasks: [] });
  expect(saved.status).toBe(200);
  return { job, finding: f, est: saved.body as EstimateDto };
}

async function sendQuote(jobId: string, findingIds: string[] = []) {
  const est = await estimate(jobId);
  const res = await manager.post(`/api/jobs/${jobId}/approval-requests`, { includeQuote: true, findingIds, message: '', estimateVersion: est.version });
  expect(res.status).toBe(201);
  const r = (res.body as SendForApprovalResultDto).request!;
  const token = await decideTokenFromMail(owner().customer.email, r.id, 30_000);
  const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
  return { r, token, page };
}

const decide = (token: string, page: DecisionPageDto, d: Record<string, 'approve' | 'decline'>, notes: Record<string, string> = {}) =>
  anon().post(`/api/decide/${token}`).send({ snapshotHash: page.snapshotHash, typedName: 'Owner One', decisions: Object.entries(d).map(([itemId, decision]) => ({ itemId, decision, note: notes[itemId] ?? '' })) });

describe('the quote goes to the owner', () => {
  it('when an inspection scope is saved, then it is quoted but not agreed, and work cannot start', async () => {
    const { job, est } = await jobWithQuote({ checks: 'done' });
    // £100 at 20% → £120 [source: HMRC "Calculating VAT …"].
    expect(est.priced.quoted.gross).toBe('120.00');
    expect(est.priced.committed.gross).toBe('0.00');
    expect(est.quote).toMatchObject({ state: 'not_sent', awaitingGross: '120.00', openRequestId: null });
    const j = (await manager.get(`/api/jobs/${job.id}`)).body as JobDto;
    const start = await manager.post(`/api/jobs/${job.id}/transition`, { to: 'in_work', version: j.version });
    expect(start.status).toBe(409);
    expect(start.body.error.code).toBe('invalid_transition');
    expect(start.body.error.message).toMatch(/The owner has not agreed the quote/);
    expect((await Job.findByPk(job.id))!.state).toBe('inspecting');
  });

  it('when the quote is sent and the owner accepts it, then it counts as agreed, with who, how and the request', async () => {
    const { job } = await jobWithQuote({ checks: 'done' });
    const { r, token, page } = await sendQuote(job.id);
    expect(r).toMatchObject({ includesQuote: true, findingIds: [], gross: '120.00' });
    expect(page.snapshot.quote).toMatchObject({ gross: '120.00', changeOf: 'first' });
    expect((await estimate(job.id)).quote).toMatchObject({ state: 'sent', openRequestId: r.id });
    const mail = await waitForMail(owner().customer.email, (m) => m.text.includes(token));
    expect(mail.subject).toContain('the quote for your decision');
    const res = await decide(token, page, { [QUOTE_ITEM_ID]: 'approve' });
    expect(res.status).toBe(200);
    expect(res.body.decisions).toEqual([{ itemId: QUOTE_ITEM_ID, decision: 'approve', note: '' }]);
    const est = await estimate(job.id);
    expect(est.priced.committed.gross).toBe('120.00');
    expect(est.quote).toMatchObject({ state: 'agreed', agreedBy: 'Owner One', agreedHow: 'owner_link', openRequestId: null });
    const line = await EstimateLine.findOne({ where: { jobId: job.id, stage: 'inspection' } });
    expect(line).toMatchObject({ agreedHow: 'owner_link', agreedRef: r.id, agreedBy: 'Owner One' });
  });

  it('when the owner declines the quote, then it never counts as agreed and its state is declined', async () => {
    const { job } = await jobWithQuote({ checks: 'done' });
    const { token, page } = await sendQuote(job.id);
    expect((await decide(token, page, { [QUOTE_ITEM_ID]: 'decline' })).status).toBe(200);
    const est = await estimate(job.id);
    expect(est.priced.committed.gross).toBe('0.00');
    expect(est.lines.filter((l) => l.stage === 'inspection').map((l) => l.agreedAt)).toEqual([null]);
    expect(est.quote.state).toBe('declined');
  });

  it('when the workshop records a phone agreement, then the quote counts with who and when; nothing left to agree or a call in the future is refused', async () => {
    const { job, est } = await jobWithQuote({});
    const at = new Date(Date.now() - 3_600_000).toISOString();
    const future = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Rowan Tillett', agreedAt: new Date(Date.now() + 86_400_000).toISOString(), note: '', estimateVersion: est.version });
    expect(future.status).toBe(400);
    expect(future.body.error.fields.agreedAt).toBe('The call cannot be in the future.');
    const ok = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Rowan Tillett', agreedAt: at, note: 'Rang at lunchtime.', estimateVersion: est.version });
    expect(ok.status).toBe(200);
    expect((ok.body as EstimateDto).quote).toMatchObject({ state: 'agreed', agreedBy: 'Rowan Tillett', agreedHow: 'phone', agreedAt: at });
    expect((ok.body as EstimateDto).priced.committed.gross).toBe('120.00');
    const history = await AuditEvent.findAll({ where: { jobId: job.id, action: 'estimate.quote_agreed' } });
    expect(history.map((h) => h.summary)[0]).toMatch(/^Quote agreed by phone with Rowan Tillett .*1 line, £120\.00 incl\. VAT \(Rang at lunchtime\.\)$/);
    const again = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Rowan Tillett', agreedAt: at, note: '', estimateVersion: (ok.body as EstimateDto).version });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/Nothing in the quote waits for the owner/);
  });

  it('when an agreed line is changed, then the quote is "changed", only the unchanged lines count, and a sent request holding the quote is replaced', async () => {
    const { job, est } = await jobWithQuote({});
    const ok = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Rowan Tillett', agreedAt: new Date(Date.now() - 60_000).toISOString(), note: '', estimateVersion: est.version });
    const agreed = ok.body as EstimateDto;
    // Unchanged save: still agreed.
    const same = await manager.put(`/api/jobs/${job.id}/estimate`, { version: agreed.version, lines: agreed.lines, accessTasks: [] });
    expect((same.body as EstimateDto).quote.state).toBe('agreed');
    // A new line: the quote changed, the old line still counts.
    const added = await manager.put(`/api/jobs/${job.id}/estimate`, { version: (same.body as EstimateDto).version, lines: [...agreed.lines, fee({ description: 'Propeller check', amount: '20.00' })], accessTasks: [] });
    expect((added.body as EstimateDto).quote).toMatchObject({ state: 'changed', awaitingGross: '24.00' });
    expect((added.body as EstimateDto).priced.committed.gross).toBe('120.00');
    const { r } = await sendQuote(job.id);
    expect((await ApprovalRequest.findByPk(r.id))!.snapshot.quote).toMatchObject({ changeOf: 'change', gross: '24.00' });
    // The changed line's price changes again while the request is out: the request is replaced.
    const now = await estimate(job.id);
    const repriced = now.lines.map((l) => (l.description === 'Propeller check' ? { ...l, amount: '25.00' } : l));
    expect((await manager.put(`/api/jobs/${job.id}/estimate`, { version: now.version, lines: repriced, accessTasks: [] })).status).toBe(200);
    const old = await ApprovalRequest.findByPk(r.id);
    expect(old!.state).toBe('replaced');
    const next = await ApprovalRequest.findByPk(old!.replacedById!);
    expect(next).toMatchObject({ state: 'sent', includesQuote: true, gross: '30.00' });
    // Changing the agreed line itself unagrees it too: nothing counts, and the open request is replaced
    // by one holding both lines (£90 + £25 → £138.00 incl. VAT).
    const later = await estimate(job.id);
    const cheaper = later.lines.map((l) => (l.description === 'Annual inspection' ? { ...l, amount: '90.00' } : l));
    const saved = (await manager.put(`/api/jobs/${job.id}/estimate`, { version: later.version, lines: cheaper, accessTasks: [] })).body as EstimateDto;
    expect(saved.priced.committed.gross).toBe('0.00');
    expect(saved.quote.state).toBe('sent');
    expect((await ApprovalRequest.findByPk(next!.id))!.state).toBe('replaced');
    expect(await ApprovalRequest.findByPk(saved.quote.openRequestId!)).toMatchObject({ state: 'sent', gross: '138.00' });
  });
});

describe('automatic moves never claim work nobody did', () => {
  it('when findings are sent while the checklist is unfinished, then the job stays inspecting and the request simply waits', async () => {
    const { job, finding } = await jobWithQuote({ finding: true, checks: 'open' });
    const { r } = await sendQuote(job.id, [finding!.id]);
    expect(r.state).toBe('sent');
    expect((await Job.findByPk(job.id))!.state).toBe('inspecting');
  });

  it('when the owner decides everything but the checklist is unfinished, then work does not start; with it finished and the quote agreed, it does', async () => {
    const open = await jobWithQuote({ finding: true, checks: 'open', state: 'awaiting_owner' });
    const s1 = await sendQuote(open.job.id, [open.finding!.id]);
    expect((await decide(s1.token, s1.page, { [QUOTE_ITEM_ID]: 'approve', [open.finding!.id]: 'approve' })).status).toBe(200);
    expect((await Job.findByPk(open.job.id))!.state).toBe('awaiting_owner');

    const done = await jobWithQuote({ finding: true, checks: 'done', state: 'awaiting_owner' });
    const s2 = await sendQuote(done.job.id, [done.finding!.id]);
    // The quote declined: work does not start either.
    expect((await decide(s2.token, s2.page, { [QUOTE_ITEM_ID]: 'decline', [done.finding!.id]: 'approve' })).status).toBe(200);
    expect((await Job.findByPk(done.job.id))!.state).toBe('awaiting_owner');

    const good = await jobWithQuote({ finding: true, checks: 'done', state: 'awaiting_owner' });
    const s3 = await sendQuote(good.job.id, [good.finding!.id]);
    expect((await decide(s3.token, s3.page, { [QUOTE_ITEM_ID]: 'approve', [good.finding!.id]: 'approve' })).status).toBe(200);
    expect((await Job.findByPk(good.job.id))!.state).toBe('in_work');
  });
});

describe('staff are told about decisions', () => {
  it('when the owner declines an airworthiness item with a note, then the manager gets an e-mail with a strong first line, the job is flagged, and marking it seen clears the flag', async () => {
    const { job, finding } = await jobWithQuote({ finding: true, checks: 'open', category: 'airworthiness' });
    const { token, page } = await sendQuote(job.id, [finding!.id]);
    expect((await decide(token, page, { [QUOTE_ITEM_ID]: 'approve', [finding!.id]: 'decline' }, { [finding!.id]: 'please ring me' })).status).toBe(200);
    const mail = await waitForMail(a.users.manager.email, (m) => m.text.includes(`/jobs/${job.id}`), 30_000);
    expect(mail.subject).toMatch(/^Action needed: /);
    expect(mail.text.split('\n')[0]).toMatch(/^ACTION NEEDED: the owner declined F-1 Exhaust spring cracked, an airworthiness item\./);
    expect(mail.text).toContain('“please ring me”');
    expect(mail.text).toContain('the quote: approved, £120.00 incl. VAT');
    expect(mail.text).toContain('F-1 Exhaust spring cracked: declined');
    const flagged = (await manager.get(`/api/jobs/${job.id}`)).body as JobDto;
    expect(flagged.decisionsToSee).toMatchObject({ requests: 1, declinedAirworthiness: true, ownerNote: true });
    const listed = (await manager.get(`/api/jobs?q=${encodeURIComponent(job.number)}`)).body.items as JobDto[];
    expect(listed.find((j) => j.id === job.id)!.decisionsToSee).toMatchObject({ requests: 1, declinedAirworthiness: true });
    const seen = await manager.post(`/api/jobs/${job.id}/decisions-seen`);
    expect(seen.status).toBe(200);
    expect((seen.body as JobDto).decisionsToSee).toBeNull();
    expect((await ApprovalRequest.findOne({ where: { jobId: job.id } }))!.seenBy).toBe(a.users.manager.id);
  });
});

describe('forbidden moves: 409 with the reason, nothing written', () => {
  it('when a job is moved where its table does not allow, then 409 and no state or history changes', async () => {
    const job = await makeJob(a.workshop.id, owner().aircraft.id, 'booked_in');
    const before = await AuditEvent.count({ where: { jobId: job.id } });
    const res = await manager.post(`/api/jobs/${job.id}/transition`, { to: 'closed', version: job.version });
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ code: 'invalid_transition', message: 'A job that is booked in cannot move to closed.' });
    expect((await Job.findByPk(job.id))!.state).toBe('booked_in');
    expect(await AuditEvent.count({ where: { jobId: job.id } })).toBe(before);
  });

  it('when an approved finding is withdrawn, then 409 and it stays approved', async () => {
    const job = await makeJob(a.workshop.id, owner().aircraft.id, 'in_work');
    const f = await makeFinding(job, { state: 'approved' });
    const res = await manager.post(`/api/jobs/${job.id}/findings/${f.id}/withdraw`, { version: f.version, reason: 'Not needed' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('invalid_transition');
    expect(res.body.error.message).toBe('A finding that is approved cannot become withdrawn.');
    expect((await Finding.findByPk(f.id))!.state).toBe('approved');
  });

  it('when a decided request is revoked or re-sent, then 409 and it stays decided', async () => {
    const { job } = await jobWithQuote({ checks: 'done' });
    const { r, token, page } = await sendQuote(job.id);
    expect((await decide(token, page, { [QUOTE_ITEM_ID]: 'approve' })).status).toBe(200);
    const before = await AuditEvent.count({ where: { jobId: job.id } });
    const revoke = await manager.post(`/api/approval-requests/${r.id}/revoke`);
    expect(revoke.status).toBe(409);
    expect(revoke.body.error).toMatchObject({ code: 'invalid_transition', message: 'An approval request that is decided cannot become link revoked.' });
    const resend = await manager.post(`/api/approval-requests/${r.id}/resend`);
    expect(resend.status).toBe(409);
    expect((await ApprovalRequest.findByPk(r.id))!.state).toBe('decided');
    expect(await AuditEvent.count({ where: { jobId: job.id } })).toBe(before);
  });
});

import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QUOTE_ITEM_ID, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type SendForApprovalResultDto, type WorkshopDepositPolicy } from '@wingstage/shared';
import { AuditEvent, DepositRequest, JobChecklistItem } from '../src/models/index.js';
import { decideTokenFromMail, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, waitForMail, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/* The workshop's deposit policy raises a deposit request on the owner's decision (once per decision and kind). */
let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await server?.close();
});

const anon = () => request(server.app);
const fee = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm => ({ id: randomUUID(), stage: 'inspection', kind: 'fee', description: 'Annual inspection', amount: '100.00', vatRate: 'standard', ...l }) as EstimateLineInputForm;

async function workshopWith(policy: WorkshopDepositPolicy) {
  const w = await makeWorkshop('Policy');
  const admin = await signIn(server.app, w.users.admin.email);
  const ws = (await admin.get('/api/workshop')).body;
  expect((await admin.patch('/api/workshop', { version: ws.version, settings: { depositPolicy: policy } })).status).toBe(200);
  return { w, manager: await signIn(server.app, w.users.manager.email) };
}

/** A £100 + VAT inspection fee and a finding of `findingNet` + VAT, sent to the owner together. */
async function sendQuote(w: WorkshopFixture, manager: Client, findingNet = '50.00') {
  const job = await makeJob(w.workshop.id, w.owners[0].aircraft.id, 'inspecting');
  const f = await makeFinding(job, { title: 'Exhaust spring cracked', category: 'recommended' });
  await JobChecklistItem.create({ workshopId: w.workshop.id, jobId: job.id, sortOrder: 0, section: 'Engine', text: 'Compression check', limit: null, result: 'pass', recordedAt: new Date() });
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [fee({}), fee({ stage: 'discovered', findingId: f.id, description: 'New spring', amount: findingNet })], accessTasks: [] });
  expect(saved.status).toBe(200);
  const est = (await manager.get(`/api/jobs/${job.id}/estimate`)).body as EstimateDto;
  const res = await manager.post(`/api/jobs/${job.id}/approval-requests`, { includeQuote: true, findingIds: [f.id], message: '', estimateVersion: est.version });
  expect(res.status).toBe(201);
  const r = (res.body as SendForApprovalResultDto).request!;
  const token = await decideTokenFromMail(w.owners[0].customer.email, r.id, 30_000);
  const page = (await anon().get(`/api/decide/${token}`)).body as DecisionPageDto;
  return { job, finding: f, r, token, page };
}
const decide = (token: string, page: DecisionPageDto, d: Record<string, 'approve' | 'decline'>) =>
  anon().post(`/api/decide/${token}`).send({ snapshotHash: page.snapshotHash, typedName: 'Owner One', decisions: Object.entries(d).map(([itemId, decision]) => ({ itemId, decision, note: '' })) });

describe('deposits raised by the workshop’s policy', () => {
  it('when the owner accepts the quote and the policy asks 25 % of it, then one deposit of a quarter of the quote is asked, e-mailed and shown on the decision page', async () => {
    const { w } = await workshopWith({ kind: 'quote_percent', percent: '25' });
    const { job, finding, r, token, page } = await sendQuote(w, await signIn(server.app, w.users.manager.email));
    expect((await decide(token, page, { [QUOTE_ITEM_ID]: 'approve', [finding.id]: 'decline' })).status).toBe(200);
    // £100 at 20 % → £120 [HMRC "Calculating VAT"]; 25 % of £120.00 = £30.00 (half-up to the penny).
    const deposits = await DepositRequest.findAll({ where: { jobId: job.id } });
    expect(deposits).toHaveLength(1);
    expect(deposits[0]).toMatchObject({ origin: 'quote_accepted', amount: '30.00', currency: 'GBP', state: 'waiting', approvalRequestId: r.id, reason: 'Deposit of 25% on the accepted quote of £120.00' });
    expect(deposits[0]!.vatMix).toEqual([{ rate: '20', gross: '120.00' }]);
    expect(await AuditEvent.count({ where: { jobId: job.id, action: 'deposit.requested', actorUserId: null } })).toBe(1);
    await waitForMail(w.owners[0].customer.email, (m) => m.subject.includes('a deposit of £30.00'));
    const shown = await anon().get(`/api/decide/${token}/deposits`);
    expect(shown.body).toEqual({ jobId: job.id, deposits: [{ id: deposits[0]!.id, amount: '30.00', currency: 'GBP', reason: deposits[0]!.reason, state: 'waiting' }] });
    // The same decision again is refused and raises nothing more.
    expect((await decide(token, page, { [QUOTE_ITEM_ID]: 'approve', [finding.id]: 'decline' })).status).toBe(409);
    expect(await DepositRequest.count({ where: { jobId: job.id } })).toBe(1);
  });

  it('when approved work is above the threshold, then the policy’s share of it is asked; below it, or declined, nothing is', async () => {
    const { w, manager } = await workshopWith({ kind: 'approved_work_percent', percent: '50', threshold: '100.00' });
    const big = await sendQuote(w, manager, '150.00');
    expect((await decide(big.token, big.page, { [QUOTE_ITEM_ID]: 'approve', [big.finding.id]: 'approve' })).status).toBe(200);
    // The finding £150 + 20 % VAT = £180.00 is above £100.00; half of it is £90.00. The quote is not counted as new work.
    expect(await DepositRequest.findAll({ where: { jobId: big.job.id }, raw: true })).toEqual([expect.objectContaining({ origin: 'work_approved', amount: '90.00', reason: 'Deposit of 50% on the approved work of £180.00' })]);

    const small = await sendQuote(w, manager, '60.00');
    expect((await decide(small.token, small.page, { [QUOTE_ITEM_ID]: 'approve', [small.finding.id]: 'approve' })).status).toBe(200);
    expect(await DepositRequest.count({ where: { jobId: small.job.id } })).toBe(0);

    const declined = await sendQuote(w, manager, '150.00');
    expect((await decide(declined.token, declined.page, { [QUOTE_ITEM_ID]: 'approve', [declined.finding.id]: 'decline' })).status).toBe(200);
    expect(await DepositRequest.count({ where: { jobId: declined.job.id } })).toBe(0);
  });

  it('when the policy is none, then no deposit is asked; an unknown decision link shows no deposits', async () => {
    const { w, manager } = await workshopWith({ kind: 'none' });
    const s = await sendQuote(w, manager);
    expect((await decide(s.token, s.page, { [QUOTE_ITEM_ID]: 'approve', [s.finding.id]: 'approve' })).status).toBe(200);
    expect(await DepositRequest.count({ where: { jobId: s.job.id } })).toBe(0);
    expect((await anon().get(`/api/decide/${s.token}/deposits`)).body.deposits).toEqual([]);
    expect((await anon().get(`/api/decide/${'A'.repeat(43)}/deposits`)).status).toBe(404);
  });
});

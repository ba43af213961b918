import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { priceChoice, sumAmounts, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type SendForApprovalResultDto } from '@wingstage/shared';
import { ApprovalRequest } from '../src/models/index.js';
import { decideTokenFromMail, makeFinding, makeJob, mailsTo, makeWorkshop, signIn, startTestServer, type TestServer } from './helpers.js';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await server?.close();
});


const tokenOf = (email: string, requestId: string) => decideTokenFromMail(email, requestId, 45_000);

/*
 * VAT Notice 700 §17.5 lets a business work VAT on the invoice total and round it down to a whole
 * penny, or (read with HMRC manual VATREC12030) to the nearest penny, half up [derived]:
 *
 *   inspection scope £10.03 → VAT 2.006: down 2.00 (12.03), nearest 2.01 (12.04)
 *   F-1 approved     £20.03 → VAT 4.006: down 4.00 (24.03), nearest 4.01 (24.04)
 *   F-2 declined     £7.50
 *   estimate after deciding: £30.06 → VAT 6.012 → 6.01 either way: £36.07
 *
 * Adding the two parts would give 36.06 (down) or 36.08 (nearest).
 */
describe('the decision page\'s new total is the estimate\'s committed total after deciding', () => {
  it.each([
    ['invoice-down', '36.06'],
    ['invoice-nearest', '36.08'],
  ] as const)('when the workshop rounds VAT %s on the invoice total and the owner approves one finding and declines the other, then both show £36.07 (not %s)', async (rounding, partsAdded) => {
    const a = await makeWorkshop(`New total ${rounding}`);
    await a.workshop.update({ settings: { ...a.workshop.settings, vatRounding: rounding } });
    const manager = await signIn(server.app, a.users.manager.email);
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
    const [keep, skip] = [await makeFinding(job, { title: 'Fairing bracket cracked' }), await makeFinding(job, { title: 'Placard faded' })];
    const line = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm =>
      ({ id: randomUUID(), stage: 'discovered', kind: 'fee', description: 'Work', vatRate: 'standard', ...l }) as EstimateLineInputForm;
    const first = await manager.put(`/api/jobs/${job.id}/estimate`, {
      version: 0,
      lines: [
        line({ stage: 'inspection', description: 'Annual inspection', amount: '10.03' }),
        line({ findingId: keep.id, description: 'Replace the bracket', amount: '20.03' }),
        line({ findingId: skip.id, description: 'New placard', amount: '7.50' }),
      ],
      accessTasks: [],
    });
    expect(first.status).toBe(200);
    // The owner agreed the quote by phone, so it counts as agreed so far.
    const saved = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Owner One', agreedAt: new Date(Date.now() - 60_000).toISOString(), note: '', estimateVersion: (first.body as EstimateDto).version });
    expect(saved.status).toBe(200);
    const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [keep.id, skip.id], message: '', estimateVersion: (saved.body as EstimateDto).version });
    expect(sent.status).toBe(201);
    const token = await tokenOf(a.owners[0].customer.email, (sent.body as SendForApprovalResultDto).request!.id);
    const page = (await request(server.app).get(`/api/decide/${token}`)).body as DecisionPageDto;
    expect(page.snapshot.rounding).toBe(rounding);

    const choice = { [keep.id]: 'approve', [skip.id]: 'decline' } as const;
    // Every figure the page shows comes from priceChoice on the snapshot's basis.
    const shown = priceChoice(page.snapshot.basis, choice);

    const res = await request(server.app)
      .post(`/api/decide/${token}`)
      .send({ snapshotHash: page.snapshotHash, typedName: 'Owner One', decisions: [{ itemId: keep.id, decision: 'approve', note: '' }, { itemId: skip.id, decision: 'decline', note: '' }] });
    expect(res.status).toBe(200);
    const est = (await manager.get(`/api/jobs/${job.id}/estimate`)).body as EstimateDto;

    expect(est.priced.committed.gross).toBe('36.07');
    expect(shown.newTotal.gross).toBe(est.priced.committed.gross);
    expect(shown.agreedSoFar.gross).toBe(est.priced.quoted.gross);
    // "Agreed so far" and "Approving now" add up to it on the page, and the approved item is all of "approving now".
    expect(sumAmounts([shown.agreedSoFar.gross, shown.approvingNow.gross], 'GBP')).toBe('36.07');
    expect(shown.items.find((i) => i.id === keep.id)!.gross).toBe(shown.approvingNow.gross);
    // Adding the two parts' own totals would have missed by a penny.
    expect(sumAmounts([shown.agreedSoFar.gross, rounding === 'invoice-down' ? '24.03' : '24.04'], 'GBP')).toBe(partsAdded);
    // The receipt the page then shows is priced the same way.
    const after = (await request(server.app).get(`/api/decide/${token}`)).body as DecisionPageDto;
    const decided = Object.fromEntries(after.decisions!.map((d) => [d.itemId, d.decision]));
    expect(priceChoice(after.snapshot.basis, decided).newTotal.gross).toBe('36.07');
  });
});

import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareAmounts, sumAmounts, type DecisionPageDto, type EstimateDto, type EstimateLineInputForm, type SendForApprovalResultDto } from '@wingstage/shared';
import { ApprovalRequest } from '../src/models/index.js';
// The owner's page prices each choice in the browser; this is that very code.
import { priceChoice, runningTotal } from '../../client/src/features/decide/components/running-total.js';
import { decideTokenFromMail, makeFinding, makeJob, mailsTo, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let manager: Client;

beforeAll(async () => {
  server = await startTestServer();
  a = await makeWorkshop('Pricing basis');
  manager = await signIn(server.app, a.users.manager.email);
});
afterAll(async () => {
  await server?.close();
});


const tokenOf = (email: string, requestId: string) => decideTokenFromMail(email, requestId, 30_000);

/**
 * A job whose two findings share the cowling (an access task nothing committed pays for), one of
 * which also needs the propeller off (already paid for by the inspection scope), with a marked-up
 * part, a discounted labour line and a reduced-rate sub-contract line; a third finding waits
 * outside the request. The workshop rounds VAT on the invoice total (the default).
 */
async function sharedAccessJob() {
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const [plugs, hose, other] = [await makeFinding(job, { title: 'Plugs worn' }), await makeFinding(job, { title: 'Hose hardened' }), await makeFinding(job, { title: 'Placard faded' })];
  const cowl = randomUUID();
  const prop = randomUUID();
  const line = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm => ({ id: randomUUID(), stage: 'discovered', kind: 'labour', description: 'Work', vatRate: 'standard', ...l }) as EstimateLineInputForm;
  const lines: EstimateLineInputForm[] = [
    line({ stage: 'inspection', description: 'Inspection', quantity: '2', labourRateCode: 'standard', ratePerHour: '62.00' }),
    line({ stage: 'inspection', description: 'Propeller check', quantity: '0.5', ratePerHour: '62.00', accessTaskId: prop }),
    line({ findingId: plugs.id, description: 'Fit plugs', quantity: '0.5', ratePerHour: '62.00', accessTaskId: cowl }),
    line({ findingId: plugs.id, description: 'Check the prop flange', quantity: '0.25', ratePerHour: '62.00', accessTaskId: prop }),
    line({ findingId: plugs.id, kind: 'part', description: 'Spark plugs', quantity: '4', unitCost: '6.875' }),
    line({ findingId: hose.id, description: 'Replace hose', quantity: '1', ratePerHour: '62.00', accessTaskId: cowl, discountPercent: '10' }),
    line({ findingId: hose.id, kind: 'subcontract', description: 'Hose made up', amount: '40.00', vatRate: 'reduced' }),
    line({ findingId: other.id, kind: 'fee', description: 'New placard', amount: '12.35' }),
  ];
  const accessTasks = [
    { id: cowl, name: 'Cowling off', hours: '1.5', ratePerHour: '62.00', vatRate: 'standard' as const },
    { id: prop, name: 'Propeller off', hours: '0.75', ratePerHour: '62.00', vatRate: 'standard' as const },
  ];
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines, accessTasks });
  expect(saved.status).toBe(200);
  const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [plugs.id, hose.id], message: '', estimateVersion: (saved.body as EstimateDto).version });
  expect(sent.status).toBe(201);
  const requestId = (sent.body as SendForApprovalResultDto).request!.id;
  const token = await tokenOf(a.owners[0].customer.email, requestId);
  const page = (await request(server.app).get(`/api/decide/${token}`)).body as DecisionPageDto;
  return { job, plugs, hose, other, cowl, prop, token, page };
}

describe('the snapshot carries what the engine needs to price any choice', () => {
  it('when findings sharing an access task are sent, then the snapshot holds their engine lines, the access tasks and which ones committed work pays for', async () => {
    const { page, plugs, hose, cowl, prop } = await sharedAccessJob();
    const s = page.snapshot;
    expect(s.pricingBasis).toEqual({
      vatRates: { standard: '20', reduced: '5', zero: '0' },
      // 1.5 h × 62.00 and 0.75 h × 62.00.
      accessTasks: expect.arrayContaining([
        { id: cowl, name: 'Cowling off', net: '93.00', vatRate: 'standard' },
        { id: prop, name: 'Propeller off', net: '46.50', vatRate: 'standard' },
      ]),
      accessPaid: [prop],
      // The inspection scope as engine inputs (2 h and 0.5 h × 62.00), with the propeller work it pays for,
      // so the page can price the whole estimate after any choice.
      committed: {
        lines: [
          { stage: 'inspection', kind: 'labour', net: '124.00', vatRate: 'standard', accessTaskId: null },
          { stage: 'inspection', kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: prop },
        ],
        accessTasks: [{ id: prop, net: '46.50', vatRate: 'standard' }],
      },
    });
    expect(s.pricingBasis!.accessTasks).toHaveLength(2);
    const f1 = s.findings.find((f) => f.findingId === plugs.id)!;
    const f2 = s.findings.find((f) => f.findingId === hose.id)!;
    expect(f1.lines).toEqual([
      { description: 'Fit plugs', kind: 'labour', quantity: '0.50', net: '31.00', vatRate: 'standard', accessTaskId: cowl },
      { description: 'Check the prop flange', kind: 'labour', quantity: '0.25', net: '15.50', vatRate: 'standard', accessTaskId: prop },
      // 4 × 6.875 = 27.50, + 20 % mark-up = 33.00.
      { description: 'Spark plugs', kind: 'part', quantity: '4.00', net: '33.00', vatRate: 'standard', accessTaskId: null },
    ]);
    expect(f2.lines).toEqual([
      // 62.00 less 10 %.
      { description: 'Replace hose', kind: 'labour', quantity: '1.00', net: '55.80', vatRate: 'standard', accessTaskId: cowl },
      // 40.00 + 10 % mark-up.
      { description: 'Hose made up', kind: 'subcontract', quantity: '1.00', net: '44.00', vatRate: 'reduced', accessTaskId: null },
    ]);
    // The propeller work is paid for by the inspection scope: named as covered, never charged here.
    expect(f1.accessCovered).toEqual(['Propeller off']);
  });

  it("when every finding is approved, then the page's own engine computation equals the server's totals.thisRequest", async () => {
    const { page, plugs, hose } = await sharedAccessJob();
    const s = page.snapshot;
    const all = { [plugs.id]: 'approve', [hose.id]: 'approve' } as const;
    const priced = priceChoice(s, all)!;
    expect(priced.stages.approved).toEqual(s.totals.thisRequest);
    expect(runningTotal(s, all)).toMatchObject({ exact: true, thisRequestAsChosen: s.totals.thisRequest.gross, undecided: s.totals.undecidedElsewhere.gross });
    // The cowling once: less than the two findings' own prices added up.
    expect(compareAmounts(s.totals.thisRequest.gross, sumAmounts([f(s, plugs.id).price.gross, f(s, hose.id).price.gross], 'GBP'))).toBe(-1);
    // Nothing chosen: the whole request undecided, and each finding's price on its own as frozen.
    expect(priceChoice(s, {})!.stages.discovered).toEqual(s.totals.thisRequest);
    for (const x of s.findings) expect(priceChoice(s, {})!.findings.find((p) => p.findingId === x.findingId)!.price).toEqual(x.price);
  });

  it("when the owner approves one finding and declines the other, then the page's figure is the approved work the estimate then holds", async () => {
    const { page, job, plugs, hose, token } = await sharedAccessJob();
    const s = page.snapshot;
    const choice = { [plugs.id]: 'approve', [hose.id]: 'decline' } as const;
    const shown = runningTotal(s, choice);
    const res = await request(server.app)
      .post(`/api/decide/${token}`)
      .send({ snapshotHash: page.snapshotHash, typedName: 'Owner One', decisions: [{ findingId: plugs.id, decision: 'approve', note: '' }, { findingId: hose.id, decision: 'decline', note: '' }] });
    expect(res.status).toBe(200);
    const est = (await manager.get(`/api/jobs/${job.id}/estimate`)).body as EstimateDto;
    // Nothing was approved on this job before, so the approved stage is exactly this request as chosen, cowling included.
    expect(priceChoice(s, choice)!.stages.approved).toEqual(est.priced.stages.approved);
    expect(shown.thisRequestAsChosen).toBe(est.priced.stages.approved.gross);
    // And the page's new total is the estimate's committed total: inspection scope, propeller and all.
    expect(shown).toMatchObject({ wholeInvoice: true, newTotal: est.priced.committed.gross });
  });
});

const f = (s: DecisionPageDto['snapshot'], id: string) => s.findings.find((x) => x.findingId === id)!;

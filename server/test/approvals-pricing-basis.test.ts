import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  QUOTE_ITEM_ID,
  priceChoice,
  sumAmounts,
  type Choice,
  type DecisionPageDto,
  type EstimateDto,
  type EstimateLineInputForm,
  type SendForApprovalResultDto,
} from '@wingstage/shared';
import { decideTokenFromMail, makeFinding, makeJob, mailsTo, makeWorkshop, waitForMail, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

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
const gbp = (a: string) => `£${a}`;

/**
 * A job whose quote was agreed by phone and then changed (a propeller check added, needing the
 * propeller off), with two findings sharing the cowling; one of them also needs the propeller off.
 * A marked-up part, a discounted labour line and a reduced-rate sub-contract line; a third finding
 * waits outside the request. The request holds the changed quote and the two findings.
 */
async function sharedAccessJob() {
  const owner = a.owners[0];
  const job = await makeJob(a.workshop.id, owner.aircraft.id, 'inspecting');
  const [plugs, hose, other] = [await makeFinding(job, { title: 'Plugs worn' }), await makeFinding(job, { title: 'Hose hardened' }), await makeFinding(job, { title: 'Placard faded' })];
  const cowl = randomUUID();
  const prop = randomUUID();
  const line = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm => ({ id: randomUUID(), stage: 'discovered', kind: 'labour', description: 'Work', vatRate: 'standard', ...l }) as EstimateLineInputForm;
  const first = [line({ stage: 'inspection', description: 'Inspection', quantity: '2', labourRateCode: 'standard', ratePerHour: '62.00' })];
  const accessTasks = [
    { id: cowl, name: 'Cowling off', hours: '1.5', ratePerHour: '62.00', vatRate: 'standard' as const },
    { id: prop, name: 'Propeller off', hours: '0.75', ratePerHour: '62.00', vatRate: 'standard' as const },
  ];
  const s1 = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: first, accessTasks });
  expect(s1.status).toBe(200);
  const agreed = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: owner.customer.name, agreedAt: new Date(Date.now() - 3_600_000).toISOString(), note: '', estimateVersion: (s1.body as EstimateDto).version });
  expect(agreed.status).toBe(200);
  const lines: EstimateLineInputForm[] = [
    ...((agreed.body as EstimateDto).lines as unknown as EstimateLineInputForm[]),
    line({ stage: 'inspection', description: 'Propeller check', quantity: '0.5', ratePerHour: '62.00', accessTaskId: prop }),
    line({ findingId: plugs.id, description: 'Fit plugs', quantity: '0.5', ratePerHour: '62.00', accessTaskId: cowl }),
    line({ findingId: plugs.id, description: 'Check the prop flange', quantity: '0.25', ratePerHour: '62.00', accessTaskId: prop }),
    line({ findingId: plugs.id, kind: 'part', description: 'Spark plugs', quantity: '4', unitCost: '6.875' }),
    line({ findingId: hose.id, description: 'Replace hose', quantity: '1', ratePerHour: '62.00', accessTaskId: cowl, discountPercent: '10' }),
    line({ findingId: hose.id, kind: 'subcontract', description: 'Hose made up', amount: '40.00', vatRate: 'reduced' }),
    line({ findingId: other.id, kind: 'fee', description: 'New placard', amount: '12.35' }),
  ];
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: (agreed.body as EstimateDto).version, lines, accessTasks });
  expect(saved.status).toBe(200);
  expect((saved.body as EstimateDto).quote.state).toBe('changed');
  const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { includeQuote: true, findingIds: [plugs.id, hose.id], message: '', estimateVersion: (saved.body as EstimateDto).version });
  expect(sent.status).toBe(201);
  const requestId = (sent.body as SendForApprovalResultDto).request!.id;
  const token = await tokenOf(owner.customer.email, requestId);
  const page = (await request(server.app).get(`/api/decide/${token}`)).body as DecisionPageDto;
  return { job, plugs, hose, other, cowl, prop, token, page, requestId, email: owner.customer.email };
}

describe('the snapshot carries what priceChoice needs to price any choice', () => {
  it('when the changed quote and findings sharing opening-up are sent, then the basis holds the agreed work, each item with the engine lines, and the opening-up agreed work does not pay for', async () => {
    const { page, plugs, hose, cowl, prop } = await sharedAccessJob();
    const s = page.snapshot;
    expect(s.version).toBe(3);
    expect(s.basis.vatRates).toEqual({ standard: '20', reduced: '5', zero: '0' });
    // Agreed so far: the first inspection line, 2 h × 62.00, agreed by phone.
    expect(s.basis.committed).toEqual({ lines: [{ kind: 'labour', net: '124.00', vatRate: 'standard', accessTaskId: null }], accessTasks: [] });
    expect(s.basis.items).toEqual([
      { id: QUOTE_ITEM_ID, kind: 'quote', lines: [{ kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: prop }] },
      {
        id: plugs.id,
        kind: 'finding',
        lines: [
          { kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: cowl },
          { kind: 'labour', net: '15.50', vatRate: 'standard', accessTaskId: prop },
          // 4 × 6.875 = 27.50, + 20 % mark-up = 33.00.
          { kind: 'part', net: '33.00', vatRate: 'standard', accessTaskId: null },
        ],
      },
      {
        id: hose.id,
        kind: 'finding',
        lines: [
          // 62.00 less 10 %; 40.00 + 10 % mark-up at the reduced rate.
          { kind: 'labour', net: '55.80', vatRate: 'standard', accessTaskId: cowl },
          { kind: 'subcontract', net: '44.00', vatRate: 'reduced', accessTaskId: null },
        ],
      },
    ]);
    // 1.5 h × 62.00 and 0.75 h × 62.00: neither is paid by agreed work.
    expect(s.basis.accessTasks).toEqual([
      { id: cowl, name: 'Cowling off', net: '93.00', vatRate: 'standard' },
      { id: prop, name: 'Propeller off', net: '46.50', vatRate: 'standard' },
    ]);
    expect(s.quote).toMatchObject({ changeOf: 'change', lines: [{ description: 'Propeller check', net: '31.00' }] });
    // The stored figures are priceChoice with everything approved: items and opening-up add up to it.
    const all = priceChoice(s.basis, { [QUOTE_ITEM_ID]: 'approve', [plugs.id]: 'approve', [hose.id]: 'approve' });
    expect(s.totals).toMatchObject({ agreedSoFar: all.agreedSoFar, ifAllApproved: all.ifAllApproved, approvingNow: all.approvingNow });
    expect(sumAmounts([s.quote!.gross, ...s.findings.map((f) => f.gross), ...s.totals.openingUp.map((o) => o.gross)], 'GBP')).toBe(s.totals.approvingNow.gross);
  });
});

const CHOICES: Choice[] = [];
for (const q of ['approve', 'decline'] as const) for (const p of ['approve', 'decline'] as const) for (const h of ['approve', 'decline'] as const) CHOICES.push({ q, p, h });

describe('the send e-mail, the snapshot and the estimate after the decision agree with priceChoice for every subset', () => {
  it.each(CHOICES.map((c) => [`${c.q} quote, ${c.p} plugs, ${c.h} hose`, c] as const))('when the owner decides %s, then the figures agree everywhere', async (_label, c) => {
    const { page, plugs, hose, job, token, email } = await sharedAccessJob();
    const s = page.snapshot;
    // The send e-mail states the all-approved total from the snapshot, each item and the opening-up once.
    const mail = (await mailsTo(email)).find((m) => m.text.includes(token))!;
    expect(mail.text).toContain(`${gbp(s.totals.approvingNow.gross)} incl. VAT if you approve all of it`);
    for (const f of s.findings) expect(mail.text).toContain(`${f.number} ${f.title} (Recommended): ${gbp(f.gross)} incl. VAT`);
    for (const o of s.totals.openingUp) expect(mail.text).toContain(`charged once: ${o.name}, ${gbp(o.gross)} incl. VAT`);

    const choice: Choice = { [QUOTE_ITEM_ID]: c.q, [plugs.id]: c.p, [hose.id]: c.h };
    const shown = priceChoice(s.basis, choice);
    const res = await request(server.app)
      .post(`/api/decide/${token}`)
      .send({ snapshotHash: page.snapshotHash, typedName: 'Owner One', decisions: Object.entries(choice).map(([itemId, decision]) => ({ itemId, decision, note: '' })) });
    expect(res.status).toBe(200);
    const est = (await manager.get(`/api/jobs/${job.id}/estimate`)).body as EstimateDto;
    // The estimate after the decision is exactly what the page said.
    expect(est.priced.committed).toEqual(shown.newTotal);
    expect(est.quote.state).toBe(c.q === 'approve' ? 'agreed' : 'declined');
    // The components the owner saw add up to what was approved.
    expect(sumAmounts([...shown.items.filter((i) => i.choice === 'approve').map((i) => i.gross), ...shown.openingUp.filter((o) => o.charged).map((o) => o.gross)], 'GBP')).toBe(shown.approvingNow.gross);
    // The receipt e-mail states the same two figures.
    const receipt = await waitForMail(email, (m) => m.subject.includes('your decisions are recorded') && m.text.includes(token), 30_000);
    expect(receipt.text).toContain(`Approved now: ${gbp(shown.approvingNow.gross)} incl. VAT. Agreed so far on this job: ${gbp(shown.newTotal.gross)} incl. VAT.`);
  });
});

import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JOB_STATES } from '@wingstage/shared';
import sharp from 'sharp';
import { Aircraft, ApprovalRequest, CreditNote, DepositRequest, Invoice, Payment, Finding, FindingPhoto, Job, JobTemplate, Part, User, boundSequelize } from '../src/models/index.js';
import { DEMO_PASSWORD, demoSignIns } from '../../db/seeders/demo-data.js';
import { findDemoWorkshop, removeDemo, seedDemo } from '../../db/seeders/demo.js';
import { startStripeFake, type RunningFake } from '@wingstage/stripe-fake';
import { stripeClient } from '../src/payments/stripe-client.js';
import { startTestServer, testConfig, TEST_STRIPE_KEY, waitForMail, type TestServer } from './helpers.js';

let server: TestServer;
let fake: RunningFake;

beforeAll(async () => {
  server = await startTestServer();
  // The demo's paid deposit is taken through the SDK from an in-process fake (no webhooks).
  fake = await startStripeFake({ apiKey: TEST_STRIPE_KEY, port: 0 });
  await seedDemo(boundSequelize(), new Date(), server.parts.photos, stripeClient(testConfig({ STRIPE_API_URL: fake.url })));
});
afterAll(async () => {
  await removeDemo(boundSequelize());
  await fake?.stop();
  await server?.close();
});

describe('demo seed', () => {
  it('when seeded, then the invented workshop has jobs in every state and only Q- registrations', async () => {
    const w = (await findDemoWorkshop())!;
    expect(w).not.toBeNull();
    expect(w.vatNumber).toBe('GB999000173');
    const jobs = await Job.findAll({ where: { workshopId: w.id } });
    expect(new Set(jobs.map((j) => j.state))).toEqual(new Set(JOB_STATES));
    expect(jobs.map((j) => j.number).sort()).toEqual(jobs.map((_, i) => `J-${String(i + 1).padStart(4, '0')}`));
    const regs = (await Aircraft.findAll({ where: { workshopId: w.id } })).map((a) => a.registration).sort();
    expect(regs).toEqual(['Q-BRKA', 'Q-BRKE', 'Q-MRLW', 'Q-SALT']);
  });

  it('when seeded twice, then the second run changes nothing', async () => {
    const w = (await findDemoWorkshop())!;
    // Counted within the demo workshop: other test files add rows to the same database meanwhile.
    const counts = async () => ({
      users: await User.count({ where: { workshopId: w.id } }),
      jobs: await Job.count({ where: { workshopId: w.id } }),
      parts: await Part.count({ where: { workshopId: w.id } }),
      templates: await JobTemplate.count({ where: { workshopId: w.id } }),
      findings: await Finding.count({ where: { workshopId: w.id } }),
    });
    const before = await counts();
    const photos = await FindingPhoto.count({ where: { workshopId: w.id } });
    expect(await seedDemo(boundSequelize(), new Date(), server.parts.photos)).toBe(false);
    expect(await FindingPhoto.count({ where: { workshopId: w.id } })).toBe(photos);
    expect(await counts()).toEqual(before);
  });

  it('when seeded, then the catalogue, templates and example limits are there, labelled as examples', async () => {
    const agent = request.agent(server.app);
    await agent.post('/api/auth/sign-in').send({ email: 'manager@brackenfold.example', password: DEMO_PASSWORD });
    const suppliers = (await agent.get('/api/suppliers')).body.items.map((s: { kind: string }) => s.kind).sort();
    expect(suppliers).toEqual(['parts', 'propeller_shop', 'sail_loft']);
    expect((await agent.get('/api/parts?pageSize=100')).body.total).toBeGreaterThanOrEqual(10);
    const templates = (await agent.get('/api/templates')).body as { id: string; jobType: string }[];
    expect(templates.map((t) => t.jobType).sort()).toEqual(['annual_permit_inspection', 'engine_service_100h', 'engine_service_200h', 'gearbox_inspection', 'wing_strip_recover']);
    const limits = [];
    for (const t of templates) for (const c of (await agent.get(`/api/templates/${t.id}`)).body.checklist) if (c.limit) limits.push(c.limit);
    expect(limits.length).toBeGreaterThanOrEqual(4);
    expect(limits.every((l: { source: string }) => /^Example/.test(l.source) && /common practice/.test(l.source))).toBe(true);
  });

  it('when seeded, then the job awaiting the owner has priced findings sharing an access task, and the declined airworthiness finding blocks release', async () => {
    const agent = request.agent(server.app);
    const s = await agent.post('/api/auth/sign-in').send({ email: 'manager@brackenfold.example', password: DEMO_PASSWORD });
    const waiting = (await agent.get('/api/jobs?state=awaiting_owner')).body.items[0];
    const est = (await agent.get(`/api/jobs/${waiting.id}/estimate`)).body;
    const findings = (await agent.get(`/api/jobs/${waiting.id}/findings`)).body as { id: string; state: string }[];
    // Priced, then sent to the owner in the demo's waiting approval request.
    expect(findings.map((f) => f.state)).toEqual(['sent', 'sent', 'sent']);
    expect(est.priced.undecided.findings).toBe(3);
    const shared = est.accessTasks[0].id;
    const users = new Set(est.lines.filter((l: { accessTaskId: string | null }) => l.accessTaskId === shared).map((l: { findingId: string }) => l.findingId));
    expect(users.size).toBe(2);
    expect(est.priced.accessTasks[0].remediesIfAllApproved).toBe(2);
    const checklist = (await agent.get(`/api/jobs/${waiting.id}/checklist`)).body as { limitCheck: string | null; measuredValue: string | null }[];
    expect(checklist.find((c) => c.measuredValue !== null)).toMatchObject({ measuredValue: '0.9500', limitCheck: 'above' });

    const inWork = (await agent.get('/api/jobs?state=in_work')).body.items[0];
    const move = await agent.post(`/api/jobs/${inWork.id}/transition`).set('X-CSRF-Token', s.body.csrfToken).send({ to: 'ready_for_release', version: inWork.version });
    expect(move.status).toBe(409);
    expect(move.body.error.message).toMatch(/declined by the owner/);
    const declinedLines = (await agent.get(`/api/jobs/${inWork.id}/estimate`)).body.lines.filter((l: { stage: string }) => l.stage === 'declined');
    expect(declinedLines.length).toBeGreaterThan(0);

    const closed = (await agent.get('/api/jobs?state=closed')).body.items[0];
    const closedEst = (await agent.get(`/api/jobs/${closed.id}/estimate`)).body;
    expect(Number(closedEst.priced.stages.approved.gross)).toBeGreaterThan(0);
  });

  it('when seeded, then one approval request waits for the owner (its link re-sent by the manager opens) and the in-work job has a decided one', async () => {
    const agent = request.agent(server.app);
    const s = await agent.post('/api/auth/sign-in').send({ email: 'manager@brackenfold.example', password: DEMO_PASSWORD });
    const waiting = (await agent.get('/api/jobs?state=awaiting_owner')).body.items[0];
    const requests = (await agent.get(`/api/jobs/${waiting.id}/approval-requests`)).body as { id: string; state: string; findingIds: string[]; gross: string }[];
    expect(requests).toHaveLength(1);
    expect(requests[0]).toMatchObject({ state: 'sent' });
    expect(requests[0]!.findingIds).toHaveLength(3);
    const resent = await agent.post(`/api/approval-requests/${requests[0]!.id}/resend`).set('X-CSRF-Token', s.body.csrfToken);
    expect(resent.status).toBe(200);
    // Earlier runs mailed the same demo owner: take the link whose hash is this request's.
    const stored = await ApprovalRequest.findByPk(requests[0]!.id);
    const sha = (x: string) => createHash('sha256').update(x).digest('hex');
    const mail = await waitForMail('elspeth@owners.example', (m) => sha(/\/decide\/([A-Za-z0-9_-]+)/.exec(m.text)?.[1] ?? '') === stored!.tokenHash);
    const token = /\/decide\/([A-Za-z0-9_-]+)/.exec(mail.text)![1]!;
    const page = await request(server.app).get(`/api/decide/${token}`);
    expect(page.status).toBe(200);
    expect(page.body.snapshot.registration).toBe('Q-BRKE');
    expect(page.body.snapshot.totals.approvingNow.gross).toBe(requests[0]!.gross);
    // Each finding in the waiting request has its one demo photo, named in the snapshot and served through the link.
    const snapPhotos = (page.body.snapshot.findings as { photos: { id: string; width: number; height: number }[] }[]).map((f) => f.photos);
    expect(snapPhotos.map((p) => p.length)).toEqual([1, 1, 1]);
    const first = snapPhotos[0]![0]!;
    const pic = await request(server.app).get(`/api/decide/${token}/photos/${first.id}?size=full`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(pic.status).toBe(200);
    expect(await sharp(pic.body as Buffer).metadata()).toMatchObject({ format: 'jpeg', width: first.width, height: first.height });
    const staffView = (await agent.get(`/api/jobs/${waiting.id}/findings`)).body as { photos: { id: string; uploadedByName: string }[] }[];
    expect(staffView.map((f) => f.photos.map((p) => p.id))).toEqual(snapPhotos.map((p) => p.map((x) => x.id)));
    expect(staffView[0]!.photos[0]!.uploadedByName).toBe('Priya Tollervey');

    const inWork = (await agent.get('/api/jobs?state=in_work')).body.items[0];
    const decided = (await agent.get(`/api/jobs/${inWork.id}/approval-requests`)).body as { state: string; decidedByName: string }[];
    expect(decided).toMatchObject([{ state: 'decided', decidedByName: 'Hazel Brambury' }]);
  });

  it('when a demo owner signs in with the printed password, then they see only their own aircraft', async () => {
    const owner = demoSignIns().find((u) => u.email === 'elspeth@owners.example')!;
    expect(owner.password).toBe(DEMO_PASSWORD);
    const agent = request.agent(server.app);
    expect((await agent.post('/api/auth/sign-in').send({ email: owner.email, password: owner.password })).status).toBe(200);
    const list = await agent.get('/api/aircraft');
    expect(list.body.items.map((a: { registration: string }) => a.registration)).toEqual(['Q-BRKE']);
    const jobs = await agent.get('/api/jobs?state=awaiting_owner');
    expect(jobs.body.items.map((j: { title: string }) => j.title)).toEqual(['100-hour engine service']);
  });

  it('when a new job is booked in the seeded workshop, then its number follows the seeded ones', async () => {
    const agent = request.agent(server.app);
    const s = await agent.post('/api/auth/sign-in').send({ email: 'manager@brackenfold.example', password: DEMO_PASSWORD });
    const aircraft = (await agent.get('/api/aircraft?q=Q-SALT')).body.items[0];
    const res = await agent.post('/api/jobs').set('X-CSRF-Token', s.body.csrfToken).send({ aircraftId: aircraft.id, title: 'Radio check', type: 'other', bookedInOn: '2026-12-02' });
    expect(res.status).toBe(201);
    expect(res.body.number).toBe('J-0010');
  });

  it('when seeded, then one deposit is paid by card (in the processor too, with its fee and net) and one is waiting', async () => {
    const w = (await findDemoWorkshop())!;
    const deposits = await DepositRequest.findAll({ where: { workshopId: w.id }, order: [['amount', 'ASC'], ['reason', 'ASC']] });
    // The deposits seeder's two (paid by card, waiting), the invoices seeder's deposit paid by bank
    // transfer before its invoice, and accounts' planted short payment (kept, flagged, still waiting).
    expect(deposits.map((d) => [d.amount, d.state, d.reason])).toEqual([
      ['20.00', 'paid', 'Exhaust springs ordered (not stocked)'],
      ['85.00', 'waiting', 'Spark plugs, oil filter and a carburettor kit ordered'],
      ['300.00', 'paid', 'Fabric, tapes and dope ordered for the re-cover'],
      ['300.00', 'waiting', 'Propeller sent out for overhaul'],
    ]);
    const paid = await Payment.findOne({ where: { depositRequestId: deposits[2]!.id } });
    // UK standard card fee 1.5 % + £0.20 (sources.md, "Card payments"): £300.00 → £4.70, net £295.30.
    expect(paid).toMatchObject({ state: 'succeeded', amount: '300.00', fee: '4.70', net: '295.30', method: 'card' });
    const pi = await stripeClient(testConfig({ STRIPE_API_URL: fake.url })).paymentIntents.retrieve(paid!.stripePaymentIntentId!);
    expect(pi).toMatchObject({ status: 'succeeded', amount_received: 30000, metadata: { payment_id: paid!.id } });
  });

  it('when seeded, then one invoice is issued with a deposit deducted and owed, one is paid after a credit note, each numbered in its own sequence', async () => {
    const demo = await findDemoWorkshop();
    const invoices = await Invoice.findAll({ where: { workshopId: demo!.id }, order: [['seq', 'ASC']] });
    expect(invoices.map((i) => i.number)).toEqual(['INV-00001', 'INV-00002']);
    const [owed, paid] = invoices as [Invoice, Invoice];
    expect(owed.state).toBe('issued');
    expect(owed.document.deposits).toHaveLength(1);
    expect(new Date(owed.document.deposits[0]!.receivedOn) < new Date(owed.document.issuedOn)).toBe(true);
    expect(paid.state).toBe('paid');
    expect((await Job.findByPk(paid.jobId))!.state).toBe('paid');
    expect((await Job.findByPk(owed.jobId))!.state).toBe('invoiced');
    const notes = await CreditNote.findAll({ where: { workshopId: demo!.id } });
    expect(notes.map((c) => [c.number, c.invoiceId])).toEqual([['CN-00001', paid.id]]);
  });
});

import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { EstimateDto, EstimateLineInputForm, JobDto, SendForApprovalResultDto } from '@wingstage/shared';
import type { Scope } from '../src/services/scope.js';
import { getEstimate } from '../src/services/estimates.service.js';
import { getJob } from '../src/services/jobs.service.js';
import { Estimate, Part, Supplier, User, type Job } from '../src/models/index.js';
import { PASSWORD, decideTokenFromMail, makeFinding, makeJob, makeWorkshop, signIn, startTestServer, uniq, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/*
 * GET /api/jobs/:id and GET /api/jobs/:id/estimate answer from one statement that also checks the
 * session. These tests hold them to the ordinary service reads (getJob, getEstimate: the ORM path
 * the writes still use), field by field, on a job with every kind of line: an agreed quote,
 * findings approved, declined (airworthiness, with a note) and still waiting, an access task, a
 * part with a buying cost and a subcontract. And the session and access rules still hold.
 */

let server: TestServer;
let a: WorkshopFixture;
let b: WorkshopFixture;
let manager: Client;
let owner: Client;
let otherOwner: Client;
let bAdmin: Client;
let job: Job;

const scopeOf = (u: User): Scope => ({ workshopId: u.workshopId, userId: u.id, role: u.role, customerId: u.customerId });

async function signInRaw(email: string): Promise<{ cookie: string; csrf: string }> {
  const res = await request(server.app).post('/api/auth/sign-in').send({ email, password: PASSWORD });
  expect(res.status).toBe(200);
  const cookie = (res.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; ');
  return { cookie, csrf: res.body.csrfToken as string };
}

beforeAll(async () => {
  server = await startTestServer();
  [a, b] = await Promise.all([makeWorkshop('One statement'), makeWorkshop('Elsewhere')]);
  [manager, owner, otherOwner, bAdmin] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.owners[0].user.email),
    signIn(server.app, a.owners[1].user.email),
    signIn(server.app, b.users.admin.email),
  ]);

  job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const keep = await makeFinding(job, { title: 'Fairing bracket cracked' });
  const skip = await makeFinding(job, { title: 'Aileron hinge worn', category: 'airworthiness' });
  const later = await makeFinding(job, { title: 'Placard faded' });
  const supplier = await Supplier.create({ workshopId: a.workshop.id, name: `Fabric loft ${uniq()}`, kind: 'sail_loft' } as never);
  const part = await Part.create({ workshopId: a.workshop.id, partNumber: `BR-${uniq()}`, description: 'Bracket', unitCost: '12.3456', supplierId: supplier.id, leadTimeDays: 3 } as never);
  const taskId = randomUUID();
  const line = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm =>
    ({ id: randomUUID(), stage: 'inspection', kind: 'fee', description: 'Work', vatRate: 'standard', ...l }) as EstimateLineInputForm;
  const first = await manager.put(`/api/jobs/${job.id}/estimate`, {
    version: 0,
    lines: [
      line({ kind: 'labour', description: 'Annual inspection', quantity: '6.5', labourRateCode: 'standard', ratePerHour: '62.00', discountPercent: '10' }),
      line({ kind: 'part', description: 'Bracket', quantity: '2', partId: part.id, unitCost: '12.3456', supplierId: supplier.id, markupPercent: '25' } as Partial<EstimateLineInputForm>),
      line({ kind: 'subcontract', description: 'Fabric test', amount: '45.00', vatRate: 'zero' }),
      line({ stage: 'discovered', findingId: keep.id, description: 'Replace the bracket', amount: '20.03' }),
      line({ stage: 'discovered', kind: 'labour', findingId: skip.id, description: 'New hinge', quantity: '1.25', labourRateCode: 'standard', ratePerHour: '62.00', accessTaskId: taskId }),
      line({ stage: 'discovered', findingId: later.id, description: 'New placard', amount: '7.50', vatRate: 'reduced' }),
    ],
    accessTasks: [{ id: taskId, name: 'Remove the aileron', hours: '0.75', labourRateCode: 'standard', ratePerHour: '62.00', vatRate: 'standard' }],
  });
  expect(first.status).toBe(200);
  const agreed = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, {
    agreedWith: 'Owner One',
    agreedAt: new Date(Date.now() - 60_000).toISOString(),
    note: '',
    estimateVersion: (first.body as EstimateDto).version,
  });
  expect(agreed.status).toBe(200);
  const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [keep.id, skip.id], message: '', estimateVersion: (agreed.body as EstimateDto).version });
  expect(sent.status).toBe(201);
  const token = await decideTokenFromMail(a.owners[0].customer.email, (sent.body as SendForApprovalResultDto).request!.id, 45_000);
  const page = await request(server.app).get(`/api/decide/${token}`);
  expect(page.status).toBe(200);
  const decided = await request(server.app)
    .post(`/api/decide/${token}`)
    .send({
      snapshotHash: page.body.snapshotHash,
      typedName: 'Owner One',
      decisions: [
        { itemId: keep.id, decision: 'approve', note: '' },
        { itemId: skip.id, decision: 'decline', note: 'I will fly it to another workshop for this.' },
      ],
    });
  expect(decided.status).toBe(200);
}, 120_000);
afterAll(async () => {
  await server?.close();
});

describe('the estimate read in one statement', () => {
  it('when the manager and the owner read a job with approved, declined and waiting findings, then the answer equals the ordinary read field by field', async () => {
    for (const [client, user] of [
      [manager, a.users.manager],
      [owner, a.owners[0].user],
    ] as const) {
      const res = await client.get(`/api/jobs/${job.id}/estimate`);
      expect(res.status).toBe(200);
      const ordinary = JSON.parse(JSON.stringify(await getEstimate(scopeOf(user), job.id))) as EstimateDto;
      expect(res.body).toEqual(ordinary);
      // The case is not empty: every stage is there, the quote is agreed, a cost shows only to staff.
      const body = res.body as EstimateDto;
      expect(new Set(body.lines.map((l) => l.stage))).toEqual(new Set(['inspection', 'discovered', 'approved', 'declined']));
      expect(body.quote.state).not.toBe('not_sent');
      expect(body.quote.agreedAt).not.toBeNull();
      expect(body.accessTasks).toHaveLength(1);
      const partLine = body.lines.find((l) => l.kind === 'part')!;
      expect(partLine.unitCost).toBe(user.role === 'owner' ? null : '12.3456');
      // Decimals stay decimal strings, as PostgreSQL wrote them.
      expect(body.lines.find((l) => l.kind === 'labour' && l.stage === 'inspection')!.quantity).toBe('6.50');
    }
  });

  it('when a job has no estimate row yet, then the read makes it and answers as before', async () => {
    const fresh = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'booked_in');
    expect(await Estimate.count({ where: { jobId: fresh.id } })).toBe(0);
    const res = await manager.get(`/api/jobs/${fresh.id}/estimate`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ jobId: fresh.id, version: 0, lines: [], accessTasks: [] });
    expect(await Estimate.count({ where: { jobId: fresh.id } })).toBe(1);
    expect((await manager.get(`/api/jobs/${fresh.id}/estimate`)).body).toEqual(res.body);
  });
});

describe('the job read in one statement', () => {
  it('when the manager and the owner read the job, then the answer equals the ordinary read, the decisions to see for staff only', async () => {
    const staff = await manager.get(`/api/jobs/${job.id}`);
    expect(staff.status).toBe(200);
    expect(staff.body).toEqual(JSON.parse(JSON.stringify(await getJob(scopeOf(a.users.manager), job.id))));
    expect((staff.body as JobDto).decisionsToSee).toMatchObject({ requests: 1, declinedAirworthiness: true, ownerNote: true });
    const own = await owner.get(`/api/jobs/${job.id}`);
    expect(own.status).toBe(200);
    expect(own.body).toEqual(JSON.parse(JSON.stringify(await getJob(scopeOf(a.owners[0].user), job.id))));
    expect((own.body as JobDto).decisionsToSee).toBeNull();
  });
});

describe('who may read (both reads)', () => {
  const paths = () => [`/api/jobs/${job.id}`, `/api/jobs/${job.id}/estimate`];

  it("when another workshop's admin or another owner asks, or the job does not exist, then 404", async () => {
    for (const p of paths()) {
      expect((await bAdmin.get(p)).status).toBe(404);
      expect((await otherOwner.get(p)).status).toBe(404);
    }
    expect((await manager.get(`/api/jobs/${randomUUID()}`)).status).toBe(404);
    expect((await manager.get(`/api/jobs/${randomUUID()}/estimate`)).status).toBe(404);
  });

  it('when the id is not an id, then 400 after the usual session check; without a session, 401', async () => {
    expect((await manager.get('/api/jobs/not-an-id')).status).toBe(400);
    expect((await manager.get('/api/jobs/not-an-id/estimate')).status).toBe(400);
    for (const p of [...paths(), '/api/jobs/not-an-id']) expect((await request(server.app).get(p)).status).toBe(401);
    expect((await request(server.app).get(paths()[0]!).set('Cookie', 'ws_session=forged.token.here')).status).toBe(401);
  });

  it('when the session is signed out, or the user is deactivated, then the same cookie gets 401 at once', async () => {
    const s = await signInRaw(a.users.engineer.email);
    for (const p of paths()) expect((await request(server.app).get(p).set('Cookie', s.cookie)).status).toBe(200);
    const out = await request(server.app).post('/api/auth/sign-out').set('Cookie', s.cookie).set('X-CSRF-Token', s.csrf);
    expect(out.status).toBeLessThan(300);
    for (const p of paths()) expect((await request(server.app).get(p).set('Cookie', s.cookie)).status).toBe(401);

    const t = await signInRaw(a.users.accounts.email);
    for (const p of paths()) expect((await request(server.app).get(p).set('Cookie', t.cookie)).status).toBe(200);
    await User.update({ active: false }, { where: { id: a.users.accounts.id } });
    for (const p of paths()) expect((await request(server.app).get(p).set('Cookie', t.cookie)).status).toBe(401);
    await User.update({ active: true }, { where: { id: a.users.accounts.id } });
    // A new session epoch (a password change signs every device out) ends the old cookie too.
    await User.increment({ sessionEpoch: 1 }, { where: { id: a.users.accounts.id } });
    for (const p of paths()) expect((await request(server.app).get(p).set('Cookie', t.cookie)).status).toBe(401);
  });
});

import { randomUUID } from 'node:crypto';
import zlib from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QUOTE_ITEM_ID, type AccessTaskInput, type EstimateDto, type EstimateLineInputForm, type SendForApprovalResultDto } from '@wingstage/shared';
import type { Scope } from '../src/services/scope.js';
import { getEstimate } from '../src/services/estimates.service.js';
import { expireDue } from '../src/services/approvals/index.js';
import { EstimateAnswers, encodingFor, tagOf } from '../src/routes/estimate-read.js';
import { ApprovalRequest, Job, User, boundSequelize } from '../src/models/index.js';
import { decideTokenFromMail, makeJob, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/*
 * GET /api/jobs/:id/estimate sends an answer it made earlier only while PostgreSQL's key for it
 * (the estimate's revision, moved by triggers in every writing transaction, and the workshop's
 * pricing revision) is unchanged. For every kind of write, with the answers warm before it, the
 * answer after it equals the ordinary uncached read (getEstimate) field by field, for the manager
 * and the owner; where the write changes the estimate, the answer is shown to have changed.
 */

let server: TestServer;
let a: WorkshopFixture;
let manager: Client;
let owner: Client;
let otherOwner: Client;
let admin: Client;
let job: Job;
let url: string;

const scopeOf = (u: User): Scope => ({ workshopId: u.workshopId, userId: u.id, role: u.role, customerId: u.customerId });
const line = (l: Partial<EstimateLineInputForm>): EstimateLineInputForm =>
  ({ id: randomUUID(), stage: 'inspection', kind: 'fee', description: 'Work', vatRate: 'standard', ...l }) as EstimateLineInputForm;

/** What the estimate builder sends back: the editable lines (inspection and discovered) and the tasks. */
function saveBody(e: EstimateDto, lines: EstimateLineInputForm[] = editable(e), accessTasks: AccessTaskInput[] = e.accessTasks as AccessTaskInput[]) {
  return { version: e.version, lines, accessTasks };
}
function editable(e: EstimateDto): EstimateLineInputForm[] {
  return e.lines
    .filter((l) => l.stage === 'inspection' || l.stage === 'discovered')
    .map((l) => {
      const { agreedAt: _at, agreedHow: _how, ...rest } = l;
      return rest as unknown as EstimateLineInputForm;
    });
}

async function current(): Promise<EstimateDto> {
  return (await manager.get(url)).body as EstimateDto;
}

/** Both audiences read the estimate (their answers are then held by the app). */
async function warm(): Promise<{ staff: EstimateDto; own: EstimateDto }> {
  const staff = await manager.get(url);
  const own = await owner.get(url);
  expect(staff.status).toBe(200);
  expect(own.status).toBe(200);
  return { staff: staff.body as EstimateDto, own: own.body as EstimateDto };
}

/** The answer through the app equals the ordinary read, for the manager and the owner. */
async function expectOrdinary(label: string, clients: [Client, Client] = [manager, owner]): Promise<EstimateDto> {
  let staffBody: EstimateDto | null = null;
  for (const [client, user] of [
    [clients[0], a.users.manager],
    [clients[1], a.owners[0].user],
  ] as const) {
    const res = await client.get(url);
    expect(res.status, label).toBe(200);
    const ordinary = JSON.parse(JSON.stringify(await getEstimate(scopeOf(user), job.id))) as EstimateDto;
    expect(res.body, `${label} (${user.role})`).toEqual(ordinary);
    if (user.role !== 'owner') staffBody = res.body as EstimateDto;
  }
  return staffBody!;
}

/**
 * Warm, write, compare. `changes`: the write changes the answer, and the test shows it did (so an
 * answer kept from before the write would have failed the comparison).
 */
async function afterWrite(label: string, write: () => Promise<void>, changes: boolean): Promise<EstimateDto> {
  const before = await warm();
  // Held now: the same key again gives the same answer and tag.
  const tag = (await manager.get(url)).headers.etag as string;
  expect(tag).toMatch(/^"/);
  await write();
  const after = await expectOrdinary(label);
  if (changes) {
    expect(after, `${label}: the write changes the answer`).not.toEqual(before.staff);
    expect((await manager.get(url)).headers.etag, label).not.toBe(tag);
  }
  return after;
}

async function send(body: { findingIds?: string[]; includeQuote?: boolean }): Promise<string> {
  const e = await current();
  const res = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [], includeQuote: false, message: '', ...body, estimateVersion: e.version });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return (res.body as SendForApprovalResultDto).request!.id;
}

async function flag(title: string): Promise<string> {
  const res = await manager.post(`/api/jobs/${job.id}/findings`, { title, location: 'Tailplane', category: 'recommended', seen: 'Seen at the inspection.' });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as string;
}

async function price(findingId: string, amount: string): Promise<void> {
  const e = await current();
  const res = await manager.put(url, saveBody(e, [...editable(e), line({ stage: 'discovered', findingId, description: `Remedy ${amount}`, amount })]));
  expect(res.status, JSON.stringify(res.body)).toBe(200);
}

async function decide(requestId: string, decisions: Record<string, 'approve' | 'decline'>): Promise<void> {
  const token = await decideTokenFromMail(a.owners[0].customer.email, requestId, 45_000);
  const page = await request(server.app).get(`/api/decide/${token}`);
  expect(page.status).toBe(200);
  const res = await request(server.app)
    .post(`/api/decide/${token}`)
    .send({ snapshotHash: page.body.snapshotHash, typedName: 'Owner One', decisions: Object.entries(decisions).map(([itemId, decision]) => ({ itemId, decision, note: '' })) });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
}

beforeAll(async () => {
  server = await startTestServer();
  a = await makeWorkshop('Kept answers');
  [manager, owner, otherOwner, admin] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.owners[0].user.email),
    signIn(server.app, a.owners[1].user.email),
    signIn(server.app, a.users.admin.email),
  ]);
  job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  url = `/api/jobs/${job.id}/estimate`;
}, 60_000);
afterAll(async () => {
  await server?.close();
});

describe('the kept estimate answer after every kind of write', () => {
  it('when the estimate, its lines, tasks, findings, requests, decisions, the workshop or the job change, then the next answer equals the ordinary read', async () => {
    const taskId = randomUUID();
    const task = { id: taskId, name: 'Remove the cowling', hours: '0.50', labourRateCode: 'standard', ratePerHour: '62.00', vatRate: 'standard' } as AccessTaskInput;
    let e = await afterWrite(
      'estimate saved',
      async () => {
        const res = await manager.put(url, {
          version: 0,
          lines: [
            line({ kind: 'labour', description: 'Annual inspection', quantity: '6.5', labourRateCode: 'standard', ratePerHour: '62.00', discountPercent: '10' }),
            line({ kind: 'part', description: 'Oil filter', quantity: '1', unitCost: '12.3456', markupPercent: '25' } as Partial<EstimateLineInputForm>),
            line({ kind: 'subcontract', description: 'Propeller balance', amount: '45.00', vatRate: 'zero' }),
            line({ kind: 'labour', description: 'Cowling work', quantity: '1', labourRateCode: 'standard', ratePerHour: '62.00', accessTaskId: taskId }),
          ],
          accessTasks: [task],
        });
        expect(res.status, JSON.stringify(res.body)).toBe(200);
      },
      true,
    );
    expect(e.lines).toHaveLength(4);

    const extra = line({ description: 'Placard renewal', amount: '8.40' });
    e = await afterWrite('line added', async () => void expect((await manager.put(url, saveBody(e, [...editable(e), extra]))).status).toBe(200), true);
    expect(e.lines.map((l) => l.id)).toContain(extra.id);
    e = await afterWrite('line removed', async () => void expect((await manager.put(url, saveBody(e, editable(e).filter((l) => l.id !== extra.id)))).status).toBe(200), true);
    expect(e.lines.map((l) => l.id)).not.toContain(extra.id);
    e = await afterWrite('access task changed', async () => void expect((await manager.put(url, saveBody(e, editable(e), [{ ...task, hours: '1.25' }]))).status).toBe(200), true);
    expect(e.accessTasks[0]!.hours).toBe('1.25');

    // The quote put to the owner (its request open), then agreed by the owner on the link.
    let quoteRequest = '';
    e = await afterWrite('quote sent to the owner', async () => void (quoteRequest = await send({ includeQuote: true })), true);
    expect(e.quote.openRequestId).toBe(quoteRequest);
    e = await afterWrite('owner agrees the quote', () => decide(quoteRequest, { [QUOTE_ITEM_ID]: 'approve' }), true);
    expect(e.quote.agreedAt).not.toBeNull();

    // A finding flagged, priced, put to the owner and approved; another declined.
    let keep = '';
    await afterWrite('finding flagged', async () => void (keep = await flag('Elevator hinge worn')), false);
    e = await afterWrite('finding priced', () => price(keep, '20.03'), true);
    let findingRequest = '';
    await afterWrite('finding put to the owner', async () => void (findingRequest = await send({ findingIds: [keep] })), false);
    e = await afterWrite('owner approves the finding', () => decide(findingRequest, { [keep]: 'approve' }), true);
    expect(e.lines.some((l) => l.findingId === keep && l.stage === 'approved')).toBe(true);
    const skip = await flag('Seat rail worn');
    await price(skip, '31.50');
    const declineRequest = await send({ findingIds: [skip] });
    e = await afterWrite('owner declines the finding', () => decide(declineRequest, { [skip]: 'decline' }), true);
    expect(e.lines.some((l) => l.findingId === skip && l.stage === 'declined')).toBe(true);

    // A changed quote sent again: its request expires; the next one is revoked.
    e = await current();
    expect((await manager.put(url, saveBody(e, [...editable(e), line({ description: 'Spinner refit', amount: '15.00' })]))).status).toBe(200);
    const expiring = await send({ includeQuote: true });
    await ApprovalRequest.update({ expiresAt: new Date(Date.now() - 60_000) }, { where: { id: expiring } });
    e = await afterWrite('request expires', async () => void expect(await expireDue(new Date(), { jobId: job.id })).toBe(1), true);
    expect(e.quote.openRequestId).toBeNull();
    const revoked = await send({ includeQuote: true });
    expect((await current()).quote.openRequestId).toBe(revoked);
    e = await afterWrite('request revoked', async () => void expect((await manager.post(`/api/approval-requests/${revoked}/revoke`)).status).toBe(200), true);
    expect(e.quote.openRequestId).toBeNull();

    // The workshop: its settings through the API, its VAT rates by hand in the database.
    e = await afterWrite(
      'workshop settings changed',
      async () => {
        const w = await admin.get('/api/workshop');
        const res = await admin.patch('/api/workshop', { version: w.body.version, settings: { partsMarkupPercent: '35', subcontractMarkupPercent: '15', vatRounding: 'line-down-tenth' } });
        expect(res.status, JSON.stringify(res.body)).toBe(200);
      },
      true,
    );
    e = await afterWrite(
      'workshop VAT rates changed',
      async () => void (await boundSequelize().query(`UPDATE workshops SET vat_rates = '{"standard": "17.5", "reduced": "5", "zero": "0"}'::jsonb WHERE id = $1`, { bind: [a.workshop.id] })),
      true,
    );

    // Agreed by phone (the spinner line still waits for the owner).
    e = await afterWrite(
      'quote agreed by phone',
      async () => {
        const res = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Owner One', agreedAt: new Date(Date.now() - 60_000).toISOString(), note: '', estimateVersion: (await current()).version });
        expect(res.status, JSON.stringify(res.body)).toBe(200);
      },
      true,
    );
    expect(e.lines.filter((l) => l.stage === 'inspection').every((l) => l.agreedAt !== null)).toBe(true);

    await afterWrite(
      'job state change',
      async () => {
        const res = await manager.post(`/api/jobs/${job.id}/transition`, { to: 'in_work', version: (await manager.get(`/api/jobs/${job.id}`)).body.version });
        expect(res.status, JSON.stringify(res.body)).toBe(200);
      },
      false,
    );

    // A write made straight in the database (no route, no service) is seen as well.
    await afterWrite('line changed in the database', async () => void (await boundSequelize().query(`UPDATE estimate_lines SET description = 'Spinner refit and check' WHERE job_id = $1 AND description = 'Spinner refit'`, { bind: [job.id] })), true);
  }, 240_000);

  it('when 20 reads arrive at once right after a write, then every one gets the new answer', async () => {
    await warm();
    const e = await current();
    const added = line({ description: 'Trim tab check', amount: '11.11' });
    expect((await manager.put(url, saveBody(e, [...editable(e), added]))).status).toBe(200);
    const answers = await Promise.all(Array.from({ length: 20 }, () => manager.get(url)));
    const ordinary = JSON.parse(JSON.stringify(await getEstimate(scopeOf(a.users.manager), job.id))) as EstimateDto;
    expect(ordinary.lines.map((l) => l.id)).toContain(added.id);
    for (const res of answers) {
      expect(res.status).toBe(200);
      expect(res.body).toEqual(ordinary);
    }
  });

  it('when two app instances on one database hold answers and either writes, then neither sends the old one', async () => {
    const second = server.variant({});
    const [manager2, owner2] = await Promise.all([signIn(second, a.users.manager.email), signIn(second, a.owners[0].user.email)]);
    const both = async (label: string) => {
      await expectOrdinary(`${label}, first instance`, [manager, owner]);
      await expectOrdinary(`${label}, second instance`, [manager2, owner2]);
    };
    await both('warm');
    let e = await current();
    expect((await manager.put(url, saveBody(e, [...editable(e), line({ description: 'Strut fairing', amount: '6.20' })]))).status).toBe(200);
    await both('written through the first');
    e = (await manager2.get(url)).body as EstimateDto;
    expect((await manager2.put(url, saveBody(e, editable(e).filter((l) => l.description !== 'Strut fairing')))).status).toBe(200);
    await both('written through the second');
  });
});

describe('what the kept answer is sent as', () => {
  it('when the client takes gzip, brotli or neither, then the bytes decode to the same answer with the right headers', async () => {
    const ordinary = JSON.parse(JSON.stringify(await getEstimate(scopeOf(a.users.manager), job.id))) as EstimateDto;
    // supertest decodes gzip and brotli itself: the decoded answer, and the bytes that travelled.
    for (const enc of ['br', 'identity'] as const) {
      for (let i = 0; i < 2; i += 1) {
        const res = await manager.get(url).set('Accept-Encoding', enc);
        expect(res.status).toBe(200);
        expect(res.headers['content-encoding']).toBe(enc === 'identity' ? undefined : enc);
        expect(res.headers['content-type']).toBe('application/json; charset=utf-8');
        expect(res.headers['cache-control']).toBe('private, no-cache');
        expect(res.headers.vary).toMatch(/Accept-Encoding/);
        const plain = Buffer.byteLength(res.text, 'utf8');
        const sent = Number(res.headers['content-length']);
        if (enc === 'identity') expect(sent).toBe(plain);
        else expect(sent).toBeLessThan(plain / 2);
        expect(res.body).toEqual(ordinary);
      }
    }
    const gz = await manager.get(url).set('Accept-Encoding', 'gzip');
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gz.body).toEqual(ordinary);
  });

  it('when the browser revalidates its copy, then 304 while the estimate is unchanged and the new answer after a write', async () => {
    const first = await manager.get(url).set('Accept-Encoding', 'gzip');
    const tag = first.headers.etag as string;
    expect(tag).toMatch(/^"[A-Za-z0-9_-]{24}\.gzip"$/);
    // The tag does not carry the key's revision numbers.
    expect(tag).not.toContain(job.id);
    const again = await manager.get(url).set('Accept-Encoding', 'gzip').set('If-None-Match', tag);
    expect(again.status).toBe(304);
    // The owner's answer differs from the staff's: the staff's tag never revalidates it.
    expect((await owner.get(url).set('Accept-Encoding', 'gzip').set('If-None-Match', tag)).status).toBe(200);
    const e = await current();
    expect((await manager.put(url, saveBody(e, [...editable(e), line({ description: 'Brake bleed', amount: '9.99' })]))).status).toBe(200);
    const after = await manager.get(url).set('Accept-Encoding', 'gzip').set('If-None-Match', tag);
    expect(after.status).toBe(200);
    expect(after.headers.etag).not.toBe(tag);
    expect((after.body as EstimateDto).lines.some((l) => l.description === 'Brake bleed')).toBe(true);
  });

  it('when the session ends, another owner asks or the job is unknown, then 401 or 404 even with the answer held', async () => {
    await warm();
    expect((await otherOwner.get(url)).status).toBe(404);
    expect((await manager.get(`/api/jobs/${randomUUID()}/estimate`)).status).toBe(404);
    expect((await request(server.app).get(url)).status).toBe(401);
    const gone = await signIn(server.app, a.owners[0].user.email);
    expect((await gone.get(url)).status).toBe(200);
    expect((await gone.post('/api/auth/sign-out')).status).toBeLessThan(300);
    expect((await gone.get(url)).status).toBe(401);
    await User.update({ active: false }, { where: { id: a.owners[1].user.id } });
    expect((await otherOwner.get(url)).status).toBe(401);
    expect((await owner.get(url)).status).toBe(200);
  });
});

describe('the bound on kept answers', () => {
  it('when answers fill the bound, then the least recently read go and the bytes held never pass it', async () => {
    const body = Buffer.from(JSON.stringify(await getEstimate(scopeOf(a.users.manager), job.id)));
    expect(body.length).toBeGreaterThan(2000);
    const bound = body.length * 3 + 3000;
    const answers = new EstimateAnswers(bound);
    const keys: string[] = [];
    for (let i = 0; i < 10; i += 1) {
      const k = `${randomUUID()}.s.${i}.1`;
      const held = { key: k, tag: tagOf(k), identity: body };
      keys.push(held.key);
      answers.keep(held);
      await answers.encoded(held, 'gzip');
      expect(answers.bytes).toBeLessThanOrEqual(bound);
    }
    expect(answers.size).toBeLessThanOrEqual(3);
    expect(answers.size).toBeGreaterThan(0);
    // The newest stays; the oldest went.
    expect(answers.find(keys[9]!)).toBeDefined();
    expect(answers.find(keys[0]!)).toBeUndefined();
    // One answer larger than the whole bound is not kept at all.
    const tiny = new EstimateAnswers(1000);
    tiny.keep({ key: `${randomUUID()}.s.1.1`, tag: tagOf(`${randomUUID()}.s.1.1`), identity: body });
    expect(tiny.size).toBe(0);
    expect(tiny.bytes).toBe(0);
  });

  it('when the answer is read again with a new encoding, then its bytes count too and the newest key replaces the older for a job', async () => {
    const body = Buffer.from(JSON.stringify(await getEstimate(scopeOf(a.users.manager), job.id)));
    const answers = new EstimateAnswers(10 * 1024 * 1024);
    const jobId = randomUUID();
    const held = { key: `${jobId}.s.1.1`, tag: tagOf(`${jobId}.s.1.1`), identity: body };
    answers.keep(held);
    const plain = answers.bytes;
    const gz = await answers.encoded(held, 'gzip');
    expect(zlib.gunzipSync(gz).equals(body)).toBe(true);
    expect(answers.bytes).toBe(plain + gz.length);
    expect(answers.find(`${jobId}.s.1.1`)).toBe(held);
    expect(answers.find(`${jobId}.s.2.1`)).toBeUndefined();
    answers.keep({ key: `${jobId}.s.2.1`, tag: tagOf(`${jobId}.s.2.1`), identity: body });
    expect(answers.size).toBe(1);
    expect(answers.find(`${jobId}.s.1.1`)).toBeUndefined();
  });

  it('when the client names encodings with weights, then the choice is what the compression middleware would make', () => {
    expect(encodingFor(undefined)).toBe('identity');
    expect(encodingFor('gzip, deflate, br')).toBe('br');
    expect(encodingFor('gzip, deflate')).toBe('gzip');
    expect(encodingFor('br;q=0.5, gzip')).toBe('gzip');
    expect(encodingFor('deflate')).toBe('other');
    expect(encodingFor('identity')).toBe('identity');
    expect(encodingFor('*')).toBe('br');
    expect(encodingFor('gzip;q=0, br;q=0')).toBe('identity');
  });
});

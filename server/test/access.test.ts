import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '@wingstage/shared';
import { randomUUID } from 'node:crypto';
import { EstimateLine, JobChecklistItem, JobTemplate, Part, Supplier, User } from '../src/models/index.js';
import { sendForApproval } from '../src/services/approvals/index.js';
import { makeFinding, makeJob, makeWorkshop, passwordHash, signIn, startTestServer, uniq, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let b: WorkshopFixture;
const clients = {} as Record<Role, Client>;

beforeAll(async () => {
  server = await startTestServer();
  [a, b] = await Promise.all([makeWorkshop('Alpha'), makeWorkshop('Bravo')]);
  const roles: Role[] = ['admin', 'manager', 'engineer', 'accounts'];
  await Promise.all(roles.map(async (r) => (clients[r] = await signIn(server.app, a.users[r as Exclude<Role, 'owner'>].email))));
  clients.owner = await signIn(server.app, a.owners[0].user.email);
});
afterAll(async () => {
  await server?.close();
});

type Who = Role | 'anonymous';
const ALL: Who[] = ['anonymous', 'admin', 'manager', 'engineer', 'accounts', 'owner'];

async function invitedOwner(): Promise<User> {
  return User.create({ workshopId: a.workshop.id, email: `pending-${uniq()}@test.example`, name: 'Pending Owner', role: 'owner', passwordHash: null, customerId: a.owners[0].customer.id });
}

interface RouteCase {
  route: string;
  method: 'get' | 'post' | 'patch' | 'put';
  /** Built fresh for each caller, so one caller's write does not spoil the next. */
  req: () => Promise<{ path: string; body?: object }>;
  allowed: Role[];
  ok: number;
}

const version = async (path: string) => (await clients.admin.get(path)).body.version as number;
const STAFF: Role[] = ['admin', 'manager', 'engineer', 'accounts'];
const HANDS: Role[] = ['admin', 'manager', 'engineer'];
const ALL_SIGNED_IN: Role[] = [...STAFF, 'owner'];
const supplier = () => Supplier.create({ workshopId: a.workshop.id, name: `Prop shop ${uniq()}`, kind: 'propeller_shop' });
const part = () => Part.create({ workshopId: a.workshop.id, partNumber: `P-${uniq()}`, description: 'Split pin', unitCost: '0.2000', unitPrice: null, markupPercent: null, supplierId: null });
const templateBody = () => ({
  name: `Matrix template ${uniq()}`,
  jobType: 'other',
  lines: [{ kind: 'labour', description: 'Look-over', quantity: '1', labourRateCode: 'standard' }],
  checklist: [{ text: 'Tyre pressures' }],
});
const template = () => JobTemplate.create({ workshopId: a.workshop.id, name: `T ${uniq()}`, jobType: 'other', lines: [], checklist: [] });

/** Every route in the contract that needs a session, with who may use it (DEVELOPERS.md, HTTP contract). */
/** A finding of owner 1 priced with one fee line on an inspecting job, ready to be sent. */
async function pricedFinding() {
  const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
  const f = await makeFinding(job, { state: 'priced' });
  await EstimateLine.create({
    jobId: job.id, id: randomUUID(), workshopId: a.workshop.id, stage: 'discovered', kind: 'fee', description: 'Remedy', quantity: '1', labourRateCode: null,
    ratePerHour: null, partId: null, supplierId: null, unitCost: null, unitPrice: null, markupPercent: null, amount: '20.00', vatRate: 'standard',
    findingId: f.id, accessTaskId: null, discountPercent: null, sortOrder: 0,
  });
  return f;
}

async function sentRequest(): Promise<string> {
  const f = await pricedFinding();
  const scope = { workshopId: a.workshop.id, userId: a.users.manager.id, role: 'manager' as const, customerId: null };
  const res = await sendForApproval({ config: server.parts.config, mail: server.parts.mail, logger: server.parts.logger, photos: server.parts.photos }, scope, f.jobId, { findingIds: [f.id], includeQuote: false, message: '', estimateVersion: 0 });
  return res.request!.id;
}

const MATRIX: RouteCase[] = [
  { route: 'GET /api/auth/session', method: 'get', req: async () => ({ path: '/api/auth/session' }), allowed: ['admin', 'manager', 'engineer', 'accounts', 'owner'], ok: 200 },
  { route: 'GET /api/users', method: 'get', req: async () => ({ path: '/api/users' }), allowed: ['admin', 'manager'], ok: 200 },
  {
    route: 'POST /api/users/invitations (staff)', method: 'post',
    req: async () => ({ path: '/api/users/invitations', body: { role: 'engineer', email: `m-${uniq()}@test.example`, name: 'Matrix Engineer' } }),
    allowed: ['admin'], ok: 201,
  },
  {
    route: 'POST /api/users/invitations (owner)', method: 'post',
    req: async () => ({ path: '/api/users/invitations', body: { role: 'owner', email: `m-${uniq()}@test.example`, name: 'Matrix Owner', customerId: a.owners[0].customer.id } }),
    allowed: ['manager'], ok: 201,
  },
  { route: 'POST /api/users/:id/resend-invitation', method: 'post', req: async () => ({ path: `/api/users/${(await invitedOwner()).id}/resend-invitation` }), allowed: ['admin', 'manager'], ok: 204 },
  { route: 'PATCH /api/users/:id', method: 'patch', req: async () => ({ path: `/api/users/${a.users.accounts.id}`, body: { name: `Accounts ${uniq()}` } }), allowed: ['admin'], ok: 200 },
  { route: 'GET /api/workshop', method: 'get', req: async () => ({ path: '/api/workshop' }), allowed: ['admin', 'manager', 'engineer', 'accounts'], ok: 200 },
  { route: 'PATCH /api/workshop', method: 'patch', req: async () => ({ path: '/api/workshop', body: { version: await version('/api/workshop'), postcode: 'ZX1 1AA' } }), allowed: ['admin'], ok: 200 },
  { route: 'GET /api/customers', method: 'get', req: async () => ({ path: '/api/customers' }), allowed: ['admin', 'manager', 'engineer', 'accounts'], ok: 200 },
  { route: 'POST /api/customers', method: 'post', req: async () => ({ path: '/api/customers', body: { name: `Matrix ${uniq()}`, email: 'm@test.example' } }), allowed: ['admin', 'manager'], ok: 201 },
  { route: 'GET /api/customers/:id', method: 'get', req: async () => ({ path: `/api/customers/${a.owners[0].customer.id}` }), allowed: ['admin', 'manager', 'engineer', 'accounts'], ok: 200 },
  {
    route: 'PATCH /api/customers/:id', method: 'patch',
    req: async () => ({ path: `/api/customers/${a.owners[1].customer.id}`, body: { version: await version(`/api/customers/${a.owners[1].customer.id}`), phone: '01632 960 000' } }),
    allowed: ['admin', 'manager'], ok: 200,
  },
  { route: 'GET /api/aircraft', method: 'get', req: async () => ({ path: '/api/aircraft' }), allowed: ['admin', 'manager', 'engineer', 'accounts', 'owner'], ok: 200 },
  {
    route: 'POST /api/aircraft', method: 'post',
    req: async () => ({ path: '/api/aircraft', body: { customerId: a.owners[1].customer.id, registration: `Q-${uniq().toUpperCase().slice(0, 4)}`, type: 'Two-seat flex-wing trike' } }),
    allowed: ['admin', 'manager'], ok: 201,
  },
  { route: 'GET /api/aircraft/:id', method: 'get', req: async () => ({ path: `/api/aircraft/${a.owners[0].aircraft.id}` }), allowed: ['admin', 'manager', 'engineer', 'accounts', 'owner'], ok: 200 },
  {
    route: 'PATCH /api/aircraft/:id', method: 'patch',
    req: async () => ({ path: `/api/aircraft/${a.owners[1].aircraft.id}`, body: { version: await version(`/api/aircraft/${a.owners[1].aircraft.id}`), airframeHours: '101.5' } }),
    allowed: ['admin', 'manager'], ok: 200,
  },
  { route: 'GET /api/jobs', method: 'get', req: async () => ({ path: '/api/jobs' }), allowed: ['admin', 'manager', 'engineer', 'accounts', 'owner'], ok: 200 },
  {
    route: 'POST /api/jobs', method: 'post',
    req: async () => ({ path: '/api/jobs', body: { aircraftId: a.owners[0].aircraft.id, title: 'Matrix job', type: 'repair', bookedInOn: '2026-12-01' } }),
    allowed: ['admin', 'manager'], ok: 201,
  },
  { route: 'GET /api/jobs/:id', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}` }), allowed: ['admin', 'manager', 'engineer', 'accounts', 'owner'], ok: 200 },
  {
    route: 'PATCH /api/jobs/:id', method: 'patch',
    req: async () => ({ path: `/api/jobs/${a.owners[1].job.id}`, body: { version: await version(`/api/jobs/${a.owners[1].job.id}`), notes: `n ${uniq()}` } }),
    allowed: ['admin', 'manager'], ok: 200,
  },
  {
    route: 'POST /api/jobs/:id/transition (booked in → inspecting)', method: 'post',
    req: async () => {
      const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id);
      return { path: `/api/jobs/${job.id}/transition`, body: { to: 'inspecting', version: job.version } };
    },
    allowed: ['admin', 'manager', 'engineer'], ok: 200,
  },
  { route: 'GET /api/jobs/:id/history', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/history` }), allowed: ['admin', 'manager', 'engineer', 'accounts'], ok: 200 },
  // Catalogue, templates, estimates, checklist, findings and time.
  { route: 'GET /api/suppliers', method: 'get', req: async () => ({ path: '/api/suppliers' }), allowed: STAFF, ok: 200 },
  { route: 'POST /api/suppliers', method: 'post', req: async () => ({ path: '/api/suppliers', body: { name: `Loft ${uniq()}`, kind: 'sail_loft' } }), allowed: ['admin', 'manager'], ok: 201 },
  { route: 'PATCH /api/suppliers/:id', method: 'patch', req: async () => ({ path: `/api/suppliers/${(await supplier()).id}`, body: { version: 0, phone: '01632 960 001' } }), allowed: ['admin', 'manager'], ok: 200 },
  { route: 'GET /api/parts', method: 'get', req: async () => ({ path: '/api/parts' }), allowed: STAFF, ok: 200 },
  { route: 'POST /api/parts', method: 'post', req: async () => ({ path: '/api/parts', body: { partNumber: `M-${uniq()}`, description: 'Matrix washer', unitCost: '0.50' } }), allowed: ['admin', 'manager'], ok: 201 },
  { route: 'PATCH /api/parts/:id', method: 'patch', req: async () => ({ path: `/api/parts/${(await part()).id}`, body: { version: 0, leadTimeDays: 3 } }), allowed: ['admin', 'manager'], ok: 200 },
  { route: 'GET /api/templates', method: 'get', req: async () => ({ path: '/api/templates' }), allowed: STAFF, ok: 200 },
  { route: 'POST /api/templates', method: 'post', req: async () => ({ path: '/api/templates', body: templateBody() }), allowed: ['admin', 'manager'], ok: 201 },
  { route: 'GET /api/templates/:id', method: 'get', req: async () => ({ path: `/api/templates/${(await template()).id}` }), allowed: STAFF, ok: 200 },
  { route: 'PUT /api/templates/:id', method: 'put', req: async () => ({ path: `/api/templates/${(await template()).id}`, body: { ...templateBody(), version: 0 } }), allowed: ['admin', 'manager'], ok: 200 },
  { route: 'GET /api/jobs/:id/estimate', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/estimate` }), allowed: ALL_SIGNED_IN, ok: 200 },
  {
    route: 'PUT /api/jobs/:id/estimate', method: 'put',
    req: async () => ({ path: `/api/jobs/${(await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting')).id}/estimate`, body: { version: 0, lines: [], accessTasks: [] } }),
    allowed: ['admin', 'manager'], ok: 200,
  },
  { route: 'GET /api/jobs/:id/checklist', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/checklist` }), allowed: STAFF, ok: 200 },
  {
    route: 'PATCH /api/jobs/:id/checklist/:itemId', method: 'patch',
    req: async () => {
      const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
      const item = await JobChecklistItem.create({ workshopId: a.workshop.id, jobId: job.id, sortOrder: 0, text: 'Tyre pressures', limit: null });
      return { path: `/api/jobs/${job.id}/checklist/${item.id}`, body: { version: 0, result: 'pass' } };
    },
    allowed: HANDS, ok: 200,
  },
  { route: 'GET /api/jobs/:id/findings', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/findings` }), allowed: ALL_SIGNED_IN, ok: 200 },
  {
    route: 'POST /api/jobs/:id/findings', method: 'post',
    req: async () => ({ path: `/api/jobs/${(await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting')).id}/findings`, body: { title: 'Chafed cable', location: 'Rudder cable, rear fuselage', category: 'recommended', seen: 'Outer strands worn.' } }),
    allowed: HANDS, ok: 201,
  },
  {
    route: 'PATCH /api/jobs/:id/findings/:findingId', method: 'patch',
    req: async () => {
      const f = await makeFinding(await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting'));
      return { path: `/api/jobs/${f.jobId}/findings/${f.id}`, body: { version: 0, title: 'Chafed rudder cable' } };
    },
    allowed: HANDS, ok: 200,
  },
  {
    route: 'POST /api/jobs/:id/findings/:findingId/withdraw', method: 'post',
    req: async () => {
      const f = await makeFinding(await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting'));
      return { path: `/api/jobs/${f.jobId}/findings/${f.id}/withdraw`, body: { version: 0, reason: 'Raised twice' } };
    },
    allowed: ['admin', 'manager'], ok: 200,
  },
  {
    route: 'POST /api/jobs/:id/findings/:findingId/rectified', method: 'post',
    req: async () => {
      const f = await makeFinding(await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'in_work'), { state: 'approved' });
      return { path: `/api/jobs/${f.jobId}/findings/${f.id}/rectified`, body: { version: 0 } };
    },
    allowed: HANDS, ok: 200,
  },
  { route: 'GET /api/jobs/:id/time', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/time` }), allowed: STAFF, ok: 200 },
  { route: 'GET /api/jobs/:id/pre-authorisation', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/pre-authorisation` }), allowed: ALL_SIGNED_IN, ok: 200 },
  {
    route: 'PUT /api/jobs/:id/pre-authorisation', method: 'put',
    req: async () => {
      const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
      return { path: `/api/jobs/${job.id}/pre-authorisation`, body: { version: job.version, perFinding: '150.00', perJob: null, agreedHow: 'Phone call' } };
    },
    allowed: ['admin', 'manager'], ok: 200,
  },
  { route: 'GET /api/jobs/:id/approval-requests', method: 'get', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/approval-requests` }), allowed: ALL_SIGNED_IN, ok: 200 },
  {
    route: 'POST /api/jobs/:id/approval-requests', method: 'post',
    req: async () => {
      const f = await pricedFinding();
      return { path: `/api/jobs/${f.jobId}/approval-requests`, body: { findingIds: [f.id], estimateVersion: 0 } };
    },
    allowed: ['admin', 'manager'], ok: 201,
  },
  { route: 'POST /api/approval-requests/:id/revoke', method: 'post', req: async () => ({ path: `/api/approval-requests/${await sentRequest()}/revoke` }), allowed: ['admin', 'manager'], ok: 200 },
  { route: 'POST /api/approval-requests/:id/resend', method: 'post', req: async () => ({ path: `/api/approval-requests/${await sentRequest()}/resend` }), allowed: ['admin', 'manager'], ok: 200 },
  { route: 'POST /api/jobs/:id/time', method: 'post', req: async () => ({ path: `/api/jobs/${a.owners[0].job.id}/time`, body: { hours: '1.25', workedOn: '2026-12-01' } }), allowed: HANDS, ok: 201 },
];

describe('role × route matrix', () => {
  const cases = MATRIX.flatMap((c) => ALL.map((who) => ({ ...c, who })));
  it.each(cases)('when $who calls $route, then the answer follows the contract', async (c) => {
    const { path, body } = await c.req();
    let res: request.Response;
    if (c.who === 'anonymous') {
      const r = request(server.app)[c.method](path);
      res = await (body ? r.send(body) : r);
    } else {
      const cl = clients[c.who];
      res = c.method === 'get' ? await cl.get(path) : await cl[c.method](path, body);
    }
    const expected = c.who === 'anonymous' ? 401 : c.allowed.includes(c.who) ? c.ok : 403;
    expect({ status: res.status, body: res.status === expected ? 'as expected' : res.body }).toEqual({ status: expected, body: 'as expected' });
    if (expected >= 400) expect(res.body.error.code).toBe(expected === 401 ? 'unauthenticated' : 'forbidden');
  });

  it('when anyone signs out, then it is 204 for a session and 401 without one', async () => {
    expect((await request(server.app).post('/api/auth/sign-out')).status).toBe(401);
    for (const role of ['admin', 'manager', 'engineer', 'accounts'] as const) {
      const c = await signIn(server.app, a.users[role].email);
      expect((await c.post('/api/auth/sign-out')).status).toBe(204);
    }
    const owner = await signIn(server.app, a.owners[1].user.email);
    expect((await owner.post('/api/auth/sign-out')).status).toBe(204);
  });

  it('when an engineer tries any move other than starting an inspection, then it is 403', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
    const res = await clients.engineer.post(`/api/jobs/${job.id}/transition`, { to: 'awaiting_owner', version: job.version });
    expect(res.status).toBe(403);
    const cancel = await clients.engineer.post(`/api/jobs/${job.id}/transition`, { to: 'cancelled', version: job.version, reason: 'no' });
    expect(cancel.status).toBe(403);
  });

  it('when a manager lists users, then only owner sign-ins are shown', async () => {
    const res = await clients.manager.get('/api/users?pageSize=100');
    expect(res.status).toBe(200);
    expect(res.body.items.length).toBeGreaterThan(0);
    expect(new Set(res.body.items.map((u: { role: string }) => u.role))).toEqual(new Set(['owner']));
    const all = await clients.admin.get('/api/users?pageSize=100');
    expect(new Set(all.body.items.map((u: { role: string }) => u.role))).toEqual(new Set(['admin', 'manager', 'engineer', 'accounts', 'owner']));
  });

  it('when the list asks for one kind of sign-in, then staff and owners are kept apart, and a manager asking for staff sees none', async () => {
    const roles = (items: { role: string }[]) => new Set(items.map((u) => u.role));
    const staff = await clients.admin.get('/api/users?pageSize=100&kind=staff');
    expect(staff.status).toBe(200);
    expect(roles(staff.body.items)).toEqual(new Set(['admin', 'manager', 'engineer', 'accounts']));
    const owners = await clients.admin.get('/api/users?pageSize=100&kind=owners');
    expect(roles(owners.body.items)).toEqual(new Set(['owner']));
    const managerStaff = await clients.manager.get('/api/users?pageSize=100&kind=staff');
    expect(managerStaff.status).toBe(200);
    expect(managerStaff.body.items).toEqual([]);
    const bad = await clients.admin.get('/api/users?kind=pilots');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.kind).toMatch(/staff, owners or all/);
  });

  it('when a manager tries to re-send a staff invitation, then it is out of their sight (404) while an admin may', async () => {
    const pending = await User.create({ workshopId: a.workshop.id, email: `pending-staff-${uniq()}@test.example`, name: 'Pending Staff', role: 'engineer', passwordHash: null, customerId: null });
    expect((await clients.manager.post(`/api/users/${pending.id}/resend-invitation`)).status).toBe(404);
    expect((await clients.admin.post(`/api/users/${pending.id}/resend-invitation`)).status).toBe(204);
  });
});

describe('workshop boundary', () => {
  const ids = () => ({
    customer: b.owners[0].customer.id,
    aircraft: b.owners[0].aircraft.id,
    job: b.owners[0].job.id,
    user: b.users.engineer.id,
  });

  it("when workshop A's staff read B's records by id, then every one is 404", async () => {
    const x = ids();
    for (const path of [`/api/customers/${x.customer}`, `/api/aircraft/${x.aircraft}`, `/api/jobs/${x.job}`, `/api/jobs/${x.job}/history`]) {
      const res = await clients.admin.get(path);
      expect({ path, status: res.status, code: res.body.error?.code }).toEqual({ path, status: 404, code: 'not_found' });
    }
  });

  it("when workshop A's staff write to B's records by id, then every one is 404 and B's rows are unchanged", async () => {
    const x = ids();
    const writes: [string, 'post' | 'patch', object][] = [
      [`/api/customers/${x.customer}`, 'patch', { version: 0, name: 'Hijacked' }],
      [`/api/aircraft/${x.aircraft}`, 'patch', { version: 0, registration: 'Q-HIJK' }],
      [`/api/jobs/${x.job}`, 'patch', { version: 0, title: 'Hijacked' }],
      [`/api/jobs/${x.job}/transition`, 'post', { to: 'cancelled', version: 0, reason: 'Hijacked' }],
      [`/api/users/${x.user}`, 'patch', { name: 'Hijacked' }],
      [`/api/users/${x.user}/resend-invitation`, 'post', {}],
      ['/api/aircraft', 'post', { customerId: x.customer, registration: 'Q-XWSA', type: 'Trike' }],
      ['/api/jobs', 'post', { aircraftId: x.aircraft, title: 'Cross', type: 'repair', bookedInOn: '2026-12-01' }],
      ['/api/users/invitations', 'post', { role: 'owner', email: `x-${uniq()}@test.example`, name: 'Cross', customerId: x.customer }],
    ];
    for (const [path, method, body] of writes) {
      const caller = path === '/api/users/invitations' ? clients.manager : clients.admin;
      const res = await caller[method](path, body);
      expect({ path, status: res.status }).toEqual({ path, status: 404 });
    }
    const bAdmin = await signIn(server.app, b.users.admin.email);
    expect((await bAdmin.get(`/api/customers/${x.customer}`)).body.name).not.toBe('Hijacked');
    expect((await bAdmin.get(`/api/jobs/${x.job}`)).body).toMatchObject({ title: 'Annual permit inspection', state: 'booked_in' });
    expect((await bAdmin.get(`/api/aircraft?customerId=${x.customer}`)).body.total).toBe(1);
  });

  it("when workshop A lists records, then none of B's appear", async () => {
    for (const [path, bIds] of [
      ['/api/customers?pageSize=100', b.owners.map((o) => o.customer.id)],
      ['/api/aircraft?pageSize=100', b.owners.map((o) => o.aircraft.id)],
      ['/api/jobs?pageSize=100', b.owners.map((o) => o.job.id)],
      ['/api/users?pageSize=100', Object.values(b.users).map((u) => u.id)],
    ] as const) {
      const res = await clients.admin.get(path);
      expect(res.status).toBe(200);
      const seen = new Set(res.body.items.map((i: { id: string }) => i.id));
      expect(bIds.filter((id) => seen.has(id))).toEqual([]);
      expect(res.body.items.length).toBeGreaterThan(0);
    }
  });

  it("when B's owner filters A's lists by one of B's ids, then nothing of B's comes back", async () => {
    const res = await clients.admin.get(`/api/aircraft?customerId=${b.owners[0].customer.id}`);
    expect(res.body).toMatchObject({ total: 0, items: [] });
    const jobs = await clients.admin.get(`/api/jobs?aircraftId=${b.owners[0].aircraft.id}`);
    expect(jobs.body).toMatchObject({ total: 0, items: [] });
  });
});

describe('owner isolation', () => {
  it("when owner 1 asks for owner 2's aircraft or job, then it is 404", async () => {
    const other = a.owners[1];
    expect((await clients.owner.get(`/api/aircraft/${other.aircraft.id}`)).status).toBe(404);
    expect((await clients.owner.get(`/api/jobs/${other.job.id}`)).status).toBe(404);
  });

  it('when an owner lists aircraft and jobs, then only their own appear, whatever filter they send', async () => {
    const mine = a.owners[0];
    const aircraft = await clients.owner.get('/api/aircraft?pageSize=100');
    expect(aircraft.body.items.map((x: { id: string }) => x.id)).toEqual([mine.aircraft.id]);
    const forced = await clients.owner.get(`/api/aircraft?customerId=${a.owners[1].customer.id}`);
    expect(forced.body).toMatchObject({ total: 0, items: [] });
    const jobs = await clients.owner.get('/api/jobs?pageSize=100');
    expect(jobs.body.items.length).toBeGreaterThan(0);
    expect(jobs.body.items.every((j: { customerId: string }) => j.customerId === mine.customer.id)).toBe(true);
    const viaOther = await clients.owner.get(`/api/jobs?aircraftId=${a.owners[1].aircraft.id}`);
    expect(viaOther.body.total).toBe(0);
  });

  it('when an owner asks for staff-only routes, then it is 403 and never data', async () => {
    for (const path of ['/api/customers', `/api/customers/${a.owners[0].customer.id}`, '/api/workshop', '/api/users', `/api/jobs/${a.owners[0].job.id}/history`]) {
      const res = await clients.owner.get(path);
      expect({ path, status: res.status }).toEqual({ path, status: 403 });
    }
  });

  it('when an owner record has no aircraft, then the owner sees empty lists', async () => {
    const hash = await passwordHash();
    const { Customer } = await import('../src/models/index.js');
    const c = await Customer.create({ workshopId: a.workshop.id, name: 'No Aircraft', email: `na-${uniq()}@test.example` });
    const u = await User.create({ workshopId: a.workshop.id, email: c.email, name: 'No Aircraft', role: 'owner', passwordHash: hash, customerId: c.id });
    const cl = await signIn(server.app, u.email);
    expect((await cl.get('/api/aircraft')).body).toMatchObject({ total: 0, items: [] });
    expect((await cl.get('/api/jobs')).body).toMatchObject({ total: 0, items: [] });
  });
});

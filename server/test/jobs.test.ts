import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { AuditEvent, Job, boundSequelize } from '../src/models/index.js';
import { makeWorkshop, signIn, startTestServer, uniq, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let w: WorkshopFixture;
let manager: Client;
let admin: Client;

beforeAll(async () => {
  server = await startTestServer();
  w = await makeWorkshop('Jobs');
  [manager, admin] = await Promise.all([signIn(server.app, w.users.manager.email), signIn(server.app, w.users.admin.email)]);
});
afterAll(async () => {
  await server?.close();
});

const newJob = (over: object = {}) =>
  manager.post('/api/jobs', { aircraftId: w.owners[0].aircraft.id, title: 'Annual permit inspection', type: 'annual_permit_inspection', bookedInOn: '2026-12-01', ...over });

describe('job numbers', () => {
  it('when jobs are booked in one after another, then they get consecutive numbers in the J-0001 form', async () => {
    const fresh = await makeWorkshop('Numbers');
    const m = await signIn(server.app, fresh.users.manager.email);
    const numbers: string[] = [];
    for (let i = 0; i < 3; i++) {
      const res = await m.post('/api/jobs', { aircraftId: fresh.owners[0].aircraft.id, title: `Job ${i}`, type: 'repair', bookedInOn: '2026-12-01' });
      expect(res.status).toBe(201);
      numbers.push(res.body.number);
    }
    expect(numbers).toEqual(['J-0001', 'J-0002', 'J-0003']);
  });

  it('when many jobs are booked in at once, then no number is used twice and none is skipped', async () => {
    const fresh = await makeWorkshop('Parallel');
    const m = await signIn(server.app, fresh.users.manager.email);
    const results = await Promise.all(
      Array.from({ length: 8 }, (_, i) => m.post('/api/jobs', { aircraftId: fresh.owners[1].aircraft.id, title: `Parallel ${i}`, type: 'repair', bookedInOn: '2026-12-01' })),
    );
    expect(results.map((r) => r.status)).toEqual(Array(8).fill(201));
    const numbers = results.map((r) => r.body.number as string).sort();
    expect(numbers).toEqual(Array.from({ length: 8 }, (_, i) => `J-${String(i + 1).padStart(4, '0')}`));
  });
});

describe('validation', () => {
  it('when a job is sent with missing and malformed fields, then it is 400 with a message per field', async () => {
    const res = await manager.post('/api/jobs', { aircraftId: 'not-an-id', title: '  ', type: 'polish', bookedInOn: '01/12/2026' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['aircraftId', 'bookedInOn', 'title', 'type']);
    expect(res.body.error.fields.title).toBe('Title is required.');
  });

  it('when the due date is before booking in, then it is 400 on dueOn', async () => {
    const res = await newJob({ bookedInOn: '2026-12-10', dueOn: '2026-12-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.dueOn).toMatch(/before booking in/);
  });

  it('when aircraft hours carry a float-like value with too many decimals, then it is refused, and valid hours come back as exact strings', async () => {
    const bad = await manager.post('/api/aircraft', { customerId: w.owners[0].customer.id, registration: `Q-${uniq().slice(0, 4).toUpperCase()}`, type: 'Trike', airframeHours: 12.25 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('airframeHours');
    const good = await manager.post('/api/aircraft', { customerId: w.owners[0].customer.id, registration: `Q-${uniq().slice(0, 4).toUpperCase()}`, type: 'Trike', airframeHours: '999999999999.9', engineHours: '0.1' });
    expect(good.status).toBe(201);
    expect(good.body).toMatchObject({ airframeHours: '999999999999.9', engineHours: '0.1' });
  });

  it('when a registration is already on file in this workshop, then it is 409 naming the registration', async () => {
    const res = await manager.post('/api/aircraft', { customerId: w.owners[1].customer.id, registration: w.owners[0].aircraft.registration.toLowerCase(), type: 'Trike' });
    expect(res.status).toBe(409);
    expect(res.body.error.fields).toHaveProperty('registration');
  });

  it('when an aircraft PATCH sends one field, then the other fields are left as they were', async () => {
    const before = (await manager.get(`/api/aircraft/${w.owners[1].aircraft.id}`)).body;
    await manager.patch(`/api/aircraft/${before.id}`, { version: before.version, serial: 'SN-1' });
    const again = (await manager.get(`/api/aircraft/${before.id}`)).body;
    const res = await manager.patch(`/api/aircraft/${before.id}`, { version: again.version, engineHours: '55.5' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ serial: 'SN-1', engineHours: '55.5', airframeHours: before.airframeHours, type: before.type, version: again.version + 1 });
  });
});

describe('state changes', () => {
  it('when a job moves along allowed states, then each move is kept and written to its history', async () => {
    const created = (await newJob({ title: 'History check' })).body;
    let version = created.version;
    for (const to of ['inspecting', 'awaiting_owner', 'in_work'] as const) {
      const res = await manager.post(`/api/jobs/${created.id}/transition`, { to, version });
      expect(res.status).toBe(200);
      expect(res.body.state).toBe(to);
      version = res.body.version;
    }
    const history = await manager.get(`/api/jobs/${created.id}/history`);
    expect(history.status).toBe(200);
    expect(history.body.map((e: { action: string }) => e.action)).toEqual(['job.booked_in', 'job.state_changed', 'job.state_changed', 'job.state_changed']);
    expect(history.body[3]).toMatchObject({ actorName: w.users.manager.name, actorRole: 'manager', detail: { from: 'awaiting_owner', to: 'in_work' } });
  });

  it('when a move is not allowed from the current state, then it is 409 invalid_transition with the reason and nothing changes', async () => {
    const created = (await newJob({ title: 'Skip ahead' })).body;
    const res = await manager.post(`/api/jobs/${created.id}/transition`, { to: 'invoiced', version: created.version });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('invalid_transition');
    expect(res.body.error.message).toBe('A job that is booked in cannot move to invoiced.');
    const after = (await manager.get(`/api/jobs/${created.id}`)).body;
    expect(after).toMatchObject({ state: 'booked_in', version: created.version });
    expect(await AuditEvent.count({ where: { jobId: created.id } })).toBe(1);
  });

  it('when an invoiced job is to be cancelled, then the reason says cancelling is only before invoicing', async () => {
    const job = await Job.create({ workshopId: w.workshop.id, aircraftId: w.owners[0].aircraft.id, number: `X-${uniq()}`, title: 'Invoiced', type: 'repair', state: 'invoiced', bookedInOn: '2026-11-01', dueOn: null });
    const res = await manager.post(`/api/jobs/${job.id}/transition`, { to: 'cancelled', version: job.version, reason: 'Owner changed mind' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/only before it is invoiced/);
  });

  it('when a job is cancelled without a reason, then it is 400 asking for one', async () => {
    const created = (await newJob({ title: 'No reason' })).body;
    const res = await manager.post(`/api/jobs/${created.id}/transition`, { to: 'cancelled', version: created.version });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('reason');
  });

  it('when a closed job is edited, then it is 409', async () => {
    const job = await Job.create({ workshopId: w.workshop.id, aircraftId: w.owners[0].aircraft.id, number: `X-${uniq()}`, title: 'Closed', type: 'repair', state: 'closed', bookedInOn: '2026-11-01', dueOn: null });
    const res = await manager.patch(`/api/jobs/${job.id}`, { version: job.version, title: 'Reopened?' });
    expect(res.status).toBe(409);
  });
});

describe('optimistic locking', () => {
  it('when two people edit the same job from the same version, then the second gets 409 stale_version and the first edit stands', async () => {
    const created = (await newJob({ title: 'Race' })).body;
    const first = await manager.patch(`/api/jobs/${created.id}`, { version: created.version, title: 'First edit' });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(created.version + 1);
    const second = await admin.patch(`/api/jobs/${created.id}`, { version: created.version, title: 'Second edit' });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('stale_version');
    expect(second.body.error.message).toMatch(/someone else changed/i);
    expect((await manager.get(`/api/jobs/${created.id}`)).body.title).toBe('First edit');
    const history = (await manager.get(`/api/jobs/${created.id}/history`)).body as { action: string; detail: Record<string, unknown> }[];
    // One record for the edit that landed, none for the refused one.
    expect(history.filter((e) => e.action === 'job.updated')).toEqual([
      expect.objectContaining({ detail: { before: { title: 'Race' }, after: { title: 'First edit' } } }),
    ]);
  });

  it('when a state change carries an old version, then it is 409 stale_version', async () => {
    const created = (await newJob({ title: 'Stale move' })).body;
    await manager.patch(`/api/jobs/${created.id}`, { version: created.version, notes: 'changed' });
    const res = await manager.post(`/api/jobs/${created.id}/transition`, { to: 'inspecting', version: created.version });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale_version');
  });

  it('when a customer is saved from an old version, then it is 409 stale_version', async () => {
    const c = (await manager.get(`/api/customers/${w.owners[0].customer.id}`)).body;
    expect((await manager.patch(`/api/customers/${c.id}`, { version: c.version, phone: '01632 960 111' })).status).toBe(200);
    const res = await admin.patch(`/api/customers/${c.id}`, { version: c.version, phone: '01632 960 222' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('stale_version');
  });
});

/** A real failure inside the transaction: PostgreSQL refuses rows of `table` matching `condition`. */
async function withRefusal(table: string, condition: string, fn: () => Promise<void>): Promise<void> {
  const sql = boundSequelize();
  const name = `refuse_${uniq()}`;
  await sql.query(`CREATE FUNCTION ${name}() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN IF ${condition} THEN RAISE EXCEPTION 'refused for the test'; END IF; RETURN NEW; END $$`);
  await sql.query(`CREATE TRIGGER ${name} BEFORE INSERT ON ${table} FOR EACH ROW EXECUTE FUNCTION ${name}()`);
  try {
    await fn();
  } finally {
    await sql.query(`DROP TRIGGER IF EXISTS ${name} ON ${table}`);
    await sql.query(`DROP FUNCTION IF EXISTS ${name}()`);
  }
}

describe('all-or-nothing writes', () => {
  it('when the history record of a new job cannot be written, then neither the job nor its number is kept', async () => {
    const fresh = await makeWorkshop('Atomic');
    const m = await signIn(server.app, fresh.users.manager.email);
    const marker = `doomed-${uniq()}`;
    await withRefusal('audit_events', `NEW.summary LIKE '%${marker}%'`, async () => {
      const body = { aircraftId: fresh.owners[0].aircraft.id, type: 'repair', bookedInOn: '2026-12-01' };
      const fixtureJobs = await Job.count({ where: { workshopId: fresh.workshop.id } });
      const ok1 = await m.post('/api/jobs', { ...body, title: 'Before' });
      expect(ok1.body.number).toBe('J-0001');
      const failed = await m.post('/api/jobs', { ...body, title: `Job ${marker}` });
      expect(failed.status).toBe(500);
      expect(failed.body.error.code).toBe('internal');
      expect(await Job.count({ where: { workshopId: fresh.workshop.id } })).toBe(fixtureJobs + 1);
      const ok2 = await m.post('/api/jobs', { ...body, title: 'After' });
      expect(ok2.body.number).toBe('J-0002');
    });
  });

  it('when an invitation fails after its user row is written, then no user, link or queued e-mail is left behind', async () => {
    const email = `half-${uniq()}@test.example`;
    await withRefusal('one_time_tokens', `(SELECT email FROM users WHERE id = NEW.user_id) = '${email}'`, async () => {
      const res = await admin.post('/api/users/invitations', { role: 'engineer', email, name: 'Half Done' });
      expect(res.status).toBe(500);
    });
    const users = await boundSequelize().query('SELECT 1 FROM users WHERE email = $1', { bind: [email], type: QueryTypes.SELECT });
    expect(users).toHaveLength(0);
    const queued = await boundSequelize().query(`SELECT 1 FROM pgboss.job WHERE data->>'to' = $1`, { bind: [email], type: QueryTypes.SELECT });
    expect(queued).toHaveLength(0);
    // The same invitation goes through once nothing refuses it: the failed one left no duplicate behind.
    expect((await admin.post('/api/users/invitations', { role: 'engineer', email, name: 'Half Done' })).status).toBe(201);
  });
});

describe('workshop settings', () => {
  it('when an admin changes one setting, then the others keep their saved values', async () => {
    const fresh = await makeWorkshop('Settings');
    const a = await signIn(server.app, fresh.users.admin.email);
    const w0 = (await a.get('/api/workshop')).body;
    const first = await a.patch('/api/workshop', { version: w0.version, settings: { partsMarkupPercent: '35' } });
    expect(first.status).toBe(200);
    const second = await a.patch('/api/workshop', { version: first.body.version, settings: { vatRounding: 'line-nearest' }, vatNumber: 'gb999000999' });
    expect(second.status).toBe(200);
    expect(second.body.settings).toMatchObject({ partsMarkupPercent: '35', vatRounding: 'line-nearest' });
    expect(second.body.vatNumber).toBe('GB999000999');
  });

  it('when a labour rate is written as a float-like number, then it is 400 naming the field', async () => {
    const fresh = await makeWorkshop('Rates');
    const a = await signIn(server.app, fresh.users.admin.email);
    const w0 = (await a.get('/api/workshop')).body;
    const res = await a.patch('/api/workshop', { version: w0.version, labourRates: [{ code: 'standard', name: 'Workshop labour', ratePerHour: '62.005' }] });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['labourRates.0.ratePerHour']);
  });
});

describe('lists', () => {
  it('when jobs are filtered by state and searched by registration, then only matching jobs come back, paged', async () => {
    const reg = w.owners[1].aircraft.registration;
    const created = [];
    for (let i = 0; i < 3; i++) {
      created.push((await manager.post('/api/jobs', { aircraftId: w.owners[1].aircraft.id, title: `Paged ${i}`, type: 'repair', bookedInOn: '2026-12-01' })).body);
    }
    const page1 = await manager.get(`/api/jobs?q=${reg}&state=booked_in&pageSize=2&page=1&sort=number&dir=desc`);
    expect(page1.status).toBe(200);
    expect(page1.body.pageSize).toBe(2);
    expect(page1.body.items).toHaveLength(2);
    expect(page1.body.total).toBeGreaterThanOrEqual(4);
    expect(page1.body.items.every((j: { registration: string; state: string }) => j.registration === reg && j.state === 'booked_in')).toBe(true);
    expect(page1.body.items[0].number > page1.body.items[1].number).toBe(true);
  });

  it('when a list is asked for an unknown sort, then it falls back to the default rather than failing', async () => {
    const res = await manager.get('/api/customers?sort=password_hash');
    expect(res.status).toBe(200);
  });

  it('when the page size is out of range, then it is 400', async () => {
    const res = await manager.get('/api/jobs?pageSize=1000');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('pageSize');
  });
});

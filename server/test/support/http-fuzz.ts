import { randomUUID } from 'node:crypto';
import fc from 'fast-check';
import type { Express } from 'express';
import request from 'supertest';
import { QueryTypes } from 'sequelize';
import { boundSequelize } from '../../src/models/index.js';
import { makeFinding, makeJob, makeWorkshop, signIn, uniq, type Client, type WorkshopFixture } from '../helpers.js';

/**
 * Fuzzing over HTTP: every write route, fed bodies that are random JSON or a valid body with one
 * field made hostile. Each answer must be below 500, and a refused request (4xx) must leave the
 * workshop's rows exactly as they were. The test runs a few hundred requests; `npm run probe -w
 * server` runs thousands through the same code.
 */

const uuid = fc.uuid({ version: 4 });
const hostileString = fc.oneof(
  fc.string(),
  fc.string({ unit: 'binary', maxLength: 40 }),
  fc.constantFrom('\u0000', 'Hangar\u0000 3', '\ud800', 'ok\udc00', '\u001b[2J', '\u007f', 'abc', '1e999', 'NaN', '-5', '100.001', '999999999999999', '0.00001', '', ' ', '<script>', "'; DROP TABLE jobs; --"),
  fc.string({ minLength: 200, maxLength: 6000 }),
  uuid,
);
const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 5, arbitrary: hostileString },
  fc.integer({ min: -(2 ** 40), max: 2 ** 40 }),
  fc.double(),
  fc.boolean(),
  fc.constant(null),
  fc.constant(undefined),
  fc.array(hostileString, { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 6 }), hostileString, { maxKeys: 2 }),
);

type Json = Record<string, unknown>;

/** A copy of `base` with the value at one path (any depth) replaced by `value`. */
function withLeaf(base: unknown, pick: number, value: unknown): unknown {
  const paths: (string | number)[][] = [];
  const walk = (v: unknown, at: (string | number)[]) => {
    if (at.length) paths.push(at);
    if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...at, i]));
    else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, [...at, k]);
  };
  walk(base, []);
  if (!paths.length) return value;
  const path = paths[pick % paths.length]!;
  const copy = structuredClone(base) as Json;
  let node: Json = copy;
  for (const key of path.slice(0, -1)) node = node[key as string] as Json;
  node[path[path.length - 1] as string] = value;
  return copy;
}

export interface Route {
  method: 'post' | 'put' | 'patch';
  path: string;
  /** A body the route would accept (it may be stale by the time it is sent; a 409 is a refusal too). */
  body: Json;
  who: 'manager' | 'admin' | 'engineer' | 'anyone';
}

export interface FuzzWorld {
  w: WorkshopFixture;
  clients: Record<'manager' | 'admin' | 'engineer', Client>;
  routes: Route[];
}

/** A workshop with one of everything the write routes act on. */
export async function fuzzWorld(app: Express): Promise<FuzzWorld> {
  const w = await makeWorkshop('Fuzz');
  const [manager, admin, engineer] = await Promise.all([signIn(app, w.users.manager.email), signIn(app, w.users.admin.email), signIn(app, w.users.engineer.email)]);
  const job = await makeJob(w.workshop.id, w.owners[0].aircraft.id, 'inspecting');
  const finding = await makeFinding(job, { title: 'Chafed fuel line' });
  const supplier = (await manager.post('/api/suppliers', { name: `Fuzz Supplies ${uniq()}`, kind: 'parts' })).body as { id: string };
  const part = (await manager.post('/api/parts', { partNumber: `FZ-${uniq()}`, description: 'Hose clamp', unitCost: '2.50', supplierId: supplier.id ?? null })).body as { id: string };
  const template = (await manager.post('/api/templates', { name: `Fuzz template ${uniq()}`, jobType: 'annual_permit_inspection', lines: [], checklist: [] })).body as { id: string };
  const taskId = randomUUID();
  const lineId = randomUUID();
  const estimate = {
    version: 0,
    lines: [
      { id: randomUUID(), stage: 'inspection', kind: 'labour', description: 'Inspection', quantity: '2', labourRateCode: 'standard', ratePerHour: '62.00', accessTaskId: taskId, discountPercent: '5' },
      { id: lineId, stage: 'discovered', kind: 'part', description: 'Fuel hose', quantity: '1.5', unitCost: '12.40', markupPercent: '20', findingId: finding.id, partId: part.id ?? null },
    ],
    accessTasks: [{ id: taskId, name: 'Cowling off', hours: '0.5', ratePerHour: '62.00', labourRateCode: 'standard' }],
  };
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, estimate);
  const decideToken = `${uniq()}${'Z'.repeat(40)}`;
  const J = `/api/jobs/${job.id}`;
  const F = `${J}/findings/${finding.id}`;
  const routes: Route[] = [
    { method: 'post', path: '/api/auth/sign-in', who: 'anyone', body: { email: w.users.accounts.email, password: 'a-wrong-password' } },
    { method: 'post', path: '/api/auth/password-reset', who: 'anyone', body: { email: `nobody-${uniq()}@test.example` } },
    { method: 'post', path: '/api/auth/password-reset/complete', who: 'anyone', body: { token: 'A'.repeat(43), password: 'a-new-password-1', confirmPassword: 'a-new-password-1' } },
    { method: 'post', path: '/api/auth/invitations/accept', who: 'anyone', body: { token: 'B'.repeat(43), name: 'New Person', password: 'a-new-password-1', confirmPassword: 'a-new-password-1' } },
    { method: 'post', path: '/api/users/invitations', who: 'admin', body: { role: 'engineer', email: `new-${uniq()}@test.example`, name: 'New Engineer' } },
    { method: 'patch', path: `/api/users/${w.users.engineer.id}`, who: 'admin', body: { name: 'Engineer Renamed' } },
    { method: 'patch', path: '/api/workshop', who: 'admin', body: { version: 0, name: 'Fuzz Workshop', addressLines: 'Hangar 3\nMarsh Lane', postcode: 'QQ1 1QQ', settings: { partsMarkupPercent: '20' } } },
    { method: 'post', path: '/api/customers', who: 'manager', body: { name: 'A New Owner', email: `owner-${uniq()}@test.example`, phone: '01234 567890' } },
    { method: 'patch', path: `/api/customers/${w.owners[1].customer.id}`, who: 'manager', body: { version: 0, name: 'Renamed Owner' } },
    { method: 'post', path: '/api/aircraft', who: 'manager', body: { customerId: w.owners[1].customer.id, registration: `Q-${uniq().slice(0, 4).toUpperCase()}`, type: 'Two-seat flex-wing trike', airframeHours: '120.5' } },
    { method: 'patch', path: `/api/aircraft/${w.owners[1].aircraft.id}`, who: 'manager', body: { version: 0, type: 'Three-axis microlight', airframeHours: '130.0' } },
    { method: 'post', path: '/api/jobs', who: 'manager', body: { aircraftId: w.owners[1].aircraft.id, title: '100-hour service', type: 'annual_permit_inspection', bookedInOn: '2026-12-01', notes: 'Bring the logbooks.' } },
    { method: 'patch', path: J, who: 'manager', body: { version: 0, title: 'Annual permit inspection', notes: 'Owner asks for a call.' } },
    { method: 'post', path: `${J}/transition`, who: 'manager', body: { to: 'cancelled', version: 0, reason: 'Owner sold the aircraft' } },
    { method: 'post', path: '/api/suppliers', who: 'manager', body: { name: 'Another Supplier', kind: 'parts' } },
    { method: 'patch', path: `/api/suppliers/${supplier.id}`, who: 'manager', body: { version: 0, name: 'Renamed Supplier' } },
    { method: 'post', path: '/api/parts', who: 'manager', body: { partNumber: `P-${uniq()}`, description: 'Spark plug', unitCost: '4.20', markupPercent: '25' } },
    { method: 'patch', path: `/api/parts/${part.id}`, who: 'manager', body: { version: 0, unitCost: '2.75' } },
    { method: 'post', path: '/api/templates', who: 'manager', body: { name: 'Another template', jobType: 'repair', lines: [{ kind: 'labour', description: 'Strip', quantity: '1', labourRateCode: 'standard' }], checklist: [{ section: 'Engine', text: 'Check plugs', limit: null }] } },
    { method: 'put', path: `/api/templates/${template.id}`, who: 'manager', body: { version: 0, name: 'Renamed template', jobType: 'repair', lines: [], checklist: [] } },
    { method: 'put', path: `${J}/estimate`, who: 'manager', body: { ...estimate, version: Number((saved.body as { version?: number }).version ?? 1) } },
    { method: 'patch', path: `${J}/checklist/${randomUUID()}`, who: 'engineer', body: { version: 0, result: 'measured', measuredValue: '0.95', note: 'Checked twice' } },
    { method: 'post', path: `${J}/findings`, who: 'engineer', body: { title: 'Worn brake pad', location: 'Left main wheel', category: 'recommended', seen: 'Pad at 1 mm', remedy: { description: 'Replace pads', hours: '0.5', labourRateCode: 'standard', parts: [{ partId: part.id ?? randomUUID(), quantity: '2' }], accessTask: 'Wheel off' } } },
    { method: 'patch', path: F, who: 'engineer', body: { version: 1, title: 'Chafed fuel line at firewall', remedy: { description: 'New hose', hours: '1.25', parts: [] } } },
    { method: 'post', path: `${F}/withdraw`, who: 'manager', body: { version: 1, reason: 'Raised twice' } },
    { method: 'post', path: `${F}/rectified`, who: 'engineer', body: { version: 1, reason: 'Done' } },
    { method: 'post', path: `${J}/time`, who: 'engineer', body: { hours: '1.5', workedOn: '2026-12-01', note: 'Strip and inspect', findingId: finding.id } },
    { method: 'put', path: `${J}/pre-authorisation`, who: 'manager', body: { version: 0, perFinding: '150.00', perJob: '400.00', agreedHow: 'Phone call, 1 Dec' } },
    { method: 'post', path: `${J}/approval-requests`, who: 'manager', body: { findingIds: [finding.id], message: 'Found while inspecting.', estimateVersion: 1 } },
    { method: 'post', path: `${J}/deposits`, who: 'manager', body: { amount: '120.00', reason: 'Propeller overhaul ordered' } },
    { method: 'post', path: `${J}/deposits/${randomUUID()}/cancel`, who: 'manager', body: { reason: 'Owner bringing the parts' } },
    { method: 'post', path: `/api/decide/${decideToken}`, who: 'anyone', body: { snapshotHash: 'c'.repeat(64), typedName: 'Owner One', decisions: [{ findingId: finding.id, decision: 'approve', note: 'Go ahead' }] } },
  ];
  return { w, clients: { manager, admin, engineer }, routes };
}

/** Every row the workshop owns, as one hash: equal before and after means nothing was written. */
export async function fingerprint(workshopId: string): Promise<string> {
  const tables = await boundSequelize().query<{ table_name: string }>(
    `SELECT table_name FROM information_schema.columns WHERE table_schema = 'public' AND column_name = 'workshop_id' ORDER BY table_name`,
    { type: QueryTypes.SELECT },
  );
  const parts = [...tables.map((t) => `(SELECT coalesce(md5(string_agg(x::text, '|' ORDER BY x::text)), '') FROM "${t.table_name}" x WHERE x.workshop_id = $1)`), `(SELECT coalesce(md5(string_agg(x::text, '|' ORDER BY x::text)), '') FROM workshops x WHERE x.id = $1)`];
  const [row] = await boundSequelize().query<{ h: string }>(`SELECT md5(${parts.join(` || `)}) AS h`, { bind: [workshopId], type: QueryTypes.SELECT });
  return row!.h;
}

export interface FuzzTally {
  sent: number;
  byStatus: Record<string, number>;
  serverErrors: { route: string; status: number; body: unknown; sent: unknown }[];
  writesOnRefusal: { route: string; status: number; sent: unknown }[];
}

/** A body for one route: random JSON, or its valid body with one field (any depth) made hostile. */
export function bodyFor(route: Route): fc.Arbitrary<unknown> {
  return fc.oneof(
    { weight: 1, arbitrary: fc.jsonValue({ maxDepth: 3 }) },
    { weight: 4, arbitrary: fc.tuple(fc.nat(), hostileValue).map(([pick, v]) => withLeaf(route.body, pick, v)) },
    { weight: 1, arbitrary: fc.tuple(fc.nat(), hostileValue, fc.nat(), hostileValue).map(([p1, v1, p2, v2]) => withLeaf(withLeaf(route.body, p1, v1), p2, v2)) },
  );
}

/** Sends `perRoute` fuzzed bodies to every route and tallies what came back. */
export async function fuzzRoutes(app: Express, world: FuzzWorld, perRoute: number, seed = Date.now()): Promise<FuzzTally> {
  const tally: FuzzTally = { sent: 0, byStatus: {}, serverErrors: [], writesOnRefusal: [] };
  let before = await fingerprint(world.w.workshop.id);
  for (const [i, route] of world.routes.entries()) {
    const bodies = fc.sample(bodyFor(route), { numRuns: perRoute, seed: seed + i });
    for (const body of bodies) {
      const name = `${route.method.toUpperCase()} ${route.path}`;
      // Sent as raw JSON, so a bare number, string or null goes out exactly as generated.
      const raw = JSON.stringify(body) ?? '';
      const res =
        route.who === 'anyone'
          ? await request(app)[route.method](route.path).set('Content-Type', 'application/json').send(raw)
          : await world.clients[route.who].agent[route.method](route.path).set('X-CSRF-Token', world.clients[route.who].csrf).set('Content-Type', 'application/json').send(raw);
      tally.sent += 1;
      tally.byStatus[res.status] = (tally.byStatus[res.status] ?? 0) + 1;
      if (res.status >= 500) tally.serverErrors.push({ route: name, status: res.status, body: res.body, sent: body });
      const after = await fingerprint(world.w.workshop.id);
      if (res.status >= 400 && after !== before) tally.writesOnRefusal.push({ route: name, status: res.status, sent: body });
      before = after;
    }
  }
  return tally;
}

import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AuditEventDto, JobChecklistItemDto, TimeLogDto } from '@wingstage/shared';
import { makeJob, makeWorkshop, signIn, startTestServer, uniq, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let manager: Client;
let engineer: Client;
let accounts: Client;

beforeAll(async () => {
  server = await startTestServer();
  a = await makeWorkshop('Words');
  [manager, engineer, accounts] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.users.engineer.email),
    signIn(server.app, a.users.accounts.email),
  ]);
});
afterAll(async () => {
  await server?.close();
});

const del = (c: Client, path: string, body: object) => c.agent.delete(path).set('X-CSRF-Token', c.csrf).send(body);
const inspecting = () => makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
async function history(jobId: string): Promise<AuditEventDto[]> {
  const res = await manager.get(`/api/jobs/${jobId}/history`);
  expect(res.status).toBe(200);
  return res.body as AuditEventDto[];
}

describe('a day has 24 hours', () => {
  it('when 99,999 hours are logged for one day, then the entry is refused with the reason in words and nothing is saved', async () => {
    const job = await inspecting();
    const res = await engineer.post(`/api/jobs/${job.id}/time`, { hours: '99999', workedOn: '2026-12-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.hours).toBe('A day has 24 hours: log at most 24 hours for one day.');
    expect((await engineer.get(`/api/jobs/${job.id}/time`)).body).toEqual([]);
  });

  it('when negative hours are logged, then the message says they cannot be negative', async () => {
    const job = await inspecting();
    const res = await engineer.post(`/api/jobs/${job.id}/time`, { hours: '-2', workedOn: '2026-12-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.hours).toBe('Hours cannot be negative.');
  });

  it("when one person's entries on one day would pass 24 hours across two jobs, then the one that would pass is refused, saying how much room is left", async () => {
    const [one, two] = await Promise.all([inspecting(), inspecting()]);
    const day = '2026-11-03';
    expect((await engineer.post(`/api/jobs/${one.id}/time`, { hours: '16', workedOn: day })).status).toBe(201);
    const over = await engineer.post(`/api/jobs/${two.id}/time`, { hours: '9', workedOn: day });
    expect(over.status).toBe(400);
    expect(over.body.error.fields.hours).toBe(`16 hours are already logged for ${day}, and a day has 24 hours: at most 8 more can be logged for that day.`);
    // Someone else's hours on that day do not count against this person.
    expect((await manager.post(`/api/jobs/${two.id}/time`, { hours: '9', workedOn: day })).status).toBe(201);
    expect((await engineer.post(`/api/jobs/${two.id}/time`, { hours: '8', workedOn: day })).status).toBe(201);
  });
});

describe('correcting and removing a time entry', () => {
  it('when the engineer corrects their own entry, then it changes, its version moves on, and the history says what changed', async () => {
    const job = await inspecting();
    const logged = (await engineer.post(`/api/jobs/${job.id}/time`, { hours: '2.5', workedOn: '2026-12-01', note: 'Plugs' })).body as TimeLogDto;
    expect(logged).toMatchObject({ version: 0, userId: a.users.engineer.id });
    const res = await engineer.patch(`/api/jobs/${job.id}/time/${logged.id}`, { version: 0, hours: '1.5', workedOn: '2026-12-02' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ hours: '1.50', workedOn: '2026-12-02', note: 'Plugs', version: 1 });
    const changed = (await history(job.id)).find((e) => e.action === 'time.changed');
    expect(changed?.summary).toBe(`Corrected ${a.users.engineer.name}'s time entry for 2026-12-01: 2.5 h → 1.5 h, 2026-12-01 → 2026-12-02`);
    expect(changed?.detail).toMatchObject({ before: { hours: '2.50', workedOn: '2026-12-01' }, after: { hours: '1.5', workedOn: '2026-12-02' } });
  });

  it('when a correction would pass 24 hours, or is made from a stale version, then it is refused and the entry is unchanged', async () => {
    const job = await inspecting();
    const logged = (await engineer.post(`/api/jobs/${job.id}/time`, { hours: '3', workedOn: '2026-10-10' })).body as TimeLogDto;
    const tooMuch = await engineer.patch(`/api/jobs/${job.id}/time/${logged.id}`, { version: 0, hours: '99999' });
    expect(tooMuch.status).toBe(400);
    expect(tooMuch.body.error.fields.hours).toMatch(/A day has 24 hours/);
    const ok = await engineer.patch(`/api/jobs/${job.id}/time/${logged.id}`, { version: 0, note: 'Compression check' });
    expect(ok.status).toBe(200);
    const stale = await engineer.patch(`/api/jobs/${job.id}/time/${logged.id}`, { version: 0, hours: '4' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_version');
    const [entry] = (await engineer.get(`/api/jobs/${job.id}/time`)).body as TimeLogDto[];
    expect(entry).toMatchObject({ hours: '3.00', note: 'Compression check', version: 1 });
  });

  it("when the manager removes the engineer's entry, then it is gone and the history keeps what it was; accounts may not remove time", async () => {
    const job = await inspecting();
    const logged = (await engineer.post(`/api/jobs/${job.id}/time`, { hours: '0.75', workedOn: '2026-12-01', note: 'Fuel hoses' })).body as TimeLogDto;
    expect((await del(accounts, `/api/jobs/${job.id}/time/${logged.id}`, { version: 0 })).status).toBe(403);
    const res = await del(manager, `/api/jobs/${job.id}/time/${logged.id}`, { version: 0, reason: 'Logged on the wrong job' });
    expect(res.status).toBe(204);
    expect((await manager.get(`/api/jobs/${job.id}/time`)).body).toEqual([]);
    const removed = (await history(job.id)).find((e) => e.action === 'time.removed');
    expect(removed?.summary).toBe(`Removed ${a.users.engineer.name}'s time entry of 0.75 h for 2026-12-01: Logged on the wrong job`);
    expect(removed?.detail).toMatchObject({ was: { hours: '0.75', note: 'Fuel hoses' } });
  });

  it("when an engineer tries to change someone else's entry, then it is refused and unchanged", async () => {
    const job = await inspecting();
    const logged = (await manager.post(`/api/jobs/${job.id}/time`, { hours: '1', workedOn: '2026-12-01' })).body as TimeLogDto;
    const res = await engineer.patch(`/api/jobs/${job.id}/time/${logged.id}`, { version: 0, hours: '2' });
    expect(res.status).toBe(403);
    expect(res.body.error.message).toBe('Only the person who logged this time, a manager or an admin can change it.');
    expect((await del(engineer, `/api/jobs/${job.id}/time/${logged.id}`, { version: 0 })).status).toBe(403);
  });
});

describe('figures beyond a light-aircraft job ask for confirmation', () => {
  const part = (quantity: string) => ({ id: randomUUID(), stage: 'inspection', kind: 'part', description: 'Split pins', quantity, unitCost: '0.40' });

  it('when a quantity of 1,000,000 is saved without confirmation, then it is refused with a 400 that says why and nothing changes; confirmed, it saves', async () => {
    const job = await inspecting();
    const refused = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [part('1000000')] });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.confirmLarge).toMatch(/larger than a light-aircraft job usually needs.*"Split pins": 1000000 is more than 500 items\./);
    expect((await manager.get(`/api/jobs/${job.id}/estimate`)).body.lines).toEqual([]);
    const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [part('1000000')], confirmLarge: true });
    expect(saved.status).toBe(200);
    expect(saved.body.lines[0].quantity).toBe('1000000.00');
  });

  it('when a quantity is negative, then the message names the problem without programmer words', async () => {
    const job = await inspecting();
    const res = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [part('-3')] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['lines.0.quantity']).toBe('Quantity cannot be negative.');
    expect(JSON.stringify(res.body.error)).not.toMatch(/decimals|must not be negative|expected/);
  });
});

describe("messages in people's words", () => {
  it('when a job names no real aircraft and an over-long title, then each field says what to do', async () => {
    const res = await manager.post('/api/jobs', { aircraftId: 'nope', title: 'x'.repeat(200), type: 'other', bookedInOn: '2026-12-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toMatchObject({ aircraftId: 'Choose one from the list.', title: 'This is too long: keep it to 160 characters or fewer.' });
    expect(JSON.stringify(res.body.error.fields)).not.toMatch(/Too big|expected string|valid id|Invalid/);
  });
});

describe('cautions', () => {
  it('when a job is booked from a template with cautions, then its checklist items and scope carry them to the hangar', async () => {
    const tpl = await manager.post('/api/templates', {
      name: `Gearbox ${uniq()}`,
      jobType: 'gearbox_inspection',
      lines: [{ kind: 'labour', description: 'Gearbox inspection', quantity: '2.5', labourRateCode: 'standard', caution: 'Treat the propeller as live.' }],
      checklist: [
        { section: 'Gearbox', text: 'Backlash at the propeller flange', caution: 'Ignition off, plug leads removed, clear the arc.' },
        { section: 'Gearbox', text: 'Magnetic drain plug: no metal' },
      ],
    });
    expect(tpl.status).toBe(201);
    expect(tpl.body.checklist.map((c: { caution: string }) => c.caution)).toEqual(['Ignition off, plug leads removed, clear the arc.', '']);
    const job = await manager.post('/api/jobs', { aircraftId: a.owners[0].aircraft.id, title: 'Gearbox', type: 'gearbox_inspection', bookedInOn: '2026-12-01', templateId: tpl.body.id });
    expect(job.status).toBe(201);
    expect(job.body.scopeCautions).toEqual([{ line: 'Gearbox inspection', caution: 'Treat the propeller as live.' }]);
    const items = (await engineer.get(`/api/jobs/${job.body.id}/checklist`)).body as JobChecklistItemDto[];
    expect(items.map((i) => [i.text, i.caution])).toEqual([
      ['Backlash at the propeller flange', 'Ignition off, plug leads removed, clear the arc.'],
      ['Magnetic drain plug: no metal', ''],
    ]);
  });

  it('when a caution is longer than 500 characters, then the template is refused with a message about the caution', async () => {
    const res = await manager.post('/api/templates', { name: `Long ${uniq()}`, jobType: 'other', lines: [], checklist: [{ text: 'Fuel hoses', caution: 'x'.repeat(501) }] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['checklist.0.caution']).toBe('Caution must be at most 500 characters.');
  });
});

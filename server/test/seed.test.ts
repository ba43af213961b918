import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JOB_STATES } from '@wingstage/shared';
import { Aircraft, Job, User, boundSequelize } from '../src/models/index.js';
import { DEMO_PASSWORD, demoSignIns } from '../../db/seeders/demo-data.js';
import { findDemoWorkshop, removeDemo, seedDemo } from '../../db/seeders/demo.js';
import { startTestServer, type TestServer } from './helpers.js';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
  await seedDemo(boundSequelize());
});
afterAll(async () => {
  await removeDemo(boundSequelize());
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
    // Other test files write users to the same database at the same time: count the demo's own.
    const w = (await findDemoWorkshop())!;
    const demoRows = async () => [await User.count({ where: { workshopId: w.id } }), await Job.count({ where: { workshopId: w.id } })];
    const before = await demoRows();
    expect(await seedDemo(boundSequelize())).toBe(false);
    expect(await demoRows()).toEqual(before);
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
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../src/models/index.js';
import { makeWorkshop, signIn, startTestServer, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;

beforeAll(async () => {
  server = await startTestServer();
});
afterAll(async () => {
  await server?.close();
});

async function adminOf(w: WorkshopFixture) {
  return signIn(server.app, w.users.admin.email);
}

describe('the deposit policy in the workshop settings', () => {
  it('when nothing was set, then the workshop asks for no deposit', async () => {
    const w = await makeWorkshop('Deposit');
    const admin = await adminOf(w);
    expect((await admin.get('/api/workshop')).body.settings.depositPolicy).toEqual({ kind: 'none' });
  });

  it('when the admin sets a percentage of approved work above a threshold, then it is saved, kept beside the other settings and recorded', async () => {
    const w = await makeWorkshop('Deposit');
    const admin = await adminOf(w);
    const before = (await admin.get('/api/workshop')).body;
    const policy = { kind: 'approved_work_percent', percent: '50', threshold: '500.00' };
    const res = await admin.patch('/api/workshop', { version: before.version, settings: { depositPolicy: policy } });
    expect(res.status).toBe(200);
    expect(res.body.settings).toMatchObject({ depositPolicy: policy, partsMarkupPercent: before.settings.partsMarkupPercent });
    expect((await admin.get('/api/workshop')).body.settings.depositPolicy).toEqual(policy);
    const changed = await admin.patch('/api/workshop', { version: res.body.version, settings: { depositPolicy: { kind: 'quote_percent', percent: '25' } } });
    // The policy is replaced whole: no threshold is left behind from the earlier kind.
    expect(changed.body.settings.depositPolicy).toEqual({ kind: 'quote_percent', percent: '25' });
    expect(await AuditEvent.count({ where: { workshopId: w.workshop.id, action: 'workshop.updated' } })).toBe(2);
  });

  it('when the percentage is over 100 or the threshold is missing, then it is a 400 naming the field and nothing changes', async () => {
    const w = await makeWorkshop('Deposit');
    const admin = await adminOf(w);
    const before = (await admin.get('/api/workshop')).body;
    const over = await admin.patch('/api/workshop', { version: before.version, settings: { depositPolicy: { kind: 'quote_percent', percent: '150' } } });
    expect(over.status).toBe(400);
    expect(over.body.error.fields['settings.depositPolicy.percent']).toBe('The percentage must be more than 0 and at most 100.');
    const noThreshold = await admin.patch('/api/workshop', { version: before.version, settings: { depositPolicy: { kind: 'approved_work_percent', percent: '50' } } });
    expect(noThreshold.status).toBe(400);
    expect(Object.keys(noThreshold.body.error.fields)).toContain('settings.depositPolicy.threshold');
    const asNumber = await admin.patch('/api/workshop', { version: before.version, settings: { depositPolicy: { kind: 'quote_percent', percent: 25 } } });
    expect(asNumber.status).toBe(400);
    expect((await admin.get('/api/workshop')).body).toMatchObject({ version: before.version, settings: { depositPolicy: { kind: 'none' } } });
  });

  it('when a manager tries to change it, then it is refused', async () => {
    const w = await makeWorkshop('Deposit');
    const manager = await signIn(server.app, w.users.manager.email);
    const before = (await manager.get('/api/workshop')).body;
    const res = await manager.patch('/api/workshop', { version: before.version, settings: { depositPolicy: { kind: 'quote_percent', percent: '25' } } });
    expect(res.status).toBe(403);
  });
});

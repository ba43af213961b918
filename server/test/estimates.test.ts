import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ChecklistLimit, EstimateDto, EstimateLineInputForm, FindingDto, JobChecklistItemDto } from '@wingstage/shared';
import { AuditEvent, Finding, Job, JobChecklistItem, Part, Supplier } from '../src/models/index.js';
import { makeFinding, makeJob, makeWorkshop, signIn, startTestServer, uniq, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

let server: TestServer;
let a: WorkshopFixture;
let b: WorkshopFixture;
let manager: Client;
let admin: Client;
let engineer: Client;
let owner: Client;
let bAdmin: Client;

beforeAll(async () => {
  server = await startTestServer();
  [a, b] = await Promise.all([makeWorkshop('Estimates'), makeWorkshop('Other')]);
  [manager, admin, engineer, owner, bAdmin] = await Promise.all([
    signIn(server.app, a.users.manager.email),
    signIn(server.app, a.users.admin.email),
    signIn(server.app, a.users.engineer.email),
    signIn(server.app, a.owners[0].user.email),
    signIn(server.app, b.users.admin.email),
  ]);
});
afterAll(async () => {
  await server?.close();
});

const PLUG_LIMIT: ChecklistLimit = { min: null, max: '0.9', unit: 'mm', source: 'Example: 0.6–0.7 mm new, 0.9 mm wear limit (common practice).' };

const labour = (over: Partial<EstimateLineInputForm> = {}): EstimateLineInputForm => ({
  id: randomUUID(), stage: 'inspection', kind: 'labour', description: 'Inspection', quantity: '1', labourRateCode: 'standard', ratePerHour: '62.00', ...over,
});

async function inspectingJob(): Promise<Job> {
  return makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
}

async function estimateOf(jobId: string, c: Client = manager): Promise<EstimateDto> {
  const res = await c.get(`/api/jobs/${jobId}/estimate`);
  expect(res.status).toBe(200);
  return res.body as EstimateDto;
}

describe('booking from a template', () => {
  it('when a job is booked from a template, then its lines become the inspection stage at today’s prices and its checklist the job’s', async () => {
    const sup = await manager.post('/api/suppliers', { name: `Sail loft ${uniq()}`, kind: 'sail_loft' });
    expect(sup.status).toBe(201);
    const part = await manager.post('/api/parts', { partNumber: `SP-${uniq()}`, description: 'Spark plug', unitCost: '6.80', supplierId: sup.body.id, leadTimeDays: 2 });
    expect(part.status).toBe(201);
    // 6.80 cost with the workshop's default 20% parts mark-up: 6.80 × 1.2 = 8.16.
    expect(part.body).toMatchObject({ sellPrice: '8.16', supplierName: sup.body.name });
    const tpl = await manager.post('/api/templates', {
      name: `Engine service ${uniq()}`,
      jobType: 'engine_service_100h',
      lines: [
        { kind: 'labour', description: 'Engine service', quantity: '3', labourRateCode: 'standard' },
        { kind: 'part', description: 'Spark plugs', quantity: '4', partId: part.body.id },
        { kind: 'subcontract', description: 'Re-cover', supplierId: sup.body.id, amount: '680.00' },
        { kind: 'fee', description: 'Paperwork', amount: '45.00', vatRate: 'zero' },
      ],
      checklist: [
        { section: 'Engine', text: 'Spark plug electrode gap', limit: PLUG_LIMIT },
        { section: 'Engine', text: 'Coolant hoses' },
      ],
    });
    expect(tpl.status).toBe(201);
    // The catalogue cost changes after the template is written: booking uses the cost at booking time.
    await Part.update({ unitCost: '7.0000' }, { where: { id: part.body.id } });

    const res = await manager.post('/api/jobs', { aircraftId: a.owners[0].aircraft.id, title: 'Engine service', type: 'engine_service_100h', bookedInOn: '2026-12-01', templateId: tpl.body.id });
    expect(res.status).toBe(201);
    const est = await estimateOf(res.body.id);
    expect(est.version).toBe(0);
    expect(est.lines.map((l) => [l.stage, l.kind, l.description])).toEqual([
      ['inspection', 'labour', 'Engine service'],
      ['inspection', 'part', 'Spark plugs'],
      ['inspection', 'subcontract', 'Re-cover'],
      ['inspection', 'fee', 'Paperwork'],
    ]);
    expect(est.lines[0]).toMatchObject({ quantity: '3.00', ratePerHour: '62.00', labourRateCode: 'standard' });
    expect(est.lines[1]).toMatchObject({ quantity: '4.00', unitCost: '7.0000', partId: part.body.id, supplierId: sup.body.id });
    expect(est.lines[3]).toMatchObject({ amount: '45.00', vatRate: 'zero' });
    const checklist = (await engineer.get(`/api/jobs/${res.body.id}/checklist`)).body as JobChecklistItemDto[];
    expect(checklist.map((c) => [c.section, c.text, c.limit?.max ?? null, c.result])).toEqual([
      ['Engine', 'Spark plug electrode gap', '0.9', null],
      ['Engine', 'Coolant hoses', null, null],
    ]);
  });

  it("when a job is booked with another workshop's template, then nothing is booked and the field is named", async () => {
    const other = await bAdmin.post('/api/templates', { name: 'Theirs', jobType: 'other', lines: [], checklist: [] });
    expect(other.status).toBe(201);
    const before = await Job.count({ where: { workshopId: a.workshop.id } });
    const res = await manager.post('/api/jobs', { aircraftId: a.owners[0].aircraft.id, title: 'Cross', type: 'other', bookedInOn: '2026-12-01', templateId: other.body.id });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.templateId).toMatch(/not found/);
    expect(await Job.count({ where: { workshopId: a.workshop.id } })).toBe(before);
  });

  it('when a template names a labour rate the workshop does not have, then it is refused', async () => {
    const res = await manager.post('/api/templates', { name: 'Bad rate', jobType: 'other', lines: [{ kind: 'labour', description: 'x', labourRateCode: 'gold' }], checklist: [] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['lines.0.labourRateCode']).toBeTruthy();
  });

  it('when two editors save the same template version, then the second is told it is stale', async () => {
    const tpl = await manager.post('/api/templates', { name: `Twice ${uniq()}`, jobType: 'other', lines: [], checklist: [] });
    const body = { name: tpl.body.name, jobType: 'other', lines: [], checklist: [{ text: 'Check A' }], version: 0 };
    expect((await manager.put(`/api/templates/${tpl.body.id}`, body)).status).toBe(200);
    const second = await admin.put(`/api/templates/${tpl.body.id}`, { ...body, checklist: [{ text: 'Check B' }] });
    expect(second.status).toBe(409);
    expect(second.body.error.code).toBe('stale_version');
    expect((await manager.get(`/api/templates/${tpl.body.id}`)).body.checklist).toEqual([{ section: '', text: 'Check A', limit: null, caution: '' }]);
  });
});

describe('catalogue', () => {
  it('when parts are priced by a fixed price, their own mark-up or the workshop’s, then the sell price follows the engine', async () => {
    const fixed = await manager.post('/api/parts', { partNumber: `F-${uniq()}`, description: 'Clamp', unitCost: '1.15', unitPrice: '2.50' });
    const own = await manager.post('/api/parts', { partNumber: `O-${uniq()}`, description: 'Filter', unitCost: '24.50', markupPercent: '25' });
    const both = await manager.post('/api/parts', { partNumber: `B-${uniq()}`, description: 'Both', unitCost: '1', unitPrice: '2', markupPercent: '5' });
    // 24.50 × 1.25 = 30.625, rounded half up to the penny: 30.63.
    expect([fixed.body.sellPrice, own.body.sellPrice]).toEqual(['2.50', '30.63']);
    expect(both.status).toBe(400);
    const dup = await manager.post('/api/parts', { partNumber: fixed.body.partNumber, description: 'Again', unitCost: '1' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.partNumber).toMatch(/already/);
    const switched = await manager.patch(`/api/parts/${fixed.body.id}`, { version: fixed.body.version, markupPercent: '100' });
    expect(switched.body).toMatchObject({ unitPrice: null, markupPercent: '100.00', sellPrice: '2.30' });
    const stale = await admin.patch(`/api/parts/${fixed.body.id}`, { version: fixed.body.version, description: 'Late' });
    expect(stale.status).toBe(409);
  });

  it("when a part names another workshop's supplier, then it is refused", async () => {
    const theirs = await bAdmin.post('/api/suppliers', { name: 'Their loft', kind: 'sail_loft' });
    const res = await manager.post('/api/parts', { partNumber: `X-${uniq()}`, description: 'Cloth', unitCost: '18', supplierId: theirs.body.id });
    expect(res.status).toBe(400);
    expect(res.body.error.fields.supplierId).toBeTruthy();
  });
});

describe('the staged estimate', () => {
  it('when an estimate is saved, then the stored totals equal the hand-worked figures', async () => {
    const job = await inspectingJob();
    const res = await manager.put(`/api/jobs/${job.id}/estimate`, {
      version: 0,
      accessTasks: [],
      lines: [
        labour({ quantity: '2.5' }),
        { id: randomUUID(), stage: 'inspection', kind: 'part', description: 'Engine oil', quantity: '3', unitCost: '9.10' },
        { id: randomUUID(), stage: 'inspection', kind: 'subcontract', description: 'Propeller balance', amount: '100.00' },
        { id: randomUUID(), stage: 'inspection', kind: 'fee', description: 'Permit paperwork', amount: '45.00', vatRate: 'zero' },
      ],
    });
    expect(res.status).toBe(200);
    /*
     * Worked by hand, with the workshop's defaults (parts +20%, sub-contract +10%, VAT on the
     * invoice total rounded to the nearest penny):
     *   labour       2.5 h × £62.00                = £155.00  (standard)
     *   part         3 × £9.10 = £27.30 × 1.20     =  £32.76  (standard)
     *   sub-contract £100.00 × 1.10                = £110.00  (standard)
     *   fee                                        =  £45.00  (zero-rated)
     *   standard-rated net 155.00 + 32.76 + 110.00 = £297.76; VAT 20% = 59.552 → £59.55
     *   net 297.76 + 45.00 = £342.76; gross 342.76 + 59.55 = £402.31
     */
    const stored = await estimateOf(job.id);
    expect(stored.version).toBe(1);
    expect(stored.priced.lines.map((l) => l.net)).toEqual(['155.00', '32.76', '110.00', '45.00']);
    expect(stored.priced.quoted).toMatchObject({ net: '342.76', vat: '59.55', gross: '402.31' });
    // Quoted, but nothing counts as agreed until the owner agrees the quote.
    expect(stored.priced.committed.gross).toBe('0.00');
    expect(stored.quote).toMatchObject({ state: 'not_sent', awaitingGross: '402.31' });
    const history = await AuditEvent.findAll({ where: { jobId: job.id, action: 'estimate.saved' } });
    expect(history.map((h) => h.summary)).toEqual(['Estimate saved: 4 lines changed, total £0.00 → £402.31 incl. VAT']);
    // Once the owner agrees it (here by phone), the whole hand-worked figure counts.
    const agreed = await manager.post(`/api/jobs/${job.id}/quote/phone-agreement`, { agreedWith: 'Owner One', agreedAt: new Date(Date.now() - 60_000).toISOString(), note: '', estimateVersion: stored.version });
    expect(agreed.status).toBe(200);
    expect((agreed.body as EstimateDto).priced.committed.gross).toBe('402.31');
  });

  it('when two managers save the same estimate at once, then exactly one wins and the other is told, with nothing lost', async () => {
    const job = await inspectingJob();
    const mine = labour({ description: 'Manager’s line' });
    const theirs = labour({ description: 'Admin’s line', quantity: '2' });
    const [r1, r2] = await Promise.all([
      manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [mine] }),
      admin.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [theirs] }),
    ]);
    const statuses = [r1.status, r2.status].sort();
    expect(statuses).toEqual([200, 409]);
    const loser = r1.status === 409 ? r1 : r2;
    const winnerLine = r1.status === 200 ? mine : theirs;
    expect(loser.body.error.code).toBe('stale_version');
    expect(loser.body.error.message).toMatch(/someone else changed/i);
    expect(loser.body.error.fields.version).toBe('1');
    const now = await estimateOf(job.id);
    expect(now.version).toBe(1);
    expect(now.lines.map((l) => l.description)).toEqual([winnerLine.description]);
    // The loser, now holding the current version, saves on top of it: both lines survive.
    const other = winnerLine === mine ? theirs : mine;
    const retry = await (winnerLine === mine ? admin : manager).put(`/api/jobs/${job.id}/estimate`, { version: 1, lines: [...now.lines, other] });
    expect(retry.status).toBe(200);
    expect(retry.body.lines.map((l: { description: string }) => l.description).sort()).toEqual([mine.description, theirs.description].sort());
  });

  it("when a line names another job's finding, then the save is refused and nothing changes", async () => {
    const job = await inspectingJob();
    const elsewhere = await makeFinding(await inspectingJob());
    const res = await manager.put(`/api/jobs/${job.id}/estimate`, {
      version: 0,
      lines: [labour(), labour({ stage: 'discovered', findingId: elsewhere.id })],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['lines.1.findingId']).toBe('That finding is not on this job.');
    const est = await estimateOf(job.id);
    expect({ version: est.version, lines: est.lines.length }).toEqual({ version: 0, lines: 0 });
  });

  it('when a finding gets discovered lines, then it is priced; when they are removed, it is a draft again', async () => {
    const job = await inspectingJob();
    const f = await makeFinding(job);
    const taskId = randomUUID();
    const line = labour({ stage: 'discovered', findingId: f.id, accessTaskId: taskId, description: 'Renew hose' });
    const saved = await manager.put(`/api/jobs/${job.id}/estimate`, {
      version: 0,
      lines: [line],
      accessTasks: [{ id: taskId, name: 'Exhaust off and on', hours: '1.5', labourRateCode: 'standard', ratePerHour: '62.00' }],
    });
    expect(saved.status).toBe(200);
    expect((await Finding.findByPk(f.id))!.state).toBe('priced');
    // 1 h × 62 = 62.00, plus the access task it alone needs, 1.5 h × 62 = 93.00: 155.00 net, 186.00 with VAT.
    expect(saved.body.priced.findings[0]).toMatchObject({ findingId: f.id, price: { net: '155.00', gross: '186.00' } });
    const cleared = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 1, lines: [], accessTasks: [] });
    expect(cleared.status).toBe(200);
    expect((await Finding.findByPk(f.id))!.state).toBe('draft');
    const history = await AuditEvent.findAll({ where: { jobId: job.id }, order: [['at', 'ASC']] });
    expect(history.filter((h) => h.action.startsWith('finding.')).map((h) => h.summary)).toEqual(['Priced F-1', 'F-1 back to draft: no estimate lines left']);
  });

  it('when a finding is withdrawn, then its discovered lines leave the estimate and the estimate version moves on', async () => {
    const job = await inspectingJob();
    const f = await makeFinding(job);
    await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [labour(), labour({ stage: 'discovered', findingId: f.id })] });
    const res = await manager.post(`/api/jobs/${job.id}/findings/${f.id}/withdraw`, { version: (await Finding.findByPk(f.id))!.version, reason: 'Raised twice' });
    expect(res.status).toBe(200);
    expect(res.body.state).toBe('withdrawn');
    const est = await estimateOf(job.id);
    expect({ version: est.version, stages: est.lines.map((l) => l.stage) }).toEqual({ version: 2, stages: ['inspection'] });
  });

  it('when an owner reads their job’s estimate, then it is priced without the workshop’s costs; another owner’s job is 404', async () => {
    const job = await inspectingJob();
    await manager.put(`/api/jobs/${job.id}/estimate`, {
      version: 0,
      lines: [
        { id: randomUUID(), stage: 'inspection', kind: 'part', description: 'Oil', quantity: '2', unitCost: '9.10', markupPercent: '30' },
        { id: randomUUID(), stage: 'inspection', kind: 'subcontract', description: 'Balance', amount: '100.00' },
      ],
    });
    const staffView = await estimateOf(job.id);
    const mine = await owner.get(`/api/jobs/${job.id}/estimate`);
    expect(mine.status).toBe(200);
    expect(mine.body.priced.quoted).toEqual(staffView.priced.quoted);
    expect(mine.body.lines.map((l: { unitCost: string | null; markupPercent: string | null; amount: string | null }) => [l.unitCost, l.markupPercent, l.amount])).toEqual([[null, null, null], [null, null, null]]);
    expect(mine.body.priced.lines.map((l: { cost: string | null; net: string }) => [l.cost, l.net])).toEqual([[null, '23.66'], [null, '110.00']]);
    expect((await owner.get(`/api/jobs/${a.owners[1].job.id}/estimate`)).status).toBe(404);
    expect((await owner.get(`/api/jobs/${a.owners[1].job.id}/findings`)).status).toBe(404);
  });

  it('when a large estimate of 1500 lines is saved, then it is accepted whole and priced', async () => {
    const job = await inspectingJob();
    const lines = Array.from({ length: 1500 }, (_, i) => labour({ description: `Task ${i + 1} of a long strip-down`, quantity: '0.10' }));
    const started = Date.now();
    const res = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines });
    const ms = Date.now() - started;
    expect(res.status).toBe(200);
    // 1500 × 0.10 h × £62.00 = £9,300.00 net; VAT 20% = £1,860.00; gross £11,160.00.
    expect(res.body.priced.quoted).toMatchObject({ net: '9300.00', vat: '1860.00', gross: '11160.00' });
    expect(ms).toBeLessThan(15_000);
  });

  it('when an invoiced job’s estimate is saved, then it is refused', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'invoiced');
    const res = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [labour()] });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/invoiced/);
  });
});

describe('checklist, findings and time', () => {
  async function plugItem(job: Job) {
    return JobChecklistItem.create({ workshopId: a.workshop.id, jobId: job.id, sortOrder: 0, section: 'Engine', text: 'Spark plug electrode gap', limit: PLUG_LIMIT });
  }

  it('when a plug gap of 0.95 mm is recorded against the 0.9 mm example wear limit, then it is above, and a finding from it carries the measurement', async () => {
    const job = await inspectingJob();
    const item = await plugItem(job);
    const rec = await engineer.patch(`/api/jobs/${job.id}/checklist/${item.id}`, { version: 0, result: 'measured', measuredValue: '0.95' });
    expect(rec.status).toBe(200);
    expect(rec.body).toMatchObject({ result: 'measured', measuredValue: '0.9500', limitCheck: 'above', recordedByName: a.users.engineer.name });
    const within = await engineer.patch(`/api/jobs/${job.id}/checklist/${item.id}`, { version: rec.body.version, result: 'measured', measuredValue: '0.9' });
    expect(within.body.limitCheck).toBe('within');
    await engineer.patch(`/api/jobs/${job.id}/checklist/${item.id}`, { version: within.body.version, result: 'measured', measuredValue: '0.95' });

    const raised = await engineer.post(`/api/jobs/${job.id}/findings`, {
      title: 'Plug electrodes worn', location: 'Engine, all plugs', category: 'recommended', seen: 'Gap 0.95 mm.', checklistItemId: item.id,
    });
    expect(raised.status).toBe(201);
    const f = raised.body as FindingDto;
    expect(f).toMatchObject({ number: 'F-1', state: 'draft', measuredValue: '0.9500', limit: PLUG_LIMIT, raisedByName: a.users.engineer.name });
    const list = (await engineer.get(`/api/jobs/${job.id}/checklist`)).body as JobChecklistItemDto[];
    expect(list[0]!.findingId).toBe(f.id);
    const history = await AuditEvent.findAll({ where: { jobId: job.id }, order: [['at', 'ASC']] });
    expect(history.map((h) => h.action)).toEqual(['checklist.recorded', 'checklist.recorded', 'checklist.recorded', 'finding.raised']);
    expect(history[0]!.summary).toMatch(/0\.95 mm \(above the limit at most 0\.9 mm\)/);
  });

  it('when findings are raised one after another, including a refused one, then their numbers have no gaps', async () => {
    const job = await inspectingJob();
    const body = { title: 'Chafe', location: 'Rear fuselage', category: 'advisory', seen: 'Light chafe.' };
    expect((await engineer.post(`/api/jobs/${job.id}/findings`, body)).body.number).toBe('F-1');
    const bad = await engineer.post(`/api/jobs/${job.id}/findings`, { ...body, remedy: { parts: [{ partId: randomUUID(), quantity: '1' }] } });
    expect(bad.status).toBe(400);
    expect((await engineer.post(`/api/jobs/${job.id}/findings`, body)).body.number).toBe('F-2');
    // Three people raising at the same moment still get distinct, consecutive numbers.
    const burst = await Promise.all([engineer, manager, admin].map((c) => c.post(`/api/jobs/${job.id}/findings`, body)));
    expect(burst.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(burst.map((r) => r.body.number).sort()).toEqual(['F-3', 'F-4', 'F-5']);
  });

  it('when an owner lists findings, then drafts are not shown', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'inspecting');
    await makeFinding(job, { state: 'draft', seq: 1 });
    const priced = await makeFinding(job, { state: 'priced', seq: 2 });
    const res = await owner.get(`/api/jobs/${job.id}/findings`);
    expect(res.status).toBe(200);
    expect(res.body.map((f: FindingDto) => f.id)).toEqual([priced.id]);
    expect((await manager.get(`/api/jobs/${job.id}/findings`)).body).toHaveLength(2);
  });

  it('when a sent finding is edited, then it is refused', async () => {
    const job = await inspectingJob();
    const f = await makeFinding(job, { state: 'sent' });
    const res = await engineer.patch(`/api/jobs/${job.id}/findings/${f.id}`, { version: 0, title: 'Changed' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('invalid_transition');
  });

  it('when time is logged, then it is listed with who logged it; a finding from another job is refused', async () => {
    const job = await inspectingJob();
    const f = await makeFinding(job);
    const ok = await engineer.post(`/api/jobs/${job.id}/time`, { hours: '1.75', workedOn: '2026-12-01', note: 'Plugs', findingId: f.id });
    expect(ok.status).toBe(201);
    const other = await makeFinding(await inspectingJob());
    const bad = await engineer.post(`/api/jobs/${job.id}/time`, { hours: '1', workedOn: '2026-12-01', findingId: other.id });
    expect(bad.status).toBe(400);
    const zero = await engineer.post(`/api/jobs/${job.id}/time`, { hours: '0', workedOn: '2026-12-01' });
    expect(zero.status).toBe(400);
    const list = await manager.get(`/api/jobs/${job.id}/time`);
    expect(list.body).toEqual([expect.objectContaining({ hours: '1.75', userName: a.users.engineer.name, findingId: f.id, note: 'Plugs' })]);
  });
});

describe('release guard', () => {
  async function moveToRelease(job: Job) {
    const fresh = await Job.findByPk(job.id);
    return manager.post(`/api/jobs/${job.id}/transition`, { to: 'ready_for_release', version: fresh!.version });
  }

  it('when an airworthiness finding is open, then ready for release is refused with the reason; once withdrawn, it is allowed', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'in_work');
    const raised = await engineer.post(`/api/jobs/${job.id}/findings`, { title: 'Cracked exhaust mount', location: 'Engine, lower mount', category: 'airworthiness', seen: 'Crack at the weld.' });
    await engineer.post(`/api/jobs/${job.id}/findings`, { title: 'Scuffed fairing', location: 'Nose', category: 'advisory', seen: 'Cosmetic.' });
    const refused = await moveToRelease(job);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('invalid_transition');
    expect(refused.body.error.message).toMatch(/F-1 Cracked exhaust mount/);
    expect(refused.body.error.message).not.toMatch(/Scuffed fairing/);
    expect(refused.body.error.message).toMatch(/inspector decides/);
    await manager.post(`/api/jobs/${job.id}/findings/${raised.body.id}/withdraw`, { version: raised.body.version, reason: 'Mount was sound; paint crack only' });
    const allowed = await moveToRelease(job);
    expect(allowed.status).toBe(200);
    expect(allowed.body.state).toBe('ready_for_release');
  });

  it('when a declined airworthiness finding is open, then release is refused; an approved one is allowed once rectified', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'in_work');
    // Owners' decisions arrive with approval requests; here the states are set directly.
    const declined = await makeFinding(job, { category: 'airworthiness', state: 'declined', title: 'Corroded strut fitting' });
    const refused = await moveToRelease(job);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/F-1 Corroded strut fitting \(declined by the owner\)/);
    await declined.update({ state: 'approved' });
    const stillOpen = await moveToRelease(job);
    expect(stillOpen.body.error.message).toMatch(/not yet recorded as rectified/);
    const rect = await engineer.post(`/api/jobs/${job.id}/findings/${declined.id}/rectified`, { version: declined.version, reason: 'New fitting made and fitted' });
    expect(rect.status).toBe(200);
    expect(rect.body).toMatchObject({ rectifiedByName: a.users.engineer.name });
    expect(rect.body.rectifiedAt).toBeTruthy();
    expect((await moveToRelease(job)).status).toBe(200);
  });

  it('when a draft finding is marked rectified, then it is refused', async () => {
    const job = await makeJob(a.workshop.id, a.owners[0].aircraft.id, 'in_work');
    const f = await makeFinding(job);
    const res = await engineer.post(`/api/jobs/${job.id}/findings/${f.id}/rectified`, { version: 0 });
    expect(res.status).toBe(409);
  });
});

describe('workshop boundary for the estimate routes', () => {
  it("when workshop A reads or writes B's catalogue, templates, estimate, checklist, findings or time, then every one is 404 and B's rows are unchanged", async () => {
    const bJob = await makeJob(b.workshop.id, b.owners[0].aircraft.id, 'inspecting');
    const bItem = await JobChecklistItem.create({ workshopId: b.workshop.id, jobId: bJob.id, sortOrder: 0, text: 'Tyres', limit: null });
    const bFinding = await makeFinding(bJob);
    const bSupplier = await Supplier.create({ workshopId: b.workshop.id, name: 'B loft', kind: 'sail_loft' });
    const bPart = await Part.create({ workshopId: b.workshop.id, partNumber: `B-${uniq()}`, description: 'B part', unitCost: '1.0000', unitPrice: null, markupPercent: null, supplierId: null });
    const bTemplate = await bAdmin.post('/api/templates', { name: 'B template', jobType: 'other', lines: [], checklist: [] });
    const calls: [string, 'get' | 'post' | 'patch' | 'put', object?][] = [
      [`/api/jobs/${bJob.id}/estimate`, 'get'],
      [`/api/jobs/${bJob.id}/estimate`, 'put', { version: 0, lines: [labour()] }],
      [`/api/jobs/${bJob.id}/checklist`, 'get'],
      [`/api/jobs/${bJob.id}/checklist/${bItem.id}`, 'patch', { version: 0, result: 'fail' }],
      [`/api/jobs/${bJob.id}/findings`, 'get'],
      [`/api/jobs/${bJob.id}/findings`, 'post', { title: 'x', location: 'y', category: 'advisory', seen: 'z' }],
      [`/api/jobs/${bJob.id}/findings/${bFinding.id}`, 'patch', { version: 0, title: 'Hijacked' }],
      [`/api/jobs/${bJob.id}/findings/${bFinding.id}/withdraw`, 'post', { version: 0 }],
      [`/api/jobs/${bJob.id}/time`, 'get'],
      [`/api/jobs/${bJob.id}/time`, 'post', { hours: '1', workedOn: '2026-12-01' }],
      [`/api/suppliers/${bSupplier.id}`, 'patch', { version: 0, name: 'Hijacked' }],
      [`/api/parts/${bPart.id}`, 'patch', { version: 0, description: 'Hijacked' }],
      [`/api/templates/${bTemplate.body.id}`, 'get'],
      [`/api/templates/${bTemplate.body.id}`, 'put', { name: 'Hijacked', jobType: 'other', lines: [], checklist: [], version: 0 }],
    ];
    for (const [path, method, body] of calls) {
      const res = method === 'get' ? await admin.get(path) : await admin[method](path, body);
      expect({ path, method, status: res.status }).toEqual({ path, method, status: 404 });
    }
    // A finding of B's job named from A's own job is a field error, not a leak.
    const aJob = await inspectingJob();
    const cross = await manager.put(`/api/jobs/${aJob.id}/estimate`, { version: 0, lines: [labour({ stage: 'discovered', findingId: bFinding.id })] });
    expect(cross.status).toBe(400);
    const crossPart = await manager.put(`/api/jobs/${aJob.id}/estimate`, { version: 0, lines: [{ id: randomUUID(), stage: 'inspection', kind: 'part', description: 'x', unitCost: '1', partId: bPart.id }] });
    expect(crossPart.status).toBe(400);
    expect(crossPart.body.error.fields['lines.0.partId']).toBeTruthy();
    expect((await Finding.findByPk(bFinding.id))!.title).not.toBe('Hijacked');
    expect((await Part.findByPk(bPart.id))!.description).toBe('B part');
    const aParts = await admin.get('/api/parts?pageSize=100');
    expect(aParts.body.items.map((p: { id: string }) => p.id)).not.toContain(bPart.id);
    // Asking by id for another workshop's part or supplier finds nothing, beside one's own.
    const own = aParts.body.items[0] as { id: string };
    const byIds = await admin.get(`/api/parts?ids=${own.id},${bPart.id}`);
    expect(byIds.status).toBe(200);
    expect(byIds.body.items.map((p: { id: string }) => p.id)).toEqual([own.id]);
    const badIds = await admin.get('/api/parts?ids=not-an-id');
    expect(badIds.status).toBe(400);
    expect(badIds.body.error.fields['ids.0']).toBe('Choose one from the list.');
    const aSupplier = (await admin.get('/api/suppliers?pageSize=1')).body.items[0] as { id: string };
    const suppliersById = await admin.get(`/api/suppliers?ids=${aSupplier.id},${randomUUID()}`);
    expect(suppliersById.body.items.map((s: { id: string }) => s.id)).toEqual([aSupplier.id]);
    const aTemplates = await admin.get('/api/templates');
    expect(aTemplates.body.map((t: { id: string }) => t.id)).not.toContain(bTemplate.body.id);
  });
});

import { createHmac, randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DecisionPageDto, EstimateDto, EstimateLineInputForm, SendForApprovalResultDto } from '@wingstage/shared';
import { ApprovalRequest, EstimateLine, Finding, boundSequelize } from '../src/models/index.js';
import { QueryTypes } from 'sequelize';
import { makeFinding, makeJob, makeWorkshop, sha256Hex, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/**
 * The owner's decision races the manager's changes to the same job. Each round sets up a fresh job
 * with one finding sent for approval, then fires the decision and the change at the same moment.
 * Whichever wins, the other must be told plainly (409), never see a 500, and nothing may be
 * half-written. Before one lock order held for the whole server these deadlocked in 8 of 8 rounds.
 */
const ROUNDS = 20;

let server: TestServer;
let w: WorkshopFixture;
let manager: Client;

beforeAll(async () => {
  // The mail worker is not needed: the link's token is worked out from the request's nonce below.
  server = await startTestServer({ MAIL_WORKER: 'false' });
  w = await makeWorkshop('Races');
  manager = await signIn(server.app, w.users.manager.email);
});
afterAll(async () => {
  await server?.close();
});

/** The link token the server e-mails, from the stored nonce (the same HMAC the approval service signs with). */
async function tokenOf(requestId: string): Promise<string> {
  const r = (await ApprovalRequest.findByPk(requestId))!;
  const token = createHmac('sha256', server.parts.config.JWT_SECRET).update(`approval-link:${r.id}:${r.linkNonce}`).digest('base64url');
  expect(sha256Hex(token)).toBe(r.tokenHash);
  return token;
}

interface Sent {
  jobId: string;
  findingId: string;
  lineId: string;
  requestId: string;
  token: string;
  page: DecisionPageDto;
  estimate: EstimateDto;
}

/** A job in inspection with one finding priced at a 125.00 fee and sent to the owner. */
async function sentFinding(): Promise<Sent> {
  const job = await makeJob(w.workshop.id, w.owners[0].aircraft.id, 'inspecting');
  const finding = await makeFinding(job, { title: 'Cracked exhaust clamp' });
  const lineId = randomUUID();
  const line: EstimateLineInputForm = { id: lineId, stage: 'discovered', kind: 'fee', description: 'Replace clamp', amount: '125.00', vatRate: 'standard', findingId: finding.id };
  const saved = await manager.put(`/api/jobs/${job.id}/estimate`, { version: 0, lines: [line], accessTasks: [] });
  expect(saved.status).toBe(200);
  const sent = await manager.post(`/api/jobs/${job.id}/approval-requests`, { findingIds: [finding.id], message: '', estimateVersion: saved.body.version });
  expect(sent.status).toBe(201);
  const requestId = (sent.body as SendForApprovalResultDto).request!.id;
  const token = await tokenOf(requestId);
  const page = await request(server.app).get(`/api/decide/${token}`);
  expect(page.status).toBe(200);
  const estimate = (await manager.get(`/api/jobs/${job.id}/estimate`)).body as EstimateDto;
  return { jobId: job.id, findingId: finding.id, lineId, requestId, token, page: page.body as DecisionPageDto, estimate };
}

const approveAll = (s: Sent) =>
  request(server.app)
    .post(`/api/decide/${s.token}`)
    .send({ snapshotHash: s.page.snapshotHash, typedName: 'Owner One', decisions: [{ itemId: s.findingId, decision: 'approve', note: '' }] });

/** Deadlocks PostgreSQL has detected in this test run's database so far (its statistics lag by up to a second). */
async function deadlocks(): Promise<number> {
  await new Promise((r) => setTimeout(r, 1200));
  await boundSequelize().query('SELECT pg_stat_clear_snapshot()');
  const [row] = await boundSequelize().query<{ n: string }>('SELECT deadlocks AS n FROM pg_stat_database WHERE datname = current_database()', { type: QueryTypes.SELECT });
  return Number(row!.n);
}

/** The loser was refused by the rules (stale version, request replaced, finding decided), not by a collision. */
const BUSY = /at that moment/;

async function decisionRows(requestId: string): Promise<number> {
  const [row] = await boundSequelize().query<{ n: string }>('SELECT count(*) AS n FROM approval_decisions WHERE request_id = $1', {
    bind: [requestId],
    type: QueryTypes.SELECT,
  });
  return Number(row!.n);
}

describe('the owner deciding while the manager changes the same job', () => {
  it(`when the decision and a price-changing estimate save arrive together (${ROUNDS} rounds), then one wins, the other gets 409, and nothing is half-written`, async () => {
    const wins = { decision: 0, save: 0 };
    const deadlocksBefore = await deadlocks();
    for (let round = 0; round < ROUNDS; round += 1) {
      const s = await sentFinding();
      const newPrice: EstimateLineInputForm = { id: s.lineId, stage: 'discovered', kind: 'fee', description: 'Replace clamp', amount: '130.00', vatRate: 'standard', findingId: s.findingId };
      const [decided, saved] = await Promise.all([approveAll(s), manager.put(`/api/jobs/${s.jobId}/estimate`, { version: s.estimate.version, lines: [newPrice], accessTasks: [] })]);
      expect([decided.status, saved.status].sort(), `round ${round}: ${JSON.stringify([decided.body, saved.body])}`).toEqual([200, 409]);
      expect(JSON.stringify([decided.body, saved.body])).not.toMatch(BUSY);

      const old = (await ApprovalRequest.findByPk(s.requestId))!;
      const finding = (await Finding.findByPk(s.findingId))!;
      const lines = await EstimateLine.findAll({ where: { jobId: s.jobId } });
      if (decided.status === 200) {
        wins.decision += 1;
        expect(saved.body.error.code).toBe('stale_version');
        expect(old.state).toBe('decided');
        expect(finding.state).toBe('approved');
        expect(lines.map((l) => [l.stage, l.amount])).toEqual([['approved', '125.00']]);
        expect(await decisionRows(s.requestId)).toBe(1);
        expect(await ApprovalRequest.count({ where: { jobId: s.jobId, state: 'sent' } })).toBe(0);
      } else {
        wins.save += 1;
        expect(decided.body.error.code).toBe('conflict');
        expect(old.state).toBe('replaced');
        expect(finding.state).toBe('sent');
        expect(lines.map((l) => [l.stage, l.amount])).toEqual([['discovered', '130.00']]);
        expect(await decisionRows(s.requestId)).toBe(0);
        const next = await ApprovalRequest.findAll({ where: { jobId: s.jobId, state: 'sent' } });
        expect(next.map((r) => r.id)).toEqual([old.replacedById]);
      }
    }
    expect(wins.decision + wins.save).toBe(ROUNDS);
    expect(await deadlocks()).toBe(deadlocksBefore);
  });

  it(`when the decision and the finding's withdrawal arrive together (${ROUNDS} rounds), then one wins, the other gets 409, and nothing is half-written`, async () => {
    const wins = { decision: 0, withdrawal: 0 };
    const deadlocksBefore = await deadlocks();
    for (let round = 0; round < ROUNDS; round += 1) {
      const s = await sentFinding();
      const version = (await Finding.findByPk(s.findingId))!.version;
      const [decided, withdrawn] = await Promise.all([
        approveAll(s),
        manager.post(`/api/jobs/${s.jobId}/findings/${s.findingId}/withdraw`, { version, reason: 'Raised on the wrong aircraft' }),
      ]);
      expect([decided.status, withdrawn.status].sort(), `round ${round}: ${JSON.stringify([decided.body, withdrawn.body])}`).toEqual([200, 409]);
      expect(JSON.stringify([decided.body, withdrawn.body])).not.toMatch(BUSY);

      const old = (await ApprovalRequest.findByPk(s.requestId))!;
      const finding = (await Finding.findByPk(s.findingId))!;
      const lines = await EstimateLine.findAll({ where: { jobId: s.jobId } });
      if (decided.status === 200) {
        wins.decision += 1;
        expect(withdrawn.body.error.code).toBe('stale_version');
        expect(old.state).toBe('decided');
        expect(finding.state).toBe('approved');
        expect(lines.map((l) => l.stage)).toEqual(['approved']);
        expect(await decisionRows(s.requestId)).toBe(1);
      } else {
        wins.withdrawal += 1;
        expect(decided.body.error.code).toBe('conflict');
        expect(finding.state).toBe('withdrawn');
        expect(lines).toHaveLength(0);
        expect(['revoked', 'replaced']).toContain(old.state);
        expect(await decisionRows(s.requestId)).toBe(0);
        expect(await ApprovalRequest.count({ where: { jobId: s.jobId, state: 'sent' } })).toBe(0);
      }
    }
    expect(wins.decision + wins.withdrawal).toBe(ROUNDS);
    expect(await deadlocks()).toBe(deadlocksBefore);
  });
});

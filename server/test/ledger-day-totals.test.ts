import { QueryTypes } from 'sequelize';
import { Dec } from '@wingstage/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Payment, Refund } from '../src/models/index.js';
import { offlinePayment } from './accounts-fixtures.js';
import { makeJob, makeWorkshop, signIn, startTestServer, type Client, type TestServer, type WorkshopFixture } from './helpers.js';

/**
 * The ledger's day totals (migration 0180) are kept by triggers on payments and refunds. Whatever
 * writes a payment or refund, they must equal a direct SUM over the ledger's rows, day by day, kind
 * by kind, status by status, in NUMERIC; and the ledger's totals must equal the direct SUM for the
 * filters it offers.
 */
let server: TestServer;
let w: WorkshopFixture;
let acc: Client;

type Bucket = { day: string; kind: string; status: string; rows: string; gross: string; fee: string; net: string };

/** The ledger's rows summed directly, the way the ledger itself defines them. */
async function direct(workshopId: string): Promise<Bucket[]> {
  return server.parts.sequelize.query<Bucket>(
    `SELECT (at AT TIME ZONE 'UTC')::date::text AS day, kind, status, count(*)::text AS rows, SUM(gross)::numeric(16,2)::text AS gross,
            COALESCE(SUM(fee), 0)::numeric(16,2)::text AS fee, COALESCE(SUM(net), 0)::numeric(16,2)::text AS net
       FROM (SELECT p.received_at AS at, CASE WHEN p.method <> 'card' THEN 'offline' ELSE p.kind END AS kind, p.state AS status, p.amount AS gross,
                    CASE WHEN p.method <> 'card' THEN COALESCE(p.fee, 0) ELSE p.fee END AS fee,
                    CASE WHEN p.method <> 'card' THEN COALESCE(p.net, p.amount) ELSE p.net END AS net
               FROM payments p WHERE p.workshop_id = $1 AND p.amount IS NOT NULL AND p.received_at IS NOT NULL
             UNION ALL
             SELECT r.created_at, 'refund', r.state, -r.amount, 0, -r.amount FROM refunds r WHERE r.workshop_id = $1 AND r.state <> 'failed') l
      GROUP BY 1, 2, 3 ORDER BY 1, 2, 3`,
    { bind: [workshopId], type: QueryTypes.SELECT },
  );
}

/** The stored day totals, buckets emptied by moves left out. */
async function stored(workshopId: string): Promise<Bucket[]> {
  return server.parts.sequelize.query<Bucket>(
    `SELECT day::text, kind, status, rows::text, gross::text, fee::text, net::text FROM ledger_day_totals
      WHERE workshop_id = $1 AND NOT (rows = 0 AND gross = 0 AND fee = 0 AND net = 0) ORDER BY 1, 2, 3`,
    { bind: [workshopId], type: QueryTypes.SELECT },
  );
}

const card = (jobId: string, amount: string, fee: string, receivedAt: Date | null, state = 'succeeded') =>
  Payment.create({
    workshopId: w.workshop.id, jobId, kind: 'balance', method: 'card', state, currency: 'GBP', expectedAmount: amount,
    amount: receivedAt ? amount : null, fee: receivedAt ? fee : null, net: receivedAt ? new Dec(amount).minus(fee).toFixed(2) : null, receivedAt,
  } as never);

beforeAll(async () => {
  server = await startTestServer();
  w = await makeWorkshop('Day totals');
  acc = await signIn(server.app, w.users.accounts.email);
});
afterAll(async () => {
  await server?.close();
});

describe('the ledger day totals', () => {
  it('when card and offline payments are received, refunded, moved and removed, then the stored totals equal a direct sum', async () => {
    const job = w.owners[0].job;
    const a = await card(job.id, '120.00', '2.00', new Date('2026-10-01T09:00:00Z'));
    const b = await card(job.id, '35.55', '0.73', new Date('2026-10-01T23:59:59Z'));
    await offlinePayment(job, '250.00', new Date('2026-10-02T08:00:00Z'));
    // A card page opened but never paid is no ledger row; once paid it becomes one.
    const pending = await card(job.id, '80.10', '1.40', null, 'pending');
    expect(await stored(w.workshop.id)).toEqual(await direct(w.workshop.id));
    await pending.update({ state: 'succeeded', amount: '80.10', fee: '1.40', net: '78.70', receivedAt: new Date('2026-10-03T12:00:00Z') } as never);
    // A refund, and the payment it belongs to moving to partly refunded (a move between buckets).
    await Refund.create({ workshopId: w.workshop.id, jobId: job.id, paymentId: a.id, amount: '20.00', currency: 'GBP', state: 'pending', reason: 'Returned' } as never);
    await a.update({ refunded: '20.00', state: 'partially_refunded' } as never);
    await Refund.update({ state: 'succeeded' } as never, { where: { paymentId: a.id } });
    // A failed refund is no ledger row.
    const failed = await Refund.create({ workshopId: w.workshop.id, jobId: job.id, paymentId: b.id, amount: '5.00', currency: 'GBP', state: 'failed', reason: 'Returned' } as never);
    // A payment whose date is corrected moves to another day; one removed leaves its day.
    await b.update({ receivedAt: new Date('2026-10-04T10:00:00Z') } as never);
    await failed.destroy();
    const gone = await card(job.id, '9.99', '0.35', new Date('2026-10-05T10:00:00Z'));
    await gone.destroy();
    const after = await direct(w.workshop.id);
    expect(after.length).toBeGreaterThan(3);
    expect(await stored(w.workshop.id)).toEqual(after);
  });

  it('when 20 payments are written at once on one day and 20 more move between buckets at once, then no change is lost', async () => {
    const job = await makeJob(w.workshop.id, w.owners[1].aircraft.id, 'in_work');
    const day = new Date('2026-10-10T10:00:00Z');
    const made = await Promise.all(Array.from({ length: 20 }, (_, i) => card(job.id, `${10 + i}.${String(i).padStart(2, '0')}`, '0.50', day)));
    await Promise.all(made.map((p, i) => (i % 2 === 0 ? p.update({ state: 'refunded', refunded: p.amount } as never) : offlinePayment(job, '1.01', day))));
    expect(await stored(w.workshop.id)).toEqual(await direct(w.workshop.id));
  });

  it('when accounts reads the ledger with each filter, then its totals equal the direct sum of the rows it lists', async () => {
    const expectSame = async (query: string, where: (b: Bucket) => boolean) => {
      const res = await acc.get(`/api/accounts/ledger?${query}`);
      expect(res.status).toBe(200);
      const picked = (await direct(w.workshop.id)).filter(where);
      const sum = (k: 'gross' | 'fee' | 'net') => picked.reduce((s, b) => s.plus(b[k]), new Dec(0)).toFixed(2);
      expect(res.body.total).toBe(picked.reduce((s, b) => s + Number(b.rows), 0));
      expect(res.body.totals).toEqual({ gross: sum('gross'), fee: sum('fee'), net: sum('net') });
    };
    await expectSame('pageSize=5', () => true);
    await expectSame('from=2026-10-01&to=2026-10-01', (b) => b.day === '2026-10-01');
    await expectSame('from=2026-10-02&to=2026-10-10&kind=offline', (b) => b.day >= '2026-10-02' && b.day <= '2026-10-10' && b.kind === 'offline');
    await expectSame('status=refunded', (b) => b.status === 'refunded');
    await expectSame('kind=refund', (b) => b.kind === 'refund');
  });

  it('when the ledger is paged in each order, then the pages put together are the whole list in that order, refunds and payments merged', async () => {
    type Item = { id: string; date: string; gross: string; fee: string | null; net: string | null; kind: string };
    const key: Record<string, (i: Item) => string | null> = { date: (i) => i.date, gross: (i) => i.gross, fee: (i) => i.fee, net: (i) => i.net };
    for (const sort of ['date', 'gross', 'fee', 'net']) {
      for (const dir of ['asc', 'desc']) {
        const whole = (await acc.get(`/api/accounts/ledger?sort=${sort}&dir=${dir}&pageSize=200`)).body as { items: Item[]; total: number };
        expect(whole.items).toHaveLength(whole.total);
        expect(whole.items.some((i) => i.kind === 'refund')).toBe(true);
        const paged: Item[] = [];
        for (let page = 1; page <= Math.ceil(whole.total / 7); page += 1) paged.push(...((await acc.get(`/api/accounts/ledger?sort=${sort}&dir=${dir}&pageSize=7&page=${page}`)).body.items as Item[]));
        expect(paged.map((i) => i.id)).toEqual(whole.items.map((i) => i.id));
        // In order: by the column (nulls last), then by id, in the asked direction.
        const cmp = (a: Item, b: Item) => {
          const [x, y] = [key[sort]!(a), key[sort]!(b)];
          // Nulls last in either direction.
          if (x === null || y === null) return x === y ? (dir === 'asc' ? (a.id < b.id ? -1 : 1) : a.id > b.id ? -1 : 1) : x === null ? 1 : -1;
          const by = sort === 'date' ? Date.parse(x) - Date.parse(y) : new Dec(x).comparedTo(y);
          const d = by !== 0 ? by : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
          return dir === 'asc' ? d : -d;
        };
        for (let i = 1; i < whole.items.length; i += 1) expect(cmp(whole.items[i - 1]!, whole.items[i]!)).toBeLessThanOrEqual(0);
      }
    }
  });
});

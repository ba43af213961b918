import { Router, type RequestHandler } from 'express';
import {
  EXCEPTION_KIND_LABELS,
  LEDGER_KIND_LABELS,
  agedDebtQuerySchema,
  agedDebtReminderSchema,
  exceptionListQuerySchema,
  exceptionResolveSchema,
  idParamsSchema,
  ledgerQuerySchema,
  periodSchema,
  type Role,
} from '@wingstage/shared';
import { z } from 'zod';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import { notFound } from '../errors/app-error.js';
import type { Deps } from '../services/deps.js';
import { stripeClient } from '../payments/stripe-client.js';
import { ledgerAll, ledgerPage } from '../accounts/ledger.js';
import { getPayout, listPayouts, syncPayouts } from '../accounts/payouts.js';
import { listExceptions, resolveException, scanExceptions } from '../accounts/exceptions.js';
import { agedDebt, sendDebtReminder } from '../accounts/aged-debt.js';
import { vatSummary } from '../accounts/vat-summary.js';
import { weeklyMoney } from '../accounts/weekly.js';
import { toCsv } from '../accounts/csv.js';

/** Accounts and admin work here; managers may read; engineers and owners find nothing (404). */
const READERS: Role[] = ['accounts', 'admin', 'manager'];
const WRITERS: Role[] = ['accounts', 'admin'];

function only(config: Deps['config'], roles: Role[]): RequestHandler[] {
  return [
    authorize(config),
    (req, _res, next) => {
      if (!roles.includes(scopeOf(req).role)) throw notFound('That page');
      next();
    },
  ];
}

const payoutListQuery = z.object({ from: z.iso.date().optional(), to: z.iso.date().optional() }).refine((p) => !p.from || !p.to || p.from <= p.to, { message: 'The start date must be on or before the end date.', path: ['to'] });

function sendCsv(res: import('express').Response, name: string, body: string) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${name}"`);
  res.send(body);
}

export function accountsRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  const read = only(config, READERS);
  const write = only(config, WRITERS);
  const currencyOf = (req: import('express').Request) => req.auth!.workshop.currency;

  router.get('/ledger', ...read, validate({ query: ledgerQuerySchema }), async (req, res) => {
    res.json(await ledgerPage(scopeOf(req), validQuery(req, ledgerQuerySchema), currencyOf(req)));
  });
  router.get('/ledger.csv', ...read, validate({ query: ledgerQuerySchema }), async (req, res) => {
    const rows = await ledgerAll(scopeOf(req), validQuery(req, ledgerQuerySchema));
    sendCsv(
      res,
      'ledger.csv',
      toCsv(
        [
          { key: 'date', value: (r) => r.date.slice(0, 10) },
          { key: 'kind', value: (r) => r.kind },
          { key: 'job', value: (r) => r.jobNumber, text: true },
          { key: 'owner', value: (r) => r.ownerName, text: true },
          { key: 'method', value: (r) => r.method },
          { key: 'currency', value: (r) => r.currency },
          { key: 'gross', value: (r) => r.gross },
          { key: 'fee', value: (r) => r.fee },
          { key: 'net', value: (r) => r.net },
          { key: 'status', value: (r) => r.status },
          { key: 'payout', value: (r) => r.payout, text: true },
          { key: 'settles', value: (r) => r.settles, text: true },
          { key: 'id', value: (r) => r.id },
        ],
        rows,
      ),
    );
  });

  router.get('/payouts', ...read, validate({ query: payoutListQuery }), async (req, res) => {
    res.json(await listPayouts(scopeOf(req), validQuery(req, payoutListQuery)));
  });
  router.get('/payouts.csv', ...read, validate({ query: payoutListQuery }), async (req, res) => {
    const rows = await listPayouts(scopeOf(req), validQuery(req, payoutListQuery));
    sendCsv(
      res,
      'payouts.csv',
      toCsv(
        [
          { key: 'payout', value: (r) => r.stripePayoutId, text: true },
          { key: 'arrival_date', value: (r) => r.arrivalOn },
          { key: 'status', value: (r) => r.status },
          { key: 'currency', value: (r) => r.currency },
          { key: 'amount', value: (r) => r.amount },
          { key: 'transactions_net', value: (r) => r.transactionsNet },
          { key: 'transactions', value: (r) => String(r.transactionsCount) },
          { key: 'adds_up', value: (r) => (r.addsUp ? 'yes' : 'no') },
          { key: 'difference', value: (r) => r.difference },
        ],
        rows,
      ),
    );
  });
  router.post('/payouts/fetch', ...write, async (req, res) => {
    const done = await syncPayouts(stripeClient(config));
    await scanExceptions(scopeOf(req).workshopId);
    res.json(done);
  });
  router.get('/payouts/:id', ...read, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getPayout(scopeOf(req), validParams(req, idParamsSchema).id));
  });

  router.get('/exceptions', ...read, validate({ query: exceptionListQuerySchema }), async (req, res) => {
    res.json(await listExceptions(scopeOf(req), validQuery(req, exceptionListQuerySchema).state));
  });
  router.post('/exceptions/:id/resolve', ...write, validate({ params: idParamsSchema, body: exceptionResolveSchema }), async (req, res) => {
    res.json(await resolveException(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, exceptionResolveSchema).note));
  });

  router.get('/aged-debt', ...read, validate({ query: agedDebtQuerySchema }), async (req, res) => {
    res.json(await agedDebt(scopeOf(req), currencyOf(req), validQuery(req, agedDebtQuerySchema)));
  });
  router.post('/aged-debt/reminders', ...write, validate({ body: agedDebtReminderSchema }), async (req, res) => {
    const w = req.auth!.workshop;
    const contact = [w.contact.phone, w.contact.email].filter(Boolean).join(' or ') || w.name;
    res.status(202).json(await sendDebtReminder(deps, scopeOf(req), validBody(req, agedDebtReminderSchema).customerId, { name: w.name, currency: w.currency, contact }));
  });

  router.get('/vat-summary', ...read, validate({ query: periodSchema }), async (req, res) => {
    res.json(await vatSummary(scopeOf(req), validQuery(req, periodSchema), currencyOf(req)));
  });
  router.get('/vat-summary.csv', ...read, validate({ query: periodSchema }), async (req, res) => {
    const p = validQuery(req, periodSchema);
    const s = await vatSummary(scopeOf(req), p, currencyOf(req));
    sendCsv(
      res,
      `vat-summary-${p.from}-${p.to}.csv`,
      toCsv(
        [
          { key: 'section', value: (r) => r.section },
          { key: 'kind', value: (r) => r.kind },
          { key: 'reference', value: (r) => r.reference, text: true },
          { key: 'job', value: (r) => r.job, text: true },
          { key: 'tax_point', value: (r) => r.taxPoint },
          { key: 'rate', value: (r) => r.rate, text: true },
          { key: 'net', value: (r) => r.net },
          { key: 'vat', value: (r) => r.vat },
          { key: 'gross', value: (r) => r.gross },
        ],
        [
          ...s.documents.map((d) => ({ section: 'document', kind: d.kind, reference: d.reference, job: d.jobNumber, taxPoint: d.taxPoint, rate: d.rate, net: d.net, vat: d.vat, gross: d.gross })),
          ...s.byRate.map((r) => ({ section: 'rate_total', kind: '', reference: '', job: '', taxPoint: '', rate: r.rate, net: r.net, vat: r.vat, gross: r.gross })),
          { section: 'total', kind: '', reference: '', job: '', taxPoint: '', rate: '', ...s.totals },
        ],
      ),
    );
  });

  router.get('/weekly', ...read, async (req, res) => {
    res.json(await weeklyMoney(scopeOf(req), currencyOf(req)));
  });
  router.get('/labels', ...read, (_req, res) => {
    res.json({ ledgerKinds: LEDGER_KIND_LABELS, exceptionKinds: EXCEPTION_KIND_LABELS });
  });
  return router;
}

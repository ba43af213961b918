import { Router } from 'express';
import {
  ROLES,
  STAFF_ROLES,
  creditNoteListQuerySchema,
  creditNoteSchema,
  idParamsSchema,
  invoiceIssueSchema,
  invoiceListQuerySchema,
  offlinePaymentSchema,
  refundSchema,
} from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as invoices from '../services/invoices.service.js';
import * as credits from '../services/credit-notes.service.js';
import { queueDocumentMail, queuePaymentReceipt, resendDocumentMail } from '../jobs/payment-receipts.js';

/** Who handles money after the invoice: accounts, and the admin. */
const MONEY_ROLES = ['admin', 'accounts'] as const;

/** /api/invoices: the staff list, one invoice (an owner their own), refunds and credit notes against it. */
export function invoicesRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  router.get('/', authorize(config, ...STAFF_ROLES), validate({ query: invoiceListQuerySchema }), async (req, res) => {
    res.json(await invoices.listInvoices(scopeOf(req), validQuery(req, invoiceListQuerySchema)));
  });
  router.get('/:id', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await invoices.getInvoice(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/credit-notes', authorize(config, ...MONEY_ROLES), validate({ params: idParamsSchema, body: creditNoteSchema }), async (req, res) => {
    const cn = await credits.issueGoodwillCreditNote(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, creditNoteSchema));
    await queueDocumentMail(deps, { kind: 'credit_note', id: cn.id });
    res.status(201).json(cn);
  });
  router.post('/:id/refunds', authorize(config, ...MONEY_ROLES), validate({ params: idParamsSchema, body: refundSchema }), async (req, res) => {
    const cn = await credits.refundPayment(scopeOf(req), deps, validParams(req, idParamsSchema).id, validBody(req, refundSchema));
    await queueDocumentMail(deps, { kind: 'credit_note', id: cn.id });
    res.status(201).json(cn);
  });
  // "Resend": an invoice whose e-mail was given up (or is still waiting) is queued afresh.
  router.post('/:id/resend', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    await resendDocumentMail(deps, scopeOf(req), { kind: 'invoice', id: validParams(req, idParamsSchema).id });
    res.status(202).json({ queued: true });
  });
  return router;
}

/** /api/credit-notes: the staff list and one credit note (an owner their own), and sending its e-mail again. */
export function creditNotesRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  router.post('/:id/resend', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    await resendDocumentMail(deps, scopeOf(req), { kind: 'credit_note', id: validParams(req, idParamsSchema).id });
    res.status(202).json({ queued: true });
  });
  router.get('/', authorize(config, ...STAFF_ROLES), validate({ query: creditNoteListQuerySchema }), async (req, res) => {
    res.json(await credits.listCreditNotes(scopeOf(req), validQuery(req, creditNoteListQuerySchema)));
  });
  router.get('/:id', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await credits.getCreditNote(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  return router;
}

/** /api/jobs/:id/invoice…: the job's invoice, its preview, issuing it, and payments taken another way. */
export function jobInvoiceRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  router.get('/:id/invoice', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ invoice: await invoices.invoiceOfJob(scopeOf(req), validParams(req, idParamsSchema).id) });
  });
  router.get('/:id/invoice/preview', authorize(config, 'admin', 'manager', 'accounts'), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await invoices.previewInvoice(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/invoice', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: invoiceIssueSchema }), async (req, res) => {
    const inv = await invoices.issueInvoice(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, invoiceIssueSchema));
    await queueDocumentMail(deps, { kind: 'invoice', id: inv.id });
    res.status(201).json(inv);
  });
  router.post('/:id/payments/offline', authorize(config, ...MONEY_ROLES), validate({ params: idParamsSchema, body: offlinePaymentSchema }), async (req, res) => {
    const scope = scopeOf(req);
    // The receipt's task is queued in the payment's own transaction: no moment where one exists without the other.
    const out = await invoices.recordOfflinePayment(scope, validParams(req, idParamsSchema).id, validBody(req, offlinePaymentSchema), (id, t) => queuePaymentReceipt(deps, id, t));
    res.status(201).json(out);
  });
  return router;
}

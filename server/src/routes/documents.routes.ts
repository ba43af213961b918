import { Router, type Response } from 'express';
import { ROLES, idParamsSchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validParams, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as documents from '../services/documents.service.js';

function sendPdf(res: Response, file: documents.PdfFile): void {
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Length', String(file.bytes.length));
  // The name is built of plain characters only (pdfName), so it needs no quoting beyond this.
  res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
  res.setHeader('X-Content-Type-Options', 'nosniff');
  // Private: one owner's document must never be kept by a shared cache.
  res.setHeader('Cache-Control', 'private, no-store');
  res.end(file.bytes);
}

/**
 * The documents as PDF, mounted under /api: owners download their own, staff their workshop's;
 * anyone else's is a 404.
 */
export function documentsRoutes(deps: Deps): Router {
  const router = Router();
  const signedIn = authorize(deps.config, ...ROLES);
  const params = validate({ params: idParamsSchema });
  router.get('/invoices/:id/pdf', signedIn, params, async (req, res) => {
    sendPdf(res, await documents.invoicePdf(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.get('/credit-notes/:id/pdf', signedIn, params, async (req, res) => {
    sendPdf(res, await documents.creditNotePdf(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.get('/jobs/:id/documents', signedIn, params, async (req, res) => {
    res.json(await documents.jobDocuments(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.get('/jobs/:id/estimate.pdf', signedIn, params, async (req, res) => {
    sendPdf(res, await documents.estimatePdf(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.get('/approval-requests/:id/decision-record.pdf', signedIn, params, async (req, res) => {
    sendPdf(res, await documents.decisionRecordPdf(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  return router;
}

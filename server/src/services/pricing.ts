import { priceEstimate, workshopPricingFrom, type PartDto, type WorkshopPricing } from '@wingstage/shared';
import type { Transaction } from 'sequelize';
import { notFound } from '../errors/app-error.js';
import { Workshop } from '../models/index.js';
import type { Scope } from './scope.js';
import { toWorkshopDto } from './workshop.service.js';

export async function loadWorkshop(scope: Scope, t?: Transaction): Promise<Workshop> {
  const w = await Workshop.findByPk(scope.workshopId, { transaction: t });
  if (!w) throw notFound('The workshop');
  return w;
}

export function pricingOf(w: Workshop): WorkshopPricing {
  return workshopPricingFrom(toWorkshopDto(w));
}

/** A catalogue part's sell price per unit: a one-off part line priced by the engine, so there is one formula. */
export function partSellPrice(p: Pick<PartDto, 'unitCost' | 'unitPrice' | 'markupPercent' | 'vatRate'>, pricing: WorkshopPricing): string {
  const priced = priceEstimate(
    { lines: [{ id: 'part', stage: 'inspection', kind: 'part', quantity: '1', unitCost: p.unitCost, unitPrice: p.unitPrice, markupPercent: p.markupPercent, vatRate: p.vatRate }] },
    pricing,
  );
  return priced.lines[0]!.net;
}

/** The workshop's rate for a labour code, or null if the workshop has no such rate. */
export function labourRate(w: Workshop, code: string | null): { code: string; ratePerHour: string } | null {
  const rates = w.labourRates ?? [];
  const r = code ? rates.find((x) => x.code === code) : rates[0];
  return r ? { code: r.code, ratePerHour: r.ratePerHour } : null;
}

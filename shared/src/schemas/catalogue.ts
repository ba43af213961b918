import { z } from 'zod';
import { VAT_RATE_CODES } from '../pricing/types.js';
import { decimalString, idSchema, optionalText, safeString, TEXT_MAX } from './common.js';

/** What a supplier does for the workshop; sub-contract lines name a supplier. */
export const SUPPLIER_KINDS = ['parts', 'sail_loft', 'propeller_shop', 'engine_shop', 'other'] as const;
export type SupplierKind = (typeof SUPPLIER_KINDS)[number];
export const SUPPLIER_KIND_LABELS: Record<SupplierKind, string> = {
  parts: 'Parts supplier',
  sail_loft: 'Sail loft',
  propeller_shop: 'Propeller shop',
  engine_shop: 'Engine shop',
  other: 'Other work sent out',
};

export const supplierCreateSchema = z.object({
  name: safeString('Name').trim().min(1, { message: 'Name is required.' }).max(160),
  kind: z.enum(SUPPLIER_KINDS),
  email: z.union([z.literal(''), z.email({ message: 'Enter a valid e-mail address.' })]).optional().default(''),
  phone: optionalText(40, 'Phone'),
  notes: optionalText(TEXT_MAX.notes, 'Notes'),
});
export type SupplierCreateInput = z.input<typeof supplierCreateSchema>;
export const supplierUpdateSchema = supplierCreateSchema.partial().extend({ version: z.number().int().min(0), active: z.boolean().optional() });
export type SupplierUpdateInput = z.input<typeof supplierUpdateSchema>;

export interface SupplierDto {
  id: string;
  name: string;
  kind: SupplierKind;
  email: string;
  phone: string;
  notes: string;
  active: boolean;
  version: number;
}

/**
 * A catalogue part. Its sell price is either fixed (`unitPrice`) or the cost plus a mark-up
 * (`markupPercent`, or the workshop's parts mark-up when both are empty) — the pricing engine
 * decides, never the client.
 */
export const partCreateSchema = z
  .object({
    partNumber: safeString('Part number').trim().min(1, { message: 'Part number is required.' }).max(60),
    description: safeString('Description').trim().min(1, { message: 'Description is required.' }).max(300),
    unitCost: decimalString(4, 'Unit cost'),
    unitPrice: decimalString(2, 'Sell price').nullable().optional().default(null),
    markupPercent: decimalString(2, 'Mark-up').nullable().optional().default(null),
    vatRate: z.enum(VAT_RATE_CODES).default('standard'),
    supplierId: idSchema.nullable().optional().default(null),
    leadTimeDays: z.number().int().min(0).max(365).default(0),
  })
  .refine((v) => v.unitPrice === null || v.markupPercent === null, {
    path: ['markupPercent'],
    message: 'Give a fixed sell price or a mark-up, not both.',
  });
export type PartCreateInput = z.input<typeof partCreateSchema>;
export const partUpdateSchema = z.object({
  version: z.number().int().min(0),
  partNumber: safeString('Part number').trim().min(1).max(60).optional(),
  description: safeString('Description').trim().min(1).max(300).optional(),
  unitCost: decimalString(4, 'Unit cost').optional(),
  unitPrice: decimalString(2, 'Sell price').nullable().optional(),
  markupPercent: decimalString(2, 'Mark-up').nullable().optional(),
  vatRate: z.enum(VAT_RATE_CODES).optional(),
  supplierId: idSchema.nullable().optional(),
  leadTimeDays: z.number().int().min(0).max(365).optional(),
  active: z.boolean().optional(),
});
export type PartUpdateInput = z.input<typeof partUpdateSchema>;

export interface PartDto {
  id: string;
  partNumber: string;
  description: string;
  unitCost: string;
  unitPrice: string | null;
  markupPercent: string | null;
  /** The sell price per unit excl. VAT, from the pricing engine with the workshop's mark-up. */
  sellPrice: string;
  vatRate: (typeof VAT_RATE_CODES)[number];
  supplierId: string | null;
  supplierName: string | null;
  leadTimeDays: number;
  active: boolean;
  version: number;
}

import { z } from 'zod';
import { emailSchema, optionalText, patchOf, safeString, TEXT_MAX } from './common.js';

export const CUSTOMER_KINDS = ['private', 'group'] as const;
export const CUSTOMER_KIND_LABELS = { private: 'Private owner', group: 'Flying group' } as const;

export const customerCreateSchema = z.object({
  name: safeString('Name').trim().min(1, { message: 'Name is required.' }).max(160),
  kind: z.enum(CUSTOMER_KINDS).default('private'),
  email: emailSchema,
  phone: z
    .string()
    .trim()
    .max(40)
    .regex(/^[0-9 +()-]*$/, { message: 'Use digits, spaces and + ( ) - only.' })
    .optional()
    .default(''),
  addressLines: optionalText(TEXT_MAX.address, 'Address'),
  postcode: optionalText(16, 'Postcode'),
  notes: optionalText(TEXT_MAX.notes, 'Notes'),
});
export type CustomerCreateInput = z.input<typeof customerCreateSchema>;
export type CustomerCreate = z.output<typeof customerCreateSchema>;

export const customerUpdateSchema = patchOf(customerCreateSchema).extend({ version: z.number().int().min(0) });
export type CustomerUpdateInput = z.input<typeof customerUpdateSchema>;

export interface CustomerDto {
  id: string;
  name: string;
  kind: (typeof CUSTOMER_KINDS)[number];
  email: string;
  phone: string;
  addressLines: string;
  postcode: string;
  notes: string;
  aircraftCount: number;
  /** Whether the owner has a sign-in (invited or active). */
  hasSignIn: boolean;
  version: number;
  createdAt: string;
}

import { z } from 'zod';
import { decimalString, idSchema, optionalText, patchOf, safeString, TEXT_MAX } from './common.js';

/** Registrations are stored upper-case; letters, digits and one or more hyphens. */
export const registrationSchema = z
  .string()
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9]{1,3}-?[A-Z0-9]{1,6}$/, { message: 'Use a registration like Q-BRKA.' });

export const aircraftCreateSchema = z.object({
  customerId: idSchema,
  registration: registrationSchema,
  type: safeString('Type').trim().min(1, { message: 'Type is required.' }).max(120),
  serial: optionalText(60, 'Serial'),
  airframeHours: decimalString(1, 'Airframe hours').default('0'),
  engine: optionalText(160, 'Engine'),
  engineHours: decimalString(1, 'Engine hours').default('0'),
  notes: optionalText(TEXT_MAX.notes, 'Notes'),
});
export type AircraftCreateInput = z.input<typeof aircraftCreateSchema>;
export type AircraftCreate = z.output<typeof aircraftCreateSchema>;

export const aircraftUpdateSchema = patchOf(aircraftCreateSchema).extend({ version: z.number().int().min(0) });
export type AircraftUpdateInput = z.input<typeof aircraftUpdateSchema>;

export interface AircraftDto {
  id: string;
  customerId: string;
  customerName: string;
  registration: string;
  type: string;
  serial: string;
  airframeHours: string;
  engine: string;
  engineHours: string;
  notes: string;
  openJobCount: number;
  version: number;
  createdAt: string;
}

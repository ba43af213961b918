import { z } from 'zod';
import { JOB_STATES, type JobState } from '../states.js';
import { idSchema, isoDate, listQuerySchema, optionalText, safeString, TEXT_MAX } from './common.js';

/** Kinds of visit. Templates with scope and checklist arrive with the estimates work. */
export const JOB_TYPES = [
  'annual_permit_inspection',
  'engine_service_100h',
  'engine_service_200h',
  'wing_strip_recover',
  'gearbox_inspection',
  'repair',
  'other',
] as const;
export type JobType = (typeof JOB_TYPES)[number];
export const JOB_TYPE_LABELS: Record<JobType, string> = {
  annual_permit_inspection: 'Annual permit inspection',
  engine_service_100h: '100-hour engine service',
  engine_service_200h: '200-hour engine service',
  wing_strip_recover: 'Wing strip inspection and re-cover',
  gearbox_inspection: 'Gearbox inspection',
  repair: 'Repair',
  other: 'Other work',
};

export const jobCreateSchema = z
  .object({
    aircraftId: idSchema,
    title: safeString('Title').trim().min(1, { message: 'Title is required.' }).max(160),
    type: z.enum(JOB_TYPES),
    bookedInOn: isoDate,
    dueOn: isoDate.optional().nullable().default(null),
    notes: optionalText(TEXT_MAX.jobNotes, 'Notes'),
    /** Book in from a job template: its scope becomes the inspection stage, its checklist the job's. */
    templateId: idSchema.nullable().optional().default(null),
  })
  .refine((v) => !v.dueOn || v.dueOn >= v.bookedInOn, { path: ['dueOn'], message: 'The due date cannot be before booking in.' });
export type JobCreateInput = z.input<typeof jobCreateSchema>;
export type JobCreate = z.output<typeof jobCreateSchema>;

export const jobUpdateSchema = z.object({
  version: z.number().int().min(0),
  title: safeString('Title').trim().min(1, { message: 'Title is required.' }).max(160).optional(),
  type: z.enum(JOB_TYPES).optional(),
  bookedInOn: isoDate.optional(),
  dueOn: isoDate.nullable().optional(),
  notes: safeString('Notes').trim().max(TEXT_MAX.jobNotes, { message: `Keep the notes to ${TEXT_MAX.jobNotes} characters or fewer.` }).optional(),
});
export type JobUpdateInput = z.input<typeof jobUpdateSchema>;

export const jobTransitionSchema = z
  .object({
    to: z.enum(JOB_STATES),
    version: z.number().int().min(0),
    reason: safeString('Reason').trim().max(TEXT_MAX.reason, { message: `Keep the reason to ${TEXT_MAX.reason} characters or fewer.` }).optional().default(''),
  })
  .refine((v) => v.to !== 'cancelled' || v.reason !== '', { path: ['reason'], message: 'Say why the job is cancelled.' });
export type JobTransitionInput = z.input<typeof jobTransitionSchema>;

export const jobListQuerySchema = listQuerySchema.extend({
  state: z.enum(JOB_STATES).optional(),
  aircraftId: idSchema.optional(),
});

/** A hazard note for a piece of the job's scope, copied from the template line it came with. */
export interface ScopeCaution {
  line: string;
  caution: string;
}

export interface JobDto {
  id: string;
  number: string;
  aircraftId: string;
  registration: string;
  aircraftType: string;
  customerId: string;
  customerName: string;
  title: string;
  type: JobType;
  state: JobState;
  bookedInOn: string;
  dueOn: string | null;
  notes: string;
  /** Cautions for the scheduled work (from the template's lines), shown to the engineer in the hangar. */
  scopeCautions: ScopeCaution[];
  version: number;
  createdAt: string;
  updatedAt: string;
  /** Owners' decisions nobody on the staff has marked seen yet (POST /api/jobs/:id/decisions-seen clears it); null when none. */
  decisionsToSee: JobDecisionsToSee | null;
}

export interface JobDecisionsToSee {
  /** Decided requests not yet seen. */
  requests: number;
  /** An airworthiness finding was declined in one of them: show the stronger mark. */
  declinedAirworthiness: boolean;
  /** The owner left a note on an item in one of them: show the stronger mark. */
  ownerNote: boolean;
  lastDecidedAt: string;
}

export interface AuditEventDto {
  id: string;
  at: string;
  actorName: string | null;
  actorRole: string | null;
  action: string;
  summary: string;
  detail: Record<string, unknown>;
}

import { z } from 'zod';
import { ROLES, STAFF_ROLES, type Role } from '../roles.js';
import { emailSchema, idSchema, listQuerySchema, safeString } from './common.js';

export interface UserDto {
  id: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  /** Set for owners: the owner contact this sign-in belongs to. */
  customerId: string | null;
  /** True until the invitation is accepted. */
  invited: boolean;
  createdAt: string;
}

export interface SessionDto {
  user: UserDto;
  /** `contact`: the workshop's phone and e-mail for owners (empty strings when not set). */
  workshop: { id: string; name: string; currency: string; contact: { phone: string; email: string } };
  /** Echo in the X-CSRF-Token header on every write. Also set as the readable cookie ws_csrf. */
  csrfToken: string;
}

/** Admin invites staff (any staff role); a manager invites owners (role owner + customerId). */
export const invitationCreateSchema = z.discriminatedUnion('role', [
  z.object({
    role: z.enum(STAFF_ROLES),
    email: emailSchema,
    name: safeString('Name').trim().min(1, { message: 'Name is required.' }).max(120),
  }),
  z.object({
    role: z.literal('owner'),
    email: emailSchema,
    name: safeString('Name').trim().min(1, { message: 'Name is required.' }).max(120),
    customerId: idSchema,
  }),
]);
export type InvitationCreateInput = z.infer<typeof invitationCreateSchema>;

/** Which sign-ins a list shows: the workshop's staff, owners, or both. */
export const USER_KINDS = ['staff', 'owners', 'all'] as const;
export type UserKind = (typeof USER_KINDS)[number];
export const userListQuerySchema = listQuerySchema.extend({
  kind: z.enum(USER_KINDS, { message: 'kind is staff, owners or all.' }).optional().default('all'),
});
export type UserListQuery = z.output<typeof userListQuerySchema>;

export const userUpdateSchema = z
  .object({
    role: z.enum(ROLES).optional(),
    active: z.boolean().optional(),
    name: safeString('Name').trim().min(1).max(120).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });
export type UserUpdateInput = z.infer<typeof userUpdateSchema>;

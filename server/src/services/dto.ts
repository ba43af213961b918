import type { Role, UserDto } from '@wingstage/shared';
import type { User } from '../models/index.js';

/** From a model instance or the session check's plain row alike. */
export function toUserDto(u: Pick<User, 'id' | 'email' | 'name' | 'role' | 'active' | 'customerId' | 'passwordHash' | 'createdAt'>): UserDto {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    customerId: u.customerId,
    invited: u.passwordHash === null,
    createdAt: u.createdAt.toISOString(),
  };
}

/** The signed-in user as the session check reads it: plain values, no ORM instance. */
export interface SessionUser {
  id: string;
  workshopId: string;
  email: string;
  name: string;
  role: Role;
  active: boolean;
  customerId: string | null;
  passwordHash: string | null;
  sessionEpoch: number;
  createdAt: Date;
}

/** What a session says about its workshop, including how owners reach it (SessionDto['workshop']). */
export interface SessionWorkshop {
  id: string;
  name: string;
  currency: string;
  contact: { phone: string; email: string };
}

import type { UserDto } from '@wingstage/shared';
import type { User } from '../models/index.js';

export function toUserDto(u: User): UserDto {
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

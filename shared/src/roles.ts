export const ROLES = ['admin', 'manager', 'engineer', 'accounts', 'owner'] as const;
export type Role = (typeof ROLES)[number];
export const STAFF_ROLES = ['admin', 'manager', 'engineer', 'accounts'] as const satisfies readonly Role[];
export type StaffRole = (typeof STAFF_ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  manager: 'Manager',
  engineer: 'Engineer',
  accounts: 'Accounts',
  owner: 'Owner',
};

export function isStaff(role: Role): role is StaffRole {
  return role !== 'owner';
}

import type { Role } from '@wingstage/shared';

/**
 * What each role is offered in the interface. The server enforces the same rules on every route;
 * this table only decides which links and buttons to show so nobody meets a button that fails.
 */
export const can = {
  seeJobs: (r: Role) => r !== 'owner',
  seeAircraft: (r: Role) => r === 'admin' || r === 'manager' || r === 'accounts',
  seeOwners: (r: Role) => r === 'admin' || r === 'manager' || r === 'accounts',
  editRecords: (r: Role) => r === 'admin' || r === 'manager',
  inviteOwner: (r: Role) => r === 'admin' || r === 'manager',
  moveJob: (r: Role) => r === 'admin' || r === 'manager' || r === 'engineer',
  manageStaff: (r: Role) => r === 'admin',
  manageSettings: (r: Role) => r === 'admin',
  seeHistory: (r: Role) => r !== 'owner',
};

export interface NavItem {
  to: string;
  label: string;
}

export function navFor(role: Role): NavItem[] {
  if (role === 'owner') return [{ to: '/my-aircraft', label: 'My aircraft' }];
  const items: NavItem[] = [{ to: '/jobs', label: 'Jobs' }];
  if (can.seeAircraft(role)) items.push({ to: '/aircraft', label: 'Aircraft' });
  if (can.seeOwners(role)) items.push({ to: '/owners', label: 'Owners' });
  if (can.manageStaff(role)) items.push({ to: '/staff', label: 'Staff' });
  if (can.manageSettings(role)) items.push({ to: '/settings', label: 'Settings' });
  return items;
}

export function homeFor(role: Role): string {
  return role === 'owner' ? '/my-aircraft' : '/jobs';
}

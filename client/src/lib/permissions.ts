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
  seeCatalogue: (r: Role) => r !== 'owner',
  editCatalogue: (r: Role) => r === 'admin' || r === 'manager',
  seeTemplates: (r: Role) => r !== 'owner',
  editTemplates: (r: Role) => r === 'admin' || r === 'manager',
  editEstimate: (r: Role) => r === 'admin' || r === 'manager',
  useHangar: (r: Role) => r === 'engineer' || r === 'manager' || r === 'admin',
  raiseFinding: (r: Role) => r === 'engineer' || r === 'manager' || r === 'admin',
};

export interface NavItem {
  to: string;
  label: string;
}

export function navFor(role: Role): NavItem[] {
  if (role === 'owner') return [{ to: '/my-aircraft', label: 'My aircraft' }];
  const items: NavItem[] = [];
  // The hangar comes first for engineers: it is where their day starts.
  if (role === 'engineer') items.push({ to: '/hangar', label: 'Hangar' });
  items.push({ to: '/jobs', label: 'Jobs' });
  if (can.seeAircraft(role)) items.push({ to: '/aircraft', label: 'Aircraft' });
  if (can.seeOwners(role)) items.push({ to: '/owners', label: 'Owners' });
  if (role === 'manager' || role === 'admin') items.push({ to: '/hangar', label: 'Hangar' });
  if (role !== 'engineer') items.push({ to: '/deposits', label: 'Deposits waiting' });
  if (role === 'accounts' || role === 'admin' || role === 'manager') items.push({ to: '/accounts/deposits', label: 'Accounts' });
  if (can.seeCatalogue(role)) items.push({ to: '/catalogue', label: 'Catalogue' });
  if (can.seeTemplates(role)) items.push({ to: '/templates', label: 'Templates' });
  if (can.manageStaff(role)) items.push({ to: '/staff', label: 'Staff' });
  if (can.manageSettings(role)) items.push({ to: '/settings', label: 'Settings' });
  return items;
}

/** Where each role starts: owners on their aircraft, engineers in the hangar, the office on the jobs. */
export function homeFor(role: Role): string {
  if (role === 'owner') return '/my-aircraft';
  if (role === 'engineer') return '/hangar';
  return '/jobs';
}

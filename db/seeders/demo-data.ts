/**
 * The invented demo scenario. Every name, place, registration and number here is fictional;
 * registrations use the Q- prefix, which no country uses for aircraft.
 */
import type { JobState, JobType, Role } from '../../shared/src/index.js';

export const DEMO_PASSWORD = 'wingstage-demo';

export const DEMO_WORKSHOP = {
  name: 'Brackenfold Light Aircraft Engineering',
  addressLines: 'Hangar 3, Marsh Lane Airstrip\nLittle Brackenfold\nWestshire',
  postcode: 'ZX4 7BL',
  vatNumber: 'GB999000173',
  currency: 'GBP',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  labourRates: [
    { code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' },
    { code: 'sailcloth', name: 'Sail and fabric work', ratePerHour: '70.00' },
  ],
  // 01632 960xxx is a range set aside for drama and examples; the .example domain is reserved too.
  settings: {
    vatRounding: 'invoice-nearest',
    partsMarkupPercent: '20',
    subcontractMarkupPercent: '10',
    approvalLinkDays: 14,
    chaseAfterHours: 48,
    contactPhone: '01632 960418',
    contactEmail: 'office@brackenfold.example',
    // Asked once approved work passes £500: half of it, before parts are ordered (demo policy).
    depositPolicy: { kind: 'approved_work_percent', percent: '50', threshold: '500.00' },
  },
};

export interface DemoStaff {
  key: string;
  role: Exclude<Role, 'owner'>;
  name: string;
  email: string;
}

export const DEMO_STAFF: DemoStaff[] = [
  { key: 'ruth', role: 'admin', name: 'Ruth Fennimore', email: 'admin@brackenfold.example' },
  { key: 'declan', role: 'manager', name: 'Declan Arbery', email: 'manager@brackenfold.example' },
  { key: 'priya', role: 'engineer', name: 'Priya Tollervey', email: 'priya@brackenfold.example' },
  { key: 'sam', role: 'engineer', name: 'Sam Quillon', email: 'sam@brackenfold.example' },
  { key: 'moira', role: 'accounts', name: 'Moira Kettleby', email: 'accounts@brackenfold.example' },
];

export interface DemoOwner {
  key: string;
  customer: { name: string; kind: 'private' | 'group'; email: string; phone: string; addressLines: string; postcode: string; notes: string };
  signIn: { name: string; email: string };
  aircraft: { registration: string; type: string; serial: string; airframeHours: string; engine: string; engineHours: string; notes: string };
}

export const DEMO_OWNERS: DemoOwner[] = [
  {
    key: 'gideon',
    customer: { name: 'Gideon Harrowgate', kind: 'private', email: 'gideon@owners.example', phone: '01632 960 114', addressLines: '2 Sedge Row\nLittle Brackenfold', postcode: 'ZX4 7DA', notes: 'Prefers a call before any work over the estimate.' },
    signIn: { name: 'Gideon Harrowgate', email: 'gideon@owners.example' },
    aircraft: { registration: 'Q-BRKA', type: 'Two-seat flex-wing trike', serial: 'FT-0412', airframeHours: '612.4', engine: '80 hp flat-four four-stroke', engineHours: '598.7', notes: 'Hangared at Marsh Lane, bay 2.' },
  },
  {
    key: 'elspeth',
    customer: { name: 'Elspeth Marlow', kind: 'private', email: 'elspeth@owners.example', phone: '01632 960 287', addressLines: 'Fennel Cottage, Weir Lane\nUpper Brackenfold', postcode: 'ZX4 9QE', notes: '' },
    signIn: { name: 'Elspeth Marlow', email: 'elspeth@owners.example' },
    aircraft: { registration: 'Q-BRKE', type: 'Three-axis high-wing microlight', serial: 'HW-1187', airframeHours: '1043.0', engine: '80 hp flat-four four-stroke', engineHours: '897.5', notes: '' },
  },
  {
    key: 'tomasz',
    customer: { name: 'Tomasz Wrenfield', kind: 'private', email: 'tomasz@owners.example', phone: '01632 960 530', addressLines: '14 Reedbed Close\nSaltmarsh End', postcode: 'ZX5 2LP', notes: 'Flies from his own farm strip; collects the aircraft by trailer.' },
    signIn: { name: 'Tomasz Wrenfield', email: 'tomasz@owners.example' },
    aircraft: { registration: 'Q-MRLW', type: 'Single-seat deregulated microlight', serial: 'SS-0078', airframeHours: '288.9', engine: '64 hp two-stroke twin', engineHours: '288.9', notes: 'Deregulated: no permit, but the owner asks for a yearly look-over.' },
  },
  {
    key: 'saltmarsh',
    customer: { name: 'Saltmarsh Flyers Group', kind: 'group', email: 'group@owners.example', phone: '01632 960 902', addressLines: 'c/o The Old Pumphouse\nSaltmarsh End', postcode: 'ZX5 2LT', notes: 'Six members; Hazel Brambury approves work for the group.' },
    signIn: { name: 'Hazel Brambury', email: 'group@owners.example' },
    aircraft: { registration: 'Q-SALT', type: 'Three-axis high-wing microlight', serial: 'HW-0954', airframeHours: '1530.2', engine: '80 hp flat-four four-stroke', engineHours: '412.6', notes: 'Engine replaced at 1117.6 airframe hours.' },
  },
];

export interface DemoJob {
  aircraft: string;
  title: string;
  type: JobType;
  /** Days before the seed date when the aircraft was booked in. */
  bookedDaysAgo: number;
  dueInDays: number | null;
  notes: string;
  /** The states it passed through after booking in, with who moved it and why. */
  path: { to: JobState; by: string; reason?: string }[];
}

export const DEMO_JOBS: DemoJob[] = [
  {
    aircraft: 'Q-MRLW', title: 'Gearbox inspection', type: 'gearbox_inspection', bookedDaysAgo: 70, dueInDays: null,
    notes: 'Owner reports a rattle at idle.',
    path: [
      { to: 'inspecting', by: 'sam' },
      { to: 'awaiting_owner', by: 'declan' },
      { to: 'in_work', by: 'declan', reason: 'Owner approved the drive-gear nut re-torque.' },
      { to: 'ready_for_release', by: 'declan' },
      { to: 'invoiced', by: 'declan' },
      { to: 'paid', by: 'declan' },
      { to: 'closed', by: 'declan' },
    ],
  },
  {
    aircraft: 'Q-BRKE', title: '200-hour engine service', type: 'engine_service_200h', bookedDaysAgo: 55, dueInDays: null, notes: '',
    path: [{ to: 'cancelled', by: 'declan', reason: 'Owner asked to move the service to the spring, after the winter lay-up.' }],
  },
  {
    aircraft: 'Q-MRLW', title: 'Exhaust spring replacement', type: 'repair', bookedDaysAgo: 30, dueInDays: null,
    notes: 'Two springs found stretched on the gearbox visit.',
    path: [
      { to: 'inspecting', by: 'sam' },
      { to: 'in_work', by: 'declan' },
      // Invoiced by the invoice seeder (demo-invoices.ts), with the deposit deducted.
      { to: 'ready_for_release', by: 'declan' },
    ],
  },
  {
    aircraft: 'Q-BRKE', title: 'Fuel hose and clip renewal', type: 'repair', bookedDaysAgo: 24, dueInDays: null, notes: 'Hoses at their age limit.',
    path: [
      { to: 'inspecting', by: 'priya' },
      { to: 'in_work', by: 'declan' },
      // Invoiced, credited and paid by the invoice seeder (demo-invoices.ts).
      { to: 'ready_for_release', by: 'declan' },
    ],
  },
  {
    aircraft: 'Q-SALT', title: 'Wing strip inspection and re-cover', type: 'wing_strip_recover', bookedDaysAgo: 16, dueInDays: 21,
    notes: 'Group wants the aircraft back before the spring fly-in.',
    path: [
      { to: 'inspecting', by: 'priya' },
      { to: 'awaiting_owner', by: 'declan' },
      { to: 'in_work', by: 'declan', reason: 'Group approved the re-cover.' },
    ],
  },
  {
    aircraft: 'Q-MRLW', title: 'Yearly look-over', type: 'other', bookedDaysAgo: 9, dueInDays: 2, notes: '',
    path: [
      { to: 'inspecting', by: 'sam' },
      { to: 'in_work', by: 'declan' },
      { to: 'ready_for_release', by: 'declan' },
    ],
  },
  {
    aircraft: 'Q-BRKE', title: '100-hour engine service', type: 'engine_service_100h', bookedDaysAgo: 6, dueInDays: 8,
    notes: 'Compression check and plugs due.',
    path: [
      { to: 'inspecting', by: 'priya' },
      { to: 'awaiting_owner', by: 'declan' },
    ],
  },
  {
    aircraft: 'Q-BRKA', title: 'Annual permit inspection', type: 'annual_permit_inspection', bookedDaysAgo: 3, dueInDays: 14,
    notes: 'Certificate of validity runs out at the end of next month.',
    path: [{ to: 'inspecting', by: 'priya' }],
  },
  {
    aircraft: 'Q-BRKA', title: 'Hang-point bolt replacement', type: 'repair', bookedDaysAgo: 0, dueInDays: 20, notes: 'To be done with the permit inspection.',
    path: [],
  },
];

/** The sign-ins table printed by `npm run demo:users` (README and the start script use it). */
export function demoSignIns(): { role: Role; name: string; email: string; password: string }[] {
  return [
    ...DEMO_STAFF.map((s) => ({ role: s.role as Role, name: s.name, email: s.email, password: DEMO_PASSWORD })),
    ...DEMO_OWNERS.map((o) => ({
      role: 'owner' as Role,
      name: o.customer.kind === 'group' ? `${o.signIn.name} (${o.customer.name})` : o.signIn.name,
      email: o.signIn.email,
      password: DEMO_PASSWORD,
    })),
  ];
}

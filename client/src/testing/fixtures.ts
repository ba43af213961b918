import type { FindingDto, JobDto } from '@wingstage/shared';

/** Test data the component tests share: invented records, overridden where a test cares. */
export const TEST_JOB_ID = '5b0c1d7e-8f3a-4b61-9d2e-0a1b2c3d4e5f';

export function aJob(overrides: Partial<JobDto> = {}): JobDto {
  return {
    id: TEST_JOB_ID,
    number: 'J-0042',
    aircraftId: 'a',
    registration: 'Q-TEST',
    aircraftType: 'Two-seat flex-wing trike',
    customerId: 'c',
    customerName: 'Orla Fenwright',
    title: 'Annual permit inspection',
    type: 'annual_permit_inspection',
    state: 'in_work',
    bookedInOn: '2026-11-30',
    dueOn: null,
    notes: '',
    scopeCautions: [],
    version: 3,
    createdAt: '2026-11-30T09:00:00Z',
    updatedAt: '2026-11-30T09:00:00Z',
    decisionsToSee: null,
    ...overrides,
  };
}

export function aFinding(overrides: Partial<FindingDto> = {}): FindingDto {
  return {
    id: '7c1e2a3b-4d5e-4f60-8a9b-0c1d2e3f4a5b',
    jobId: TEST_JOB_ID,
    number: 'F-2',
    title: 'Cracked exhaust spring',
    location: 'Exhaust, rear cylinder',
    category: 'airworthiness',
    seen: 'Spring cracked through at the hook.',
    checklistItemId: null,
    measuredValue: null,
    limit: null,
    state: 'priced',
    remedy: { description: 'Replace spring', hours: '0.5', labourRateCode: 'standard', parts: [], accessTask: null },
    raisedByName: 'Priya Tollervey',
    raisedAt: '2026-11-30T10:00:00Z',
    rectifiedAt: null,
    rectifiedByName: null,
    photos: [],
    version: 4,
    ...overrides,
  };
}

/** A JSON reply as the API sends it. */
export function jsonResponse(body: unknown, status = 200): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

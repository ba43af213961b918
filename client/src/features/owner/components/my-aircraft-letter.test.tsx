import type { AircraftDto, JobDto } from '@wingstage/shared';
import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { MyAircraftLetter } from './my-aircraft-letter';

const aircraft = (id: string, registration: string): AircraftDto => ({
  id,
  customerId: 'c1',
  customerName: 'Orla Fenwright',
  registration,
  type: 'Three-axis high-wing microlight',
  serial: '',
  airframeHours: '410.5',
  engine: '80 hp flat-four four-stroke',
  engineHours: '410.5',
  notes: '',
  openJobCount: 1,
  version: 0,
  createdAt: '2026-01-01T00:00:00Z',
});

const job = (id: string, aircraftId: string, title: string, state: JobDto['state']): JobDto => ({
  id,
  number: `J-${id}`,
  aircraftId,
  registration: '',
  aircraftType: '',
  customerId: 'c1',
  customerName: 'Orla Fenwright',
  title,
  type: 'other',
  state,
  bookedInOn: '2026-11-30',
  dueOn: null,
  notes: '',
  version: 0,
  createdAt: '',
  updatedAt: '',
});

describe('MyAircraftLetter', () => {
  it('groups each job under its own aircraft, with the state as words and a plain explanation', () => {
    render(
      <MyAircraftLetter
        firstName="Orla"
        workshopName="Brackenfold Light Aircraft Engineering"
        aircraft={[aircraft('a1', 'Q-ORLA'), aircraft('a2', 'Q-ORLB')]}
        jobs={[job('0001', 'a1', 'Wing re-cover', 'awaiting_owner'), job('0002', 'a2', 'Carburettor balance', 'closed')]}
      />,
    );
    expect(screen.getByText('Dear Orla,')).toBeTruthy();
    expect(screen.getByText(/One job is open/)).toBeTruthy();
    const first = within(screen.getByRole('list', { name: 'Jobs for Q-ORLA' }));
    expect(first.getByRole('heading', { name: 'Wing re-cover' })).toBeTruthy();
    expect(first.getByText('Awaiting owner')).toBeTruthy();
    expect(first.getByText(/Nothing extra is done without your say-so/)).toBeTruthy();
    expect(first.queryByText('Carburettor balance')).toBeNull();
    expect(within(screen.getByRole('list', { name: 'Jobs for Q-ORLB' })).getByText('Closed')).toBeTruthy();
  });

  it('says so plainly when there is no aircraft on record', () => {
    render(<MyAircraftLetter firstName="Orla" workshopName="Brackenfold Light Aircraft Engineering" aircraft={[]} jobs={[]} />);
    expect(screen.getByText(/has no aircraft on record for you yet/)).toBeTruthy();
  });
});

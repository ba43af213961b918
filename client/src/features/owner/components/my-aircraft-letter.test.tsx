import type { AircraftDto, ApprovalRequestDto, EstimateDto, FindingDto, JobDto, Totals } from '@wingstage/shared';
import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { MyAircraftLetter } from './my-aircraft-letter';
import { STAFF_ONLY_WORDS } from '../words';

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
  scopeCautions: [],
  version: 0,
  createdAt: '',
  updatedAt: '',
  decisionsToSee: null,
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
    expect(screen.getByText(/One job is in the hangar now\. Finished and cancelled jobs are listed too\./)).toBeTruthy();
    const first = within(screen.getByRole('list', { name: 'Jobs for Q-ORLA' }));
    expect(first.getByRole('heading', { name: 'Wing re-cover' })).toBeTruthy();
    expect(first.getByText('Waiting for your decision')).toBeTruthy();
    expect(first.getByText(/Nothing extra is done without your say-so/)).toBeTruthy();
    expect(first.queryByText('Carburettor balance')).toBeNull();
    expect(within(screen.getByRole('list', { name: 'Jobs for Q-ORLB' })).getByText('Closed')).toBeTruthy();
  });

  it('says so plainly when there is no aircraft on record', () => {
    render(<MyAircraftLetter firstName="Orla" workshopName="Brackenfold Light Aircraft Engineering" aircraft={[]} jobs={[]} />);
    expect(screen.getByText(/has no aircraft on record for you yet/)).toBeTruthy();
  });

  it('when a request waits for the owner, then the job says so with its state, total and link expiry, and the money so far is shown', () => {
    const t = (gross: string): Totals => ({ net: gross, vat: '0.00', gross, byRate: [] });
    const request: ApprovalRequestDto = {
      id: 'r1',
      jobId: '0001',
      state: 'sent',
      findingIds: ['f1', 'f2'],
      includesQuote: false,
      sentAt: '2026-12-01T10:00:00Z',
      expiresAt: '2026-12-08T10:00:00Z',
      decidedAt: null,
      decidedByName: null,
      revokedAt: null,
      replacedById: null,
      lastRemindedAt: null,
      snapshotHash: 'c'.repeat(64),
      gross: '113.57',
    };
    const decided: ApprovalRequestDto = { ...request, id: 'r0', state: 'decided', decidedAt: '2026-11-30T10:00:00Z' };
    const estimate = {
      currency: 'GBP',
      priced: { quoted: t('556.13'), committed: t('600.00'), undecided: { ...t('113.57'), findings: 2 } },
      quote: { state: 'agreed', awaitingGross: '0.00', agreedBy: 'Orla Fenwright', agreedAt: '2026-11-30T09:00:00Z', agreedHow: 'owner_link', openRequestId: null },
    } as unknown as EstimateDto;
    render(
      <MyAircraftLetter
        firstName="Orla"
        workshopName="Brackenfold Light Aircraft Engineering"
        aircraft={[aircraft('a1', 'Q-ORLA')]}
        jobs={[job('0001', 'a1', 'Wing re-cover', 'awaiting_owner')]}
        money={{ '0001': { estimate, requests: [request, decided] } }}
      />,
    );
    const waiting = screen.getByTestId('decision-waiting');
    expect(waiting.textContent).toContain('Your decision is needed');
    expect(waiting.textContent).toContain('Waiting for your decision');
    expect(waiting.textContent).not.toContain('Sent');
    expect(waiting.textContent).toContain('two findings to approve or decline, £113.57 incl. VAT if you approve them all');
    expect(waiting.textContent).toContain('works until 8 Dec 2026');
    expect(screen.getByText('£600.00 incl. VAT', { selector: '[data-owner-total="committed"]' })).toBeTruthy();
    expect(screen.getByText('£113.57 incl. VAT', { selector: '[data-owner-total="undecided"]' })).toBeTruthy();
    expect(screen.getByText('You agreed the quote', { selector: '[data-owner-quote]' })).toBeTruthy();
    expect(screen.queryByText(/not yet agreed/)).toBeNull();
  });

  it('when the quote waits for the owner, then the letter says so in the owner’s words, with what is not yet agreed and what is agreed so far', () => {
    const t = (gross: string): Totals => ({ net: gross, vat: '0.00', gross, byRate: [] });
    const request = {
      id: 'r1',
      jobId: '0001',
      state: 'sent',
      findingIds: [],
      includesQuote: true,
      sentAt: '2026-12-01T10:00:00Z',
      expiresAt: '2026-12-08T10:00:00Z',
      gross: '446.40',
    } as unknown as ApprovalRequestDto;
    const estimate = {
      currency: 'GBP',
      priced: { quoted: t('446.40'), committed: t('0.00'), undecided: { ...t('446.40'), findings: 0 } },
      quote: { state: 'sent', awaitingGross: '446.40', agreedBy: null, agreedAt: null, agreedHow: null, openRequestId: 'r1' },
    } as unknown as EstimateDto;
    render(
      <MyAircraftLetter
        firstName="Orla"
        workshopName="Brackenfold Light Aircraft Engineering"
        aircraft={[aircraft('a1', 'Q-ORLA')]}
        jobs={[job('0001', 'a1', 'Annual permit inspection', 'inspecting')]}
        money={{ '0001': { estimate, requests: [request] } }}
      />,
    );
    expect(screen.getByTestId('decision-waiting').textContent).toContain('we e-mailed you our quote to approve or decline, £446.40 incl. VAT if you approve it');
    expect(screen.getByText('Waiting for your decision', { selector: '[data-owner-quote]' })).toBeTruthy();
    expect(screen.getByText('£446.40 incl. VAT', { selector: '[data-owner-total="quote-awaiting"]' })).toBeTruthy();
    expect(screen.getByText('£0.00 incl. VAT', { selector: '[data-owner-total="committed"]' })).toBeTruthy();
  });

  it('when every request is decided, then no decision is asked for', () => {
    const decided = { id: 'r0', jobId: '0001', state: 'decided', findingIds: ['f1'], sentAt: '2026-12-01T10:00:00Z', expiresAt: '2026-12-08T10:00:00Z', gross: '10.00' } as ApprovalRequestDto;
    render(
      <MyAircraftLetter firstName="Orla" workshopName="Brackenfold Light Aircraft Engineering" aircraft={[aircraft('a1', 'Q-ORLA')]} jobs={[job('0001', 'a1', 'Wing re-cover', 'in_work')]} money={{ '0001': { requests: [decided] } }} />,
    );
    expect(screen.queryByTestId('decision-waiting')).toBeNull();
  });

  it('lists what was found on an open job with its photos, which open large; withdrawn findings are left out', () => {
    const f = (id: string, number: string, title: string, state: FindingDto['state'], photos: FindingDto['photos']) =>
      ({ id, jobId: '0001', number, title, category: 'recommended', state, photos }) as FindingDto;
    const photo = { id: 'ph-1', findingId: 'f1', width: 2048, height: 1536, thumbWidth: 480, thumbHeight: 360, bytes: 1, uploadedByName: 'Priya Tollervey', uploadedAt: '' };
    render(
      <MyAircraftLetter
        firstName="Orla"
        workshopName="Brackenfold Light Aircraft Engineering"
        aircraft={[aircraft('a1', 'Q-ORLA')]}
        jobs={[job('0001', 'a1', 'Wing re-cover', 'awaiting_owner')]}
        money={{ '0001': { findings: [f('f1', 'F-1', 'Worn sail stitching', 'sent', [photo]), f('f2', 'F-2', 'Raised in error', 'withdrawn', [])] } }}
      />,
    );
    const found = screen.getByRole('region', { name: 'What we found' });
    expect(found.textContent).toContain('F-1 · Worn sail stitching');
    expect(found.textContent).not.toContain('Raised in error');
    const thumb = within(found).getByRole('img', { name: 'Photo 1 of F-1: Worn sail stitching' });
    expect(thumb.getAttribute('src')).toBe('/api/photos/ph-1?size=thumb');
    fireEvent.click(within(found).getByRole('button', { name: 'Photo 1 of F-1: Worn sail stitching' }));
    expect(within(screen.getByRole('dialog')).getByRole('img').getAttribute('src')).toBe('/api/photos/ph-1?size=full');
  });

  it('when jobs are paid or cancelled, then they are not counted as in the hangar, and the ready-for-release words leave flying to the inspector', () => {
    render(
      <MyAircraftLetter
        firstName="Orla"
        workshopName="Brackenfold Light Aircraft Engineering"
        aircraft={[aircraft('a1', 'Q-ORLA')]}
        jobs={[job('0001', 'a1', 'Annual', 'ready_for_release'), job('0002', 'a1', 'Prop', 'paid'), job('0003', 'a1', 'Gearbox', 'cancelled')]}
      />,
    );
    expect(screen.getByText(/One job is in the hangar now/)).toBeTruthy();
    expect(screen.getByText('Work finished')).toBeTruthy();
    expect(screen.getByText(/whether the aircraft may fly is their decision/)).toBeTruthy();
    expect(document.body.textContent).not.toMatch(/ready for the paperwork and release/);
  });

  it("when the workshop has a phone and e-mail, then the letter gives them where it asks the owner to get in touch", () => {
    render(
      <MyAircraftLetter
        firstName="Orla"
        workshopName="Brackenfold Light Aircraft Engineering"
        contact={{ phone: '01632 960418', email: 'office@brackenfold.example' }}
        aircraft={[]}
        jobs={[]}
      />,
    );
    const contact = screen.getByTestId('workshop-contact');
    expect(within(contact).getByRole('link', { name: '01632 960418' }).getAttribute('href')).toBe('tel:01632960418');
    expect(within(contact).getByRole('link', { name: 'office@brackenfold.example' }).getAttribute('href')).toBe('mailto:office@brackenfold.example');
  });

  it("shows none of the staff-only words, whatever state the jobs, findings and requests are in", () => {
    const states: JobDto['state'][] = ['booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release', 'invoiced', 'paid', 'closed', 'cancelled'];
    const findingStates: FindingDto['state'][] = ['draft', 'priced', 'sent', 'approved', 'approved_within_limit', 'declined', 'withdrawn'];
    const requestStates: ApprovalRequestDto['state'][] = ['sent', 'decided', 'expired', 'revoked', 'replaced'];
    const t = (gross: string): Totals => ({ net: gross, vat: '0.00', gross, byRate: [] });
    const estimate = {
      currency: 'GBP',
      priced: { quoted: t('556.13'), committed: t('600.00'), undecided: { ...t('113.57'), findings: 2 } },
      // The letter reads the quote's state since the quote became an approval item.
      quote: { state: 'sent', awaitingGross: '446.40', agreedBy: null, agreedAt: null, agreedHow: null, openRequestId: 'r1' },
    } as unknown as EstimateDto;
    const jobs = states.map((s, i) => job(`j${i}`, 'a1', `Job ${i}`, s));
    const money = Object.fromEntries(
      jobs.map((j, i) => [
        j.id,
        {
          estimate,
          findings: findingStates.map((fs, k) => ({ id: `f${i}-${k}`, jobId: j.id, number: `F-${k + 1}`, title: `Finding ${k}`, category: 'advisory', state: fs, photos: [] }) as unknown as FindingDto),
          requests: [{ id: `r${i}`, jobId: j.id, state: requestStates[i % requestStates.length]!, findingIds: ['x'], sentAt: '2026-12-01T10:00:00Z', expiresAt: '2026-12-08T10:00:00Z', gross: '10.00' } as ApprovalRequestDto],
        },
      ]),
    );
    render(<MyAircraftLetter firstName="Orla" workshopName="Brackenfold Light Aircraft Engineering" aircraft={[aircraft('a1', 'Q-ORLA')]} jobs={jobs} money={money} />);
    const text = document.body.textContent ?? '';
    for (const word of STAFF_ONLY_WORDS) expect(text, word).not.toContain(word);
    expect(text).toContain('Approved under your standing go-ahead');
  });
});

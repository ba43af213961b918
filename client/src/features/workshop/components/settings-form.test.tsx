import type { WorkshopDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { SettingsForm } from './settings-form';

const workshop: WorkshopDto = {
  id: 'w',
  name: 'Brackenfold Light Aircraft Engineering',
  addressLines: 'Hangar 3, Marsh Lane Airstrip',
  postcode: 'QX1 2AB',
  vatNumber: 'GB999000173',
  currency: 'GBP',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  labourRates: [{ code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' }],
  settings: { vatRounding: 'invoice-nearest', partsMarkupPercent: '20', subcontractMarkupPercent: '10', approvalLinkDays: 14, chaseAfterHours: 48, contactPhone: '', contactEmail: '', depositPolicy: { kind: 'none' }, paymentTermsDays: 30 },
  version: 4,
};
const json = (body: unknown, status = 200) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

describe('SettingsForm: owner approvals', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it("when the link's life and the reminder interval are changed, then both are sent as whole numbers with the contact details", async () => {
    fetchMock.mockResolvedValue(json({ ...workshop, version: 5, settings: { ...workshop.settings, approvalLinkDays: 7, chaseAfterHours: 24 } }));
    renderWithApp(<SettingsForm workshop={workshop} />);
    fireEvent.change(screen.getByLabelText(/^Days an approval link works/), { target: { value: '7' } });
    fireEvent.change(screen.getByLabelText(/^Hours before a reminder/), { target: { value: '24' } });
    fireEvent.change(screen.getByLabelText(/^Phone for owners/), { target: { value: '01632 960418' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const body = JSON.parse(String(fetchMock.mock.calls[0]![1]?.body));
    expect(body.settings).toMatchObject({ approvalLinkDays: 7, chaseAfterHours: 24, contactPhone: '01632 960418' });
    expect(await screen.findByText('Settings saved')).toBeTruthy();
  });

  it('when the values are outside their bounds or not whole, then each field says why in words and nothing is sent', async () => {
    renderWithApp(<SettingsForm workshop={workshop} />);
    fireEvent.change(screen.getByLabelText(/^Days an approval link works/), { target: { value: '90' } });
    fireEvent.change(screen.getByLabelText(/^Hours before a reminder/), { target: { value: '1.5' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    expect((await screen.findAllByText('A link can last at most 60 days; send a new one after that.')).length).toBeGreaterThan(0);
    expect(screen.getAllByText('Give whole hours.').length).toBeGreaterThan(0);
    fireEvent.change(screen.getByLabelText(/^Days an approval link works/), { target: { value: '' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    expect((await screen.findAllByText('Enter the number of days, e.g. 14.')).length).toBeGreaterThan(0);
    expect(fetchMock).not.toHaveBeenCalled();
  });
});

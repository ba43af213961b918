import type { WorkshopDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { SettingsForm } from './settings-form';

const workshop: WorkshopDto = {
  id: '7c7c7c7c-0000-4000-8000-000000000001',
  name: 'Test Workshop',
  addressLines: 'Hangar 1',
  postcode: 'ZX1 1AA',
  vatNumber: 'GB123456789',
  currency: 'GBP',
  vatRates: { standard: '20', reduced: '5', zero: '0' },
  labourRates: [{ code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' }],
  settings: { vatRounding: 'invoice-nearest', partsMarkupPercent: '20', subcontractMarkupPercent: '10', approvalLinkDays: 14, chaseAfterHours: 48, contactPhone: '', contactEmail: '', depositPolicy: { kind: 'none' }, paymentTermsDays: 30 },
  version: 3,
};

const json = (body: unknown, status = 200) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

describe('SettingsForm deposits', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    document.cookie = 'ws_csrf=tok-1';
    fetchMock.mockImplementation(async (_url, init) => {
      const body = JSON.parse(String(init?.body)) as { settings: object };
      return json({ ...workshop, version: 4, settings: { ...workshop.settings, ...body.settings } });
    });
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when a share of approved work over a threshold is chosen, then both figures are asked for and saved with the policy', async () => {
    renderWithApp(<SettingsForm workshop={workshop} />);
    expect(screen.queryByLabelText(/Deposit percentage/)).toBeNull();
    fireEvent.change(screen.getByLabelText('When a deposit is asked for'), { target: { value: 'approved_work_percent' } });
    fireEvent.change(screen.getByLabelText(/Deposit percentage/), { target: { value: '50' } });
    fireEvent.change(screen.getByLabelText(/Threshold/), { target: { value: '500.00' } });
    expect(screen.getByText('Asked when approved work is over £500.00 incl. VAT')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    await waitFor(() => expect(screen.getByText('Settings saved')).toBeTruthy());
    const sent = JSON.parse(String(fetchMock.mock.calls[0]![1]!.body)) as { settings: { depositPolicy: unknown } };
    expect(sent.settings.depositPolicy).toEqual({ kind: 'approved_work_percent', percent: '50', threshold: '500.00' });
  });

  it('when the percentage is over 100, then the form says so beside the field and sends nothing', async () => {
    renderWithApp(<SettingsForm workshop={workshop} />);
    fireEvent.change(screen.getByLabelText('When a deposit is asked for'), { target: { value: 'quote_percent' } });
    expect(screen.queryByLabelText(/Threshold/)).toBeNull();
    fireEvent.change(screen.getByLabelText(/Deposit percentage/), { target: { value: '150' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save settings' }));
    await waitFor(() => expect(screen.getAllByText('The percentage must be more than 0 and at most 100.').length).toBeGreaterThan(0));
    expect(fetchMock).not.toHaveBeenCalled();
  });
});

import type { AgedDebtDto } from '@wingstage/shared';
import { fireEvent, screen, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { jsonResponse } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { AgedDebtPage } from './aged-debt-page';

const totals = { d0_30: '120.00', d31_60: '240.00', d61_90: '0.00', over90: '600.00', total: '960.00' };
const owner = (n: number): AgedDebtDto['rows'][number] => ({
  customerId: `c${n}`,
  ownerName: `Owner ${n} Farrowby`,
  email: null,
  invoices: [{ id: `i${n}`, number: `INV-000${n}`, dueOn: '2026-10-01', owed: '10.00', daysOverdue: 62 }],
  buckets: { d0_30: '0.00', d31_60: '0.00', d61_90: '10.00', over90: '0.00' },
  total: '10.00',
});
const page = (p: number, rows: AgedDebtDto['rows']): AgedDebtDto => ({ asOf: '2026-12-02', currency: 'GBP', rows, page: p, pageSize: 50, ownerCount: 51, totals });

describe('aged debt page', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when more owners owe than fit a page, then it asks the server page by page and the foot shows the totals of every owner on each page', async () => {
    fetchMock.mockImplementation(async (input) => {
      const url = new URL(String(input), 'http://x');
      return jsonResponse(url.searchParams.get('page') === '2' ? page(2, [owner(51)]) : page(1, [owner(1), owner(2), owner(3)]));
    });
    renderWithApp(<AgedDebtPage />);
    const foot = async () => within((await screen.findByRole('table')).querySelector('tfoot')!);
    expect((await foot()).getByText('All 51 owners (every page)')).toBeTruthy();
    expect((await foot()).getByText('£960.00')).toBeTruthy();
    expect(screen.getByText('Page 1 of 2 (51 in all)')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Next' }));
    expect(await screen.findByText('Owner 51 Farrowby')).toBeTruthy();
    expect(screen.getByText('Page 2 of 2 (51 in all)')).toBeTruthy();
    expect((await foot()).getByText('£960.00')).toBeTruthy();
    const asked = fetchMock.mock.calls.map(([u]) => new URL(String(u), 'http://x').searchParams);
    expect(asked.map((q) => [q.get('page'), q.get('pageSize')])).toEqual([['1', '50'], ['2', '50']]);
  });

  it('when every owner fits one page, then there is no pager and the foot reads all owners', async () => {
    fetchMock.mockResolvedValue(jsonResponse({ ...page(1, [owner(1)]), ownerCount: 1 }));
    renderWithApp(<AgedDebtPage />);
    const foot = within((await screen.findByRole('table')).querySelector('tfoot')!);
    expect(foot.getByText('All owners')).toBeTruthy();
    expect(screen.queryByRole('navigation', { name: 'Aged debt: pages' })).toBeNull();
  });
});

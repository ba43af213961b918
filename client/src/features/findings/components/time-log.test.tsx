import type { TimeLogDto } from '@wingstage/shared';
import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { TimeLog } from './time-log';

const ME = '3c4d5e6f-7a8b-4c9d-8e0f-1a2b3c4d5e6f';
const entry = (over: Partial<TimeLogDto> = {}): TimeLogDto => ({
  id: '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d',
  userName: 'Priya Tollervey',
  hours: '2.50',
  workedOn: '2026-12-01',
  note: 'Plugs',
  findingId: null,
  createdAt: '2026-12-01T10:00:00Z',
  userId: ME,
  version: 0,
  ...over,
});
const json = (body: unknown, status = 200) => new Response(body === undefined ? null : JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });

describe('TimeLog', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when 30 hours are typed for one day, then the form says a day has 24 hours and sends nothing', async () => {
    renderWithApp(<TimeLog jobId="j" entries={[]} canLog userId={ME} />);
    fireEvent.change(screen.getByLabelText(/^Hours/), { target: { value: '30' } });
    fireEvent.click(screen.getByRole('button', { name: 'Log time' }));
    expect((await screen.findAllByText('A day has 24 hours: log at most 24 hours for one day.')).length).toBeGreaterThan(0);
    expect(fetchMock).not.toHaveBeenCalled();
  });

  it('when negative hours are typed, then the message says they cannot be negative', async () => {
    renderWithApp(<TimeLog jobId="j" entries={[]} canLog userId={ME} />);
    fireEvent.change(screen.getByLabelText(/^Hours/), { target: { value: '-2' } });
    fireEvent.click(screen.getByRole('button', { name: 'Log time' }));
    expect((await screen.findAllByText('Hours cannot be negative.')).length).toBeGreaterThan(0);
  });

  it('when one of my entries is corrected, then the new hours go with its version', async () => {
    fetchMock.mockResolvedValue(json(entry({ hours: '1.50', version: 1 })));
    renderWithApp(<TimeLog jobId="j" entries={[entry()]} canLog userId={ME} />);
    fireEvent.click(screen.getByRole('button', { name: /^Change 2\.50 h/ }));
    const form = screen.getByRole('form', { name: /^Change:/ });
    fireEvent.change(within(form).getByLabelText(/^Hours/), { target: { value: '1.5' } });
    fireEvent.click(within(form).getByRole('button', { name: 'Save change' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe(`/api/jobs/j/time/${entry().id}`);
    expect(init?.method).toBe('PATCH');
    expect(JSON.parse(String(init?.body))).toMatchObject({ version: 0, hours: '1.5', workedOn: '2026-12-01', note: 'Plugs' });
    expect(await screen.findByText(/Time entry changed/)).toBeTruthy();
  });

  it('when an entry is removed, then it asks first, and only a confirmed removal is sent', async () => {
    fetchMock.mockResolvedValue(new Response(null, { status: 204 }));
    renderWithApp(<TimeLog jobId="j" entries={[entry()]} canLog userId={ME} />);
    fireEvent.click(screen.getByRole('button', { name: /^Remove 2\.50 h/ }));
    expect(screen.getByText(/The removal is kept in the job's history/)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Keep it' }));
    expect(fetchMock).not.toHaveBeenCalled();
    fireEvent.click(screen.getByRole('button', { name: /^Remove 2\.50 h/ }));
    fireEvent.click(screen.getByRole('button', { name: 'Yes, remove it' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [, init] = fetchMock.mock.calls[0]!;
    expect(init?.method).toBe('DELETE');
    expect(JSON.parse(String(init?.body))).toEqual({ version: 0 });
  });

  it("offers no change on someone else's entry to an engineer, but does to a manager", () => {
    const theirs = entry({ userId: '00000000-0000-4000-8000-000000000000' });
    const { unmount } = renderWithApp(<TimeLog jobId="j" entries={[theirs]} canLog userId={ME} />);
    expect(screen.queryByRole('button', { name: /^Change/ })).toBeNull();
    unmount();
    renderWithApp(<TimeLog jobId="j" entries={[theirs]} canLog canChangeAll userId={ME} />);
    expect(screen.getByRole('button', { name: /^Change 2\.50 h/ })).toBeTruthy();
  });
});

describe('the day a form offers, on a device set to another time zone', () => {
  const deviceZone = process.env.TZ;
  afterEach(() => {
    vi.useRealTimers();
    if (deviceZone === undefined) delete process.env.TZ;
    else process.env.TZ = deviceZone;
  });

  it.each([
    // 19:30 on 1 December in Los Angeles is already 03:30 on 2 December at the workshop.
    { zone: 'America/Los_Angeles', at: '2026-12-02T03:30:00Z', deviceDay: 1 },
    // 09:00 on 3 December in Auckland is still 20:00 on 2 December at the workshop.
    { zone: 'Pacific/Auckland', at: '2026-12-02T20:00:00Z', deviceDay: 3 },
  ])('when the device in $zone reads day $deviceDay, then the day worked defaults to the workshop’s 2 December', ({ zone, at, deviceDay }) => {
    process.env.TZ = zone;
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(new Date(at));
    // The device's own day differs: the old default would have offered it.
    expect(new Date().getDate()).toBe(deviceDay);
    renderWithApp(<TimeLog jobId="j" entries={[]} canLog userId={ME} />);
    expect((screen.getByLabelText(/^Date/) as HTMLInputElement).value).toBe('2026-12-02');
  });
});

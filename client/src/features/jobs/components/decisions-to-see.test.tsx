import { fireEvent, render, screen, waitFor, within } from '@testing-library/react';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { DecisionsFlag, type DecisionsToSee } from '@/components/ui/decisions-flag';
import { TEST_JOB_ID } from '@/testing/fixtures';
import { renderWithApp } from '@/testing/render';
import { DecisionsToSeePanel } from './decisions-to-see';

const plain: DecisionsToSee = { requests: 1, declinedAirworthiness: false, ownerNote: false, lastDecidedAt: '2026-12-02T10:14:00Z' };

describe('DecisionsFlag', () => {
  it('when nothing waits to be seen, then no flag shows', () => {
    const { container } = render(<DecisionsFlag toSee={null} />);
    expect(container.textContent).toBe('');
  });

  it('when a plain decision waits, then the flag says so in words with an icon and no stronger reason', () => {
    render(<DecisionsFlag toSee={plain} />);
    const flag = screen.getByTestId('decisions-flag');
    expect(flag.textContent).toBe('New decision from the owner');
    expect(flag.getAttribute('data-strength')).toBe('plain');
    expect(flag.querySelector('svg')).not.toBeNull();
  });

  it('when an airworthiness item was declined and the owner left a note, then the stronger mark names both reasons in words', () => {
    render(<DecisionsFlag toSee={{ ...plain, requests: 2, declinedAirworthiness: true, ownerNote: true }} />);
    const flag = screen.getByTestId('decisions-flag');
    expect(flag.getAttribute('data-strength')).toBe('strong');
    expect(flag.textContent).toContain('2 new decisions from the owner');
    expect(flag.textContent).toContain('Airworthiness item declined · The owner left a note');
  });

  it('when only a note was left, then the mark is still the stronger one and says why', () => {
    render(<DecisionsFlag toSee={{ ...plain, ownerNote: true }} />);
    expect(screen.getByTestId('decisions-flag').getAttribute('data-strength')).toBe('strong');
    expect(screen.getByText('The owner left a note')).toBeTruthy();
  });
});

describe('DecisionsToSeePanel', () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
  });

  it('when a declined airworthiness item waits, then the panel says the item stays open and the inspector decides', () => {
    renderWithApp(<DecisionsToSeePanel jobId={TEST_JOB_ID} ownerName="Orla Fenwright" toSee={{ ...plain, declinedAirworthiness: true }} />);
    const panel = screen.getByTestId('decisions-to-see');
    expect(panel.textContent).toContain('Orla Fenwright decided a request');
    expect(panel.textContent).toContain('will not mark this job ready for release');
    expect(panel.textContent).toContain('the inspector decides');
  });

  it('when "Mark as seen" is pressed, then the job’s decisions-seen route is called', async () => {
    fetchMock.mockResolvedValue(new Response(null, { status: 204 }));
    renderWithApp(<DecisionsToSeePanel jobId={TEST_JOB_ID} ownerName="Orla Fenwright" toSee={plain} />);
    fireEvent.click(within(screen.getByTestId('decisions-to-see')).getByRole('button', { name: 'Mark as seen' }));
    await waitFor(() => expect(fetchMock).toHaveBeenCalled());
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe(`/api/jobs/${TEST_JOB_ID}/decisions-seen`);
    expect(init?.method).toBe('POST');
  });

  it('when marking fails, then the reason is shown and the flag stays', async () => {
    fetchMock.mockResolvedValue(
      new Response(JSON.stringify({ error: { code: 'forbidden', message: 'You cannot do that here.' } }), { status: 403, headers: { 'Content-Type': 'application/json' } }),
    );
    renderWithApp(<DecisionsToSeePanel jobId={TEST_JOB_ID} ownerName="Orla Fenwright" toSee={plain} />);
    fireEvent.click(screen.getByRole('button', { name: 'Mark as seen' }));
    expect(await screen.findByText('You cannot do that here.')).toBeTruthy();
    expect(screen.getByTestId('decisions-flag')).toBeTruthy();
  });
});

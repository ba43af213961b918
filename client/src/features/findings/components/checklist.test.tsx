import type { JobChecklistItemDto } from '@wingstage/shared';
import { fireEvent, screen, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { Checklist } from './checklist';

const item: JobChecklistItemDto = {
  id: '7c1e0f2a-5b3d-4e6f-8a9b-0c1d2e3f4a5b',
  section: 'Engine',
  text: 'Spark plug electrode gap, each plug',
  limit: { min: '0.6', max: '0.9', unit: 'mm', source: 'Example only' },
  caution: '',
  result: 'measured',
  measuredValue: '0.9700',
  limitCheck: 'above',
  note: '',
  recordedByName: 'Priya Tollervey',
  recordedAt: '2026-12-01T10:00:00Z',
  findingId: null,
  version: 2,
};

describe('Checklist', () => {
  it('says a measurement is outside the example limit and proposes a finding with the item, value and limit', () => {
    const onRaise = vi.fn();
    renderWithApp(<Checklist jobId="j" items={[item]} canRecord onRaise={onRaise} />);
    expect(screen.getByText(/Outside the example limit \(0\.6–0\.9 mm\)/)).toBeTruthy();
    expect(screen.getByText('Measured 0.97 mm')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Raise finding' }));
    expect(onRaise).toHaveBeenCalledWith(
      expect.objectContaining({ checklistItemId: item.id, measuredValue: '0.97', limit: item.limit, location: 'Engine', seen: expect.stringContaining('Measured 0.97 mm (example limit 0.6–0.9 mm)') }),
    );
  });

  it('offers no finding for a value within the limit, or once one has been raised', () => {
    const { unmount } = renderWithApp(<Checklist jobId="j" items={[{ ...item, measuredValue: '0.65', limitCheck: 'within' }]} canRecord onRaise={vi.fn()} />);
    expect(screen.queryByText(/Outside the example limit/)).toBeNull();
    unmount();
    renderWithApp(<Checklist jobId="j" items={[{ ...item, findingId: '1b2c3d4e-5f6a-4b7c-8d9e-0f1a2b3c4d5e' }]} canRecord onRaise={vi.fn()} />);
    expect(screen.queryByRole('button', { name: 'Raise finding' })).toBeNull();
    expect(screen.getByText('A finding has been raised for this item.')).toBeTruthy();
  });

  it('when an item carries a caution, then it is shown beside the item with the word "Caution", apart from errors', () => {
    const caution = 'Treat the propeller as live: ignition off, plug leads removed, clear the arc.';
    renderWithApp(<Checklist jobId="j" items={[{ ...item, caution }]} canRecord onRaise={vi.fn()} />);
    const note = document.querySelector('[data-caution]');
    expect(note?.textContent).toBe(`Caution: ${caution}`);
    expect(note?.getAttribute('role')).toBeNull();
  });

  it('when an item has no measured limit, then "Record value" is not offered; an item with a limit offers it', () => {
    const logbook = { ...item, id: '2b0c1d7e-8f3a-4b61-9d2e-0a1b2c3d4e5f', text: 'Logbooks up to date', section: 'Records', limit: null, result: null, measuredValue: null, limitCheck: null };
    renderWithApp(<Checklist jobId="j" items={[logbook, { ...item, result: null, measuredValue: null, limitCheck: null }]} canRecord onRaise={vi.fn()} />);
    const records = screen.getByRole('group', { name: 'Record Logbooks up to date' });
    expect(within(records).queryByRole('button', { name: /Record value/ })).toBeNull();
    expect(within(records).getAllByRole('button').map((b) => b.textContent)).toEqual(['Pass', 'Fail', 'N/A']);
    expect(within(screen.getByRole('group', { name: `Record ${item.text}` })).getByRole('button', { name: /Record value/ })).toBeTruthy();
  });
});

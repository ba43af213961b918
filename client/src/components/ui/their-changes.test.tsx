import { fireEvent, render, screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { changedFields, TheirChangesNotice } from './their-changes';

interface Owner {
  name: string;
  phone: string;
  notes: string;
  postcode: string | null;
  version: number;
}
const started: Owner = { name: 'Orla Fenwright', phone: '01632 960111', notes: '', postcode: 'ZZ1 4QX', version: 2 };

describe('changedFields', () => {
  it('lists only labelled fields that differ, with empty values in words and the version ignored', () => {
    const theirs: Owner = { ...started, phone: '01632 960999', postcode: null, version: 3 };
    expect(changedFields(started, theirs, { name: 'Name', phone: 'Phone', notes: 'Notes', postcode: 'Postcode' })).toEqual([
      { field: 'phone', label: 'Phone', value: '01632 960999' },
      { field: 'postcode', label: 'Postcode', value: '(empty)' },
    ]);
  });

  it('reads values through the given words', () => {
    const theirs: Owner = { ...started, notes: 'group' };
    expect(changedFields(started, theirs, { notes: 'Notes' }, (_f, v) => `«${String(v)}»`)).toEqual([{ field: 'notes', label: 'Notes', value: '«group»' }]);
  });
});

describe('TheirChangesNotice', () => {
  it('says nothing was saved, lists their changes and offers to take their version', () => {
    const take = vi.fn();
    render(<TheirChangesNotice what="owner" changes={[{ field: 'phone', label: 'Phone', value: '01632 960999' }]} onTakeTheirs={take} />);
    expect(screen.getByRole('alert').textContent).toContain('Someone else changed this owner while you were editing');
    expect(screen.getByText(/have not been saved/)).toBeTruthy();
    expect(screen.getByTestId('their-changes').textContent).toBe('Phone: 01632 960999');
    fireEvent.click(screen.getByRole('button', { name: 'Take their version' }));
    expect(take).toHaveBeenCalledOnce();
  });
});

import { fireEvent, render, screen } from '@testing-library/react';
import { useState } from 'react';
import { Link, RouterProvider, createMemoryRouter } from 'react-router-dom';
import { describe, expect, it } from 'vitest';
import { TextAreaField } from './field';
import { UnsavedChangesGuard } from './unsaved-changes';

function Editor() {
  const [dirty, setDirty] = useState(false);
  return (
    <>
      <button onClick={() => setDirty(true)}>Edit</button>
      <Link to="/elsewhere">Away</Link>
      <UnsavedChangesGuard when={dirty} what="the estimate" />
    </>
  );
}

function renderAt() {
  const router = createMemoryRouter(
    [
      { path: '/', element: <Editor /> },
      { path: '/elsewhere', element: <p>Elsewhere</p> },
    ],
    { initialEntries: ['/'] },
  );
  render(<RouterProvider router={router} />);
  return router;
}

describe('UnsavedChangesGuard', () => {
  it('when nothing is changed, then leaving goes ahead without a question', async () => {
    renderAt();
    fireEvent.click(screen.getByRole('link', { name: 'Away' }));
    expect(await screen.findByText('Elsewhere')).toBeTruthy();
  });

  it('when there are unsaved changes, then leaving asks first; staying keeps the page and leaving goes', async () => {
    const router = renderAt();
    fireEvent.click(screen.getByRole('button', { name: 'Edit' }));
    fireEvent.click(screen.getByRole('link', { name: 'Away' }));
    const dialog = await screen.findByRole('alertdialog', { name: 'Leave without saving?' });
    expect(dialog.textContent).toContain('You have changed the estimate and not saved it.');
    fireEvent.click(screen.getByRole('button', { name: 'Stay on this page' }));
    expect(router.state.location.pathname).toBe('/');
    expect(screen.queryByRole('alertdialog')).toBeNull();
    fireEvent.click(screen.getByRole('link', { name: 'Away' }));
    fireEvent.click(await screen.findByRole('button', { name: 'Leave without saving' }));
    expect(await screen.findByText('Elsewhere')).toBeTruthy();
  });

  it('when there are unsaved changes, then a reload or closing the tab asks the browser to confirm', () => {
    renderAt();
    fireEvent.click(screen.getByRole('button', { name: 'Edit' }));
    const event = new Event('beforeunload', { cancelable: true });
    window.dispatchEvent(event);
    expect(event.defaultPrevented).toBe(true);
  });
});

describe('TextAreaField counter', () => {
  it('counts what is typed against the limit, and says by how much it is over', () => {
    render(<TextAreaField label="Notes" maxChars={10} />);
    const box = screen.getByLabelText('Notes');
    expect(screen.getByText('0 of 10 characters')).toBeTruthy();
    fireEvent.input(box, { target: { value: 'Fuel hose' } });
    expect(screen.getByText('9 of 10 characters')).toBeTruthy();
    fireEvent.input(box, { target: { value: 'Fuel hoses, both' } });
    expect(screen.getByText('6 characters over the 10 that fit')).toBeTruthy();
    expect(box.getAttribute('aria-describedby')).toContain('-count');
  });
});

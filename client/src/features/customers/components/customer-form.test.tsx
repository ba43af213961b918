import { fireEvent, screen, waitFor } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { renderWithApp } from '@/testing/render';
import { CustomerForm } from './customer-form';

describe('CustomerForm', () => {
  it('shows the shared schema messages next to the fields and in the summary, and does not submit', async () => {
    const onSubmit = vi.fn();
    renderWithApp(<CustomerForm submitLabel="Add owner" cancelTo="/owners" onSubmit={onSubmit} />);
    fireEvent.input(screen.getByLabelText(/^E-mail/), { target: { value: 'not-an-address' } });
    fireEvent.input(screen.getByLabelText(/^Phone/), { target: { value: 'call me' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add owner' }));

    const name = await screen.findByLabelText(/^Name/);
    await waitFor(() => expect(name.getAttribute('aria-invalid')).toBe('true'));
    expect(screen.getAllByText('Name is required.').length).toBe(2); // beside the field and in the summary
    expect(screen.getAllByText('Enter a valid e-mail address.').length).toBe(2);
    expect(screen.getAllByText('Use digits, spaces and + ( ) - only.').length).toBe(2);
    // The message is tied to its input for screen readers.
    const describedBy = name.getAttribute('aria-describedby')!;
    expect(document.getElementById(describedBy)?.textContent).toContain('Name is required.');
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('sends the parsed values (trimmed, lower-cased e-mail) when the form is valid', async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<CustomerForm submitLabel="Add owner" cancelTo="/owners" onSubmit={onSubmit} />);
    fireEvent.input(screen.getByLabelText(/^Name/), { target: { value: '  Ada Pennywhistle ' } });
    fireEvent.input(screen.getByLabelText(/^E-mail/), { target: { value: 'Ada@Owners.Example' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add owner' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledOnce());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ name: 'Ada Pennywhistle', email: 'ada@owners.example', kind: 'private', phone: '' });
  });

  it("puts the server's field errors beside the fields and its message in the summary", async () => {
    const onSubmit = vi.fn().mockRejectedValue(
      new ApiError({ code: 'conflict', status: 409, message: 'An owner with this e-mail already exists.', fields: { email: 'Already in use.' } }),
    );
    renderWithApp(<CustomerForm submitLabel="Add owner" cancelTo="/owners" onSubmit={onSubmit} />);
    fireEvent.input(screen.getByLabelText(/^Name/), { target: { value: 'Ada Pennywhistle' } });
    fireEvent.input(screen.getByLabelText(/^E-mail/), { target: { value: 'ada@owners.example' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add owner' }));

    expect(await screen.findByText('An owner with this e-mail already exists.')).toBeTruthy();
    expect(screen.getAllByText('Already in use.').length).toBe(2);
    expect(screen.getByLabelText(/^E-mail/).getAttribute('aria-invalid')).toBe('true');
  });
});

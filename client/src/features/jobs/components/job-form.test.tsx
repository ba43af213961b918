import { fireEvent, screen, waitFor } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { BookInForm } from './job-form';

const aircraft = [{ id: '7d0a4c62-2f7e-4b1a-9f3e-5c6d7e8f9a0b', registration: 'Q-TEST', customerName: 'Orla Fenwright' }];

describe('BookInForm', () => {
  it('uses the kind of work as the title until a title is typed', () => {
    renderWithApp(<BookInForm aircraft={aircraft} cancelTo="/jobs" onSubmit={vi.fn()} />);
    const title = screen.getByLabelText(/^Title/) as HTMLInputElement;
    expect(title.value).toBe('Annual permit inspection');
    fireEvent.change(screen.getByLabelText(/^Kind of work/), { target: { value: 'gearbox_inspection' } });
    expect(title.value).toBe('Gearbox inspection');
    fireEvent.input(title, { target: { value: 'Gearbox and clutch check' } });
    fireEvent.change(screen.getByLabelText(/^Kind of work/), { target: { value: 'repair' } });
    expect(title.value).toBe('Gearbox and clutch check');
  });

  it('a template sets the kind of work and the title, and is sent with the booking', async () => {
    const templates = [
      { id: '3e4f5a6b-7c8d-4e9f-8a1b-2c3d4e5f6a7b', name: '100-hour engine service (trike)', jobType: 'engine_service_100h' as const, lineCount: 4, checklistCount: 8, active: true },
    ];
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<BookInForm aircraft={aircraft} defaultAircraftId={aircraft[0]!.id} cancelTo="/jobs" onSubmit={onSubmit} templates={templates} />);
    fireEvent.change(screen.getByLabelText(/^Start from a template/), { target: { value: templates[0]!.id } });
    expect((screen.getByLabelText(/^Kind of work/) as HTMLSelectElement).value).toBe('engine_service_100h');
    expect((screen.getByLabelText(/^Title/) as HTMLInputElement).value).toBe('100-hour engine service (trike)');
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ templateId: templates[0]!.id, type: 'engine_service_100h', title: '100-hour engine service (trike)' });
  });

  it("refuses a due date before booking in, with the shared schema's message, and sends null for no due date", async () => {
    const onSubmit = vi.fn().mockResolvedValue(undefined);
    renderWithApp(<BookInForm aircraft={aircraft} defaultAircraftId={aircraft[0]!.id} cancelTo="/jobs" onSubmit={onSubmit} />);
    fireEvent.input(screen.getByLabelText(/^Booked in on/), { target: { value: '2026-12-10' } });
    fireEvent.input(screen.getByLabelText(/^Due back/), { target: { value: '2026-12-01' } });
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    expect((await screen.findAllByText('The due date cannot be before booking in.')).length).toBeGreaterThan(0);
    expect(onSubmit).not.toHaveBeenCalled();

    fireEvent.input(screen.getByLabelText(/^Due back/), { target: { value: '' } });
    fireEvent.click(screen.getByRole('button', { name: 'Book in' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledOnce());
    expect(onSubmit.mock.calls[0]![0]).toMatchObject({ aircraftId: aircraft[0]!.id, bookedInOn: '2026-12-10', dueOn: null, type: 'annual_permit_inspection' });
  });
});

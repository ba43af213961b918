import type { TemplateDto, WorkshopDto } from '@wingstage/shared';
import { fireEvent, render, screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { EXAMPLE_LIMITS_CAUTION, TemplateEditor } from './template-editor';

const workshop = {
  labourRates: [{ code: 'standard', name: 'Workshop labour', ratePerHour: '62.00' }],
} as WorkshopDto;

const template: TemplateDto = {
  id: '5a6b7c8d-9e0f-4a1b-8c2d-3e4f5a6b7c8d',
  name: 'Annual permit inspection',
  jobType: 'annual_permit_inspection',
  description: '',
  lines: [{ kind: 'labour', description: 'Annual inspection', quantity: '6', labourRateCode: 'standard', partId: null, supplierId: null, amount: null, vatRate: 'standard' }],
  checklist: [
    { section: 'Engine', text: 'Spark plug electrode gap', limit: { min: '0.6', max: '0.9', unit: 'mm', source: 'Example only' } },
    { section: 'Airframe', text: 'Wing attachment bolts', limit: null },
  ],
  active: true,
  version: 2,
};

describe('TemplateEditor', () => {
  it('shows the example-limits caution and saves the reordered checklist', async () => {
    const onSave = vi.fn().mockResolvedValue(undefined);
    render(<TemplateEditor template={template} workshop={workshop} parts={[]} suppliers={[]} onSave={onSave} onReload={vi.fn()} />);
    expect(screen.getByText(EXAMPLE_LIMITS_CAUTION)).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Move checklist item 2 up' }));
    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    await vi.waitFor(() => expect(onSave).toHaveBeenCalled());
    const saved = onSave.mock.calls[0]![0];
    expect(saved.checklist.map((c: { text: string }) => c.text)).toEqual(['Wing attachment bolts', 'Spark plug electrode gap']);
    expect(saved.checklist[1].limit).toEqual({ min: '0.6', max: '0.9', unit: 'mm', source: 'Example only' });
  });

  it('when someone else saved first, says so, keeps the edits and offers their version', async () => {
    const onReload = vi.fn();
    const onSave = vi.fn().mockRejectedValue(new ApiError({ code: 'stale_version', status: 409, message: 'Someone else changed this template.' }));
    render(<TemplateEditor template={template} workshop={workshop} parts={[]} suppliers={[]} onSave={onSave} onReload={onReload} />);
    fireEvent.input(screen.getByLabelText(/^Name/), { target: { value: 'Annual permit inspection, trikes' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save template' }));
    expect(await screen.findByText('Not saved: someone else changed this template')).toBeTruthy();
    expect((screen.getByLabelText(/^Name/) as HTMLInputElement).value).toBe('Annual permit inspection, trikes');
    fireEvent.click(screen.getByRole('button', { name: 'Load their version' }));
    expect(onReload).toHaveBeenCalled();
  });
});

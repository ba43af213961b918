import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { JobDocumentsDto } from '@wingstage/shared';
import { DocumentsSection } from './documents-section';

const JOB = '7d7f1a52-3f0c-4d7e-9d59-0b1c2a3d4e5f';

function docs(over: Partial<JobDocumentsDto> = {}): JobDocumentsDto {
  return {
    jobId: JOB,
    estimate: { path: `/api/jobs/${JOB}/estimate.pdf` },
    decisionRecords: [],
    invoice: null,
    creditNotes: [],
    ...over,
  };
}

describe('DocumentsSection', () => {
  it('when nothing is issued yet, then only the estimate is offered, even before the list loads', () => {
    const { rerender } = render(<DocumentsSection jobId={JOB} audience="owner" />);
    expect(screen.getAllByRole('link')).toHaveLength(1);
    expect(screen.getByRole('link', { name: /Estimate as it stands today/ }).getAttribute('href')).toBe(`/api/jobs/${JOB}/estimate.pdf`);
    rerender(<DocumentsSection jobId={JOB} audience="owner" docs={docs()} />);
    expect(screen.getAllByRole('link')).toHaveLength(1);
  });

  it('when decisions, an invoice and a credit note exist, then each has its download link', () => {
    render(
      <DocumentsSection
        jobId={JOB}
        audience="staff"
        docs={docs({
          decisionRecords: [{ requestId: 'r1', decidedAt: '2026-11-20T10:00:00.000Z', decidedByName: 'Zofia Dvořák', path: '/api/approval-requests/r1/decision-record.pdf' }],
          invoice: { id: 'i1', number: 'INV-000107', issuedAt: '2026-12-02T09:00:00.000Z', path: '/api/invoices/i1/pdf' },
          creditNotes: [{ id: 'c1', number: 'CN-000012', issuedAt: '2026-12-05T09:00:00.000Z', path: '/api/credit-notes/c1/pdf' }],
        })}
      />,
    );
    expect(screen.getByRole('link', { name: /Decision record: decided .* by Zofia Dvořák/ }).getAttribute('href')).toBe('/api/approval-requests/r1/decision-record.pdf');
    expect(screen.getByRole('link', { name: /VAT invoice INV-000107/ }).getAttribute('href')).toBe('/api/invoices/i1/pdf');
    expect(screen.getByRole('link', { name: /Credit note CN-000012/ }).getAttribute('href')).toBe('/api/credit-notes/c1/pdf');
    for (const link of screen.getAllByRole('link')) expect(link.hasAttribute('download')).toBe(true);
  });

  it('when the list fails to load, then the estimate stays offered and a plain note says so', () => {
    render(<DocumentsSection jobId={JOB} audience="owner" failed />);
    expect(screen.getByRole('link', { name: /Estimate/ })).toBeTruthy();
    expect(screen.getByText(/could not be listed just now/)).toBeTruthy();
  });
});

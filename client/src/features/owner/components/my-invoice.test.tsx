import type { CreditNoteSummaryDto, InvoiceDocument, InvoiceDto } from '@wingstage/shared';
import { screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { renderWithApp } from '@/testing/render';
import { MyInvoice } from './my-invoice';

const doc: InvoiceDocument = {
  version: 1, kind: 'invoice', number: 'INV-00031', issuedOn: '2026-11-20', taxPoint: '2026-11-20', dueOn: '2026-12-20',
  supplier: { name: 'Brackenfold Light Aircraft Engineering', addressLines: ['Hangar 3'], postcode: 'QX1 4BF', vatNumber: 'GB 123 4567 89', phone: null, email: null },
  customer: { name: 'Orla Fenwright', addressLines: [], postcode: '', email: null },
  job: { number: 'J-0042', title: 'Annual permit inspection', registration: 'Q-BRKA', aircraft: 'two-seat flex-wing trike' },
  currency: 'GBP', rounding: 'invoice', roundingLabel: 'VAT worked out on each rate’s total',
  lines: [{ stage: 'inspection', finding: null, description: 'Inspection labour', quantity: '1.2', unit: 'h', unitNet: '60.67', discount: '0.00', vatRate: 'standard', vatPercent: '20', net: '72.80', vat: null }],
  byRate: [{ vatRate: 'standard', vatPercent: '20', net: '72.80', vat: '14.56' }],
  totals: { net: '72.80', vat: '14.56', gross: '87.36' }, deposits: [], depositsVat: '0.00',
  balance: { net: '72.80', vat: '14.56', gross: '87.36' }, balanceDue: '87.36', notes: [],
};

const refundNote: CreditNoteSummaryDto = {
  id: 'cn1', number: 'CN-00007', invoiceId: 'i1', invoiceNumber: 'INV-00031', jobId: 'j1', jobNumber: 'J-0042', customerName: 'Orla Fenwright',
  issuedOn: '2026-11-28', reason: 'Part supplied at a lower price', currency: 'GBP', net: '4.17', vat: '0.83', gross: '5.00', refunded: '5.00', email: null,
};

function invoice(over: Partial<InvoiceDto>): InvoiceDto {
  return {
    id: 'i1', number: 'INV-00031', jobId: 'j1', jobNumber: 'J-0042', registration: 'Q-BRKA', customerId: 'c1', customerName: 'Orla Fenwright',
    state: 'paid', issuedOn: '2026-11-20', dueOn: '2026-12-20', currency: 'GBP', gross: '87.36',
    invoiced: '87.36', received: '87.36', due: '0.00', paid: '87.36', refunded: '0.00',
    document: doc, creditNotes: [], payments: [], creditable: '87.36', email: null, ...over,
  };
}

const standing = () => screen.getByTestId('my-invoice-standing').textContent ?? '';

describe('the owner’s invoice card', () => {
  it('when an £87.36 invoice paid in full has £5.00 refunded with its credit note, then it says what was paid, what came back and by which credit note, and that nothing is owed', () => {
    renderWithApp(<MyInvoice jobId="j1" invoice={invoice({ invoiced: '82.36', received: '82.36', refunded: '5.00', creditNotes: [refundNote], creditable: '82.36' })} />);
    expect(standing()).toBe('Nothing is left to pay. You paid £87.36. We refunded £5.00 of it to you with credit note CN-00007, so you have paid £82.36 in all.');
    // The old sentence read like money still owed.
    expect(standing()).not.toMatch(/so far/);
    expect(screen.queryByRole('button', { name: 'Pay balance' })).toBeNull();
  });

  it('when paid in full with no refund, then it thanks the owner and says what they paid', () => {
    renderWithApp(<MyInvoice jobId="j1" invoice={invoice({})} />);
    expect(standing()).toBe('Paid in full. Thank you. You paid £87.36.');
  });

  it('when part is paid and part refunded, then what is left to pay comes first and the refund is still named', () => {
    renderWithApp(
      <MyInvoice jobId="j1" invoice={invoice({ invoiced: '82.36', paid: '50.00', refunded: '5.00', received: '45.00', due: '37.36', creditNotes: [refundNote, { ...refundNote, id: 'cn2', number: 'CN-00009', refunded: null }] })} />,
    );
    expect(standing()).toBe('Left to pay: £37.36, by 20 Dec 2026. You paid £50.00. We refunded £5.00 of it to you with credit note CN-00007, so you have paid £45.00 in all.');
    expect(screen.getByRole('button', { name: 'Pay balance' })).toBeTruthy();
  });

  it('when nothing has been paid yet, then only what is left to pay is said', () => {
    renderWithApp(<MyInvoice jobId="j1" invoice={invoice({ state: 'issued', paid: '0.00', received: '0.00', due: '87.36' })} />);
    expect(standing()).toBe('Left to pay: £87.36, by 20 Dec 2026.');
  });
});

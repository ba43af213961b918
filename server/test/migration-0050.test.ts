import { describe, expect, it } from 'vitest';
import { priceChoice, type ChoiceBasis } from '@wingstage/shared';
import { convertSnapshot } from '../../db/migrations/0050-quote-agreement.js';

const t = (net: string, vat: string, gross: string) => ({ net, vat, gross, byRate: [] });

describe('migration 0050 converts a stored snapshot to version 3 once', () => {
  it('when an older snapshot with a pricing basis is converted, then its basis, items and figures carry over and the old fields are gone', () => {
    const old = {
      requestId: 'r', jobId: 'j', jobNumber: 'J-0001', jobTitle: 'Annual', registration: 'Q-TEST', aircraftType: 'Trike', ownerName: 'O', workshopName: 'W',
      currency: 'GBP', rounding: 'invoice-nearest', message: '', sentAt: '2026-11-01T10:00:00Z', expiresAt: '2026-11-15T10:00:00Z',
      findings: [
        { findingId: 'f1', number: 'F-1', title: 'Plugs', category: 'recommended', location: '', seen: '', measuredValue: null, limit: null,
          lines: [{ description: 'Fit plugs', kind: 'labour', quantity: '0.50', net: '31.00', vatRate: 'standard', accessTaskId: 'cowl' }, { description: 'Flange', kind: 'labour', quantity: '0.25', net: '15.50', vatRate: 'standard', accessTaskId: 'prop' }],
          price: t('139.50', '27.90', '167.40'), accessCovered: ['Propeller off'], accessSavingGross: '55.80' },
      ],
      pricingBasis: {
        vatRates: { standard: '20', reduced: '5', zero: '0' },
        accessTasks: [{ id: 'cowl', name: 'Cowling off', net: '93.00', vatRate: 'standard' }, { id: 'prop', name: 'Propeller off', net: '46.50', vatRate: 'standard' }],
        accessPaid: ['prop'],
        committed: { lines: [{ stage: 'inspection', kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: 'prop' }], accessTasks: [{ id: 'prop', net: '46.50', vatRate: 'standard' }] },
      },
      totals: { quoted: t('77.50', '15.50', '93.00'), approvedSoFar: t('77.50', '15.50', '93.00'), thisRequest: t('139.50', '27.90', '167.40'), undecidedElsewhere: t('0.00', '0.00', '0.00') },
    };
    const v3 = convertSnapshot(old) as Record<string, unknown> & { basis: ChoiceBasis; findings: Record<string, unknown>[]; totals: Record<string, unknown> };
    expect(v3.version).toBe(3);
    expect(v3.pricingBasis).toBeUndefined();
    expect(v3.quote).toBeNull();
    expect(v3.basis.committed).toEqual({ lines: [{ kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: 'prop' }], accessTasks: [{ id: 'prop', net: '46.50', vatRate: 'standard' }] });
    expect(v3.basis.items).toEqual([{ id: 'f1', kind: 'finding', lines: [{ kind: 'labour', net: '31.00', vatRate: 'standard', accessTaskId: 'cowl' }, { kind: 'labour', net: '15.50', vatRate: 'standard', accessTaskId: 'prop' }] }]);
    // Opening-up already paid by agreed work is not in the request.
    expect(v3.basis.accessTasks).toEqual([{ id: 'cowl', name: 'Cowling off', net: '93.00', vatRate: 'standard' }]);
    expect(v3.findings[0]).toMatchObject({ gross: '167.40', photos: [] });
    expect(v3.findings[0]!.accessCovered).toBeUndefined();
    // The figures the owner saw at sending: 93.00 agreed + 167.40 for the request.
    expect(v3.totals).toMatchObject({ agreedSoFar: old.totals.approvedSoFar, approvingNow: { net: '139.50', vat: '27.90', gross: '167.40' }, ifAllApproved: { gross: '260.40' } });
    // The converted basis prices: 31.00 + 15.50 + 93.00 cowling = 139.50 net, £167.40 at 20%, as the owner saw.
    expect(priceChoice(v3.basis, { f1: 'approve' }).approvingNow.gross).toBe('167.40');
    // Converting twice changes nothing.
    expect(convertSnapshot(v3 as never)).toBe(v3);
  });
});

import { describe, expect, it } from 'vitest';
import { invoicesCsv } from '../../../../server/modules/reports/exports.js';

describe('invoice CSV with a credit line', () => {
  it('writes the credit and the totals as plain signed amounts an accounting import reads', () => {
    const csv = invoicesCsv([
      {
        jobId: 'j1', jobNumber: 1042, releasedOn: '2026-05-04', shopCode: 'SEA', shopName: 'Test Seattle', customerName: 'Quillon Park Band', customerHidden: false,
        instrument: 'Alto saxophone · Testmaker', serial: 'AB-104 233', taxRateBasisPoints: 1000,
        lines: [
          { kind: 'labor', description: 'Repad', quantity: 2, unitCents: 9000, totalCents: 18000 },
          { kind: 'part', description: 'Goodwill credit', quantity: 1, unitCents: -2000, totalCents: -2000 },
        ],
        // worked by hand: 180.00 − 20.00 = 160.00; 10 % tax (a rate invented for the test) 16.00; total 176.00
        subtotalCents: 16000, taxCents: 1600, totalCents: 17600,
      },
      {
        jobId: 'j2', jobNumber: 1043, releasedOn: '2026-05-04', shopCode: 'SEA', shopName: 'Test Seattle', customerName: null, customerHidden: false,
        instrument: 'Flute', serial: 'FL-1', taxRateBasisPoints: 1000,
        lines: [{ kind: 'part', description: 'Refund of a deposit', quantity: 1, unitCents: -5000, totalCents: -5000 }],
        subtotalCents: -5000, taxCents: -500, totalCents: -5500,
      },
    ]);
    const rows = csv.trimEnd().split('\r\n');
    expect(rows).toHaveLength(4);
    expect(rows[2]).toBe('1042,2026-05-04,SEA,Test Seattle,Quillon Park Band,Alto saxophone · Testmaker,AB-104 233,2,part,Goodwill credit,1,-2000,-2000,-20.00,16000,10,1600,17600,160.00,16.00,176.00,,');
    expect(rows[3]).toBe('1043,2026-05-04,SEA,Test Seattle,,Flute,FL-1,1,part,Refund of a deposit,1,-5000,-5000,-50.00,-5000,10,-500,-5500,-50.00,-5.00,-55.00,,');
  });
});

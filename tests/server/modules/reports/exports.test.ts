import { describe, expect, it } from 'vitest';
import { invoicesCsv, jobsCsv, overdueCsv } from '../../../../server/modules/reports/exports.js';
import type { OverdueJob, ReportJob } from '../../../../shared/reports/schemas.js';

/** A hidden private customer is written "Private customer" in every file, never as an empty cell. */
describe('report CSV files and hidden customer names', () => {
  const base = {
    id: 'j1', number: 7, shopId: 's1', shopName: 'Denver bench', stage: 'on_bench' as const, family: 'flute' as const,
    maker: 'Quellstone', model: null, serial: 'Q 1', assigneeName: null,
  };
  const overdue = (customerName: string | null, customerHidden: boolean): OverdueJob => ({
    ...base, customerName, customerHidden, promisedOn: '2026-11-01', daysLate: 3,
  });
  const job = (customerName: string | null, customerHidden: boolean): ReportJob => ({
    ...base, customerName, customerHidden, skillName: null, estimatedHours: null, openedAt: '2026-11-01T00:00:00.000Z', readyAt: null, promisedOn: null,
  });
  const row = (csv: string) => csv.trimEnd().split('\r\n')[1];

  it('overdue and jobs files: hidden → "Private customer"; no customer → empty; a school → its name', () => {
    const list = <T>(items: T[]) => ({ shops: [], total: items.length, items });
    expect(row(overdueCsv(list([overdue(null, true)])))).toContain(',Private customer,');
    expect(row(overdueCsv(list([overdue(null, false)])))).toContain(',Q 1,,2026-11-01,');
    expect(row(overdueCsv(list([overdue('Thornbury Academy Band', false)])))).toContain(',Thornbury Academy Band,');
    expect(row(jobsCsv(list([job(null, true)])))).toContain(',Private customer,');
  });

  it('invoice file: hidden → "Private customer"', () => {
    const csv = invoicesCsv([{
      jobId: 'j1', jobNumber: 7, releasedOn: '2026-11-02', shopCode: 'DEN', shopName: 'Denver bench', customerName: null, customerHidden: true,
      instrument: 'flute · Quellstone', serial: 'Q 1', taxRateBasisPoints: 0, lines: [], subtotalCents: 0, taxCents: 0, totalCents: 0,
    }]);
    expect(row(csv)).toMatch(/^7,2026-11-02,DEN,Denver bench,Private customer,/);
  });
});

import { estimateTotals } from '../jobs/estimate.js';

// Formatting and parsing of amounts live in shared/money.ts; this file is only the invoice's arithmetic.

/**
 * Invoice arithmetic for the accounting CSV. The rule is the estimate's (shared/jobs/estimate.ts), so
 * an invoice always agrees with the estimate the customer approved: each line rounded once to whole
 * cents, half away from zero (hours × rate, quantity × unit price); subtotal = sum of the rounded
 * lines; tax = subtotal × the shop's basis points ÷ 10 000, rounded half away from zero, once;
 * total = subtotal + tax.
 */

export interface InvoiceLineInput {
  kind: 'labor' | 'part';
  /** NUMERIC values arrive from pg as strings */
  hours?: number | string | null;
  rateCents?: number | null;
  quantity?: number | string | null;
  unitPriceCents?: number | null;
}

export interface InvoiceTotals {
  lineTotalsCents: number[];
  subtotalCents: number;
  taxCents: number;
  totalCents: number;
}

export function invoiceTotals(lines: InvoiceLineInput[], taxRateBasisPoints: number): InvoiceTotals {
  const t = estimateTotals(
    lines.map((l) =>
      l.kind === 'labor'
        ? { kind: 'labor' as const, hours: Number(l.hours ?? 0), rateCents: l.rateCents ?? 0 }
        : { kind: 'part' as const, quantity: Number(l.quantity ?? 0), unitPriceCents: l.unitPriceCents ?? 0 },
    ),
    taxRateBasisPoints,
  );
  return { lineTotalsCents: t.lineCents, subtotalCents: t.subtotalCents, taxCents: t.taxCents, totalCents: t.totalCents };
}

import PDFDocument from 'pdfkit';
import { formatBasisPoints } from '../../../shared/jobs/estimate.js';
import { formatCents } from '../../../shared/money.js';
import { formatDate } from '../../../shared/time/format.js';
import { APPROVAL_MEANING } from '../../../shared/customers/public-page.js';

/** What the estimate PDF shows; customer-mail.ts fills it from the job's rows. */
export interface EstimatePdfContent {
  shop: { name: string; address: string | null; phone: string | null; email: string | null; timeZone: string };
  jobNumber: number;
  version: number;
  instrument: string;
  customerName: string | null;
  poNumber: string | null;
  taxExemptCertificate: string | null;
  lines: Array<{ description: string; totalCents: number }>;
  subtotalCents: number;
  taxRateBasisPoints: number;
  taxCents: number;
  totalCents: number;
  /** the approved amount this one replaces, when the total rose above it */
  previouslyApproved: { totalCents: number; version: number } | null;
  url: string;
  generatedAt: Date;
}

// The PDF's built-in Helvetica only has Latin-1 glyphs.
const latin1 = (s: string) =>
  s
    .replace(/→/g, '->')
    .replace(/[–—]/g, '-')
    .replace(/[‘’]/g, "'")
    .replace(/[“”]/g, '"')
    .replace(/…/g, '...')
    .replace(/[^\x20-\xFF\n]/g, '?');

/** A one-page estimate the customer keeps: the shop, the lines, tax, total and what approving means. */
export async function renderEstimatePdf(e: EstimatePdfContent): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 54,
    info: { Title: latin1(`Estimate - job ${e.jobNumber}`), Author: latin1(e.shop.name), Subject: latin1(`Estimate v${e.version}`) },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  doc.font('Helvetica-Bold').fontSize(20).fillColor('#1c2024').text(latin1(e.shop.name), left, 54, { width });
  doc.font('Helvetica').fontSize(10).fillColor('#555d66');
  for (const line of [e.shop.address, [e.shop.phone, e.shop.email].filter(Boolean).join(' - ')]) if (line) doc.text(latin1(line), { width });
  doc.moveDown(1);
  doc.fillColor('#1c2024').font('Helvetica-Bold').fontSize(15).text(latin1(`Estimate for job ${e.jobNumber} (version ${e.version})`), { width });
  doc.font('Helvetica').fontSize(11).text(latin1(`Dated ${formatDate(e.generatedAt, e.shop.timeZone)}`), { width });
  doc.text(latin1(`Instrument: ${e.instrument}`), { width });
  if (e.customerName) doc.text(latin1(`For: ${e.customerName}`), { width });
  if (e.poNumber) doc.text(latin1(`Purchase order: ${e.poNumber}`), { width });
  if (e.taxExemptCertificate) doc.text(latin1(`Tax-exempt certificate: ${e.taxExemptCertificate}`), { width });
  doc.moveDown(1);

  const amountX = left + width - 110;
  const row = (label: string, cents: number, bold = false) => {
    const y = doc.y;
    doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(11);
    doc.text(latin1(label), left, y, { width: width - 120 });
    const after = doc.y;
    doc.text(latin1(formatCents(cents)), amountX, y, { width: 110, align: 'right' });
    doc.y = Math.max(after, doc.y) + 4;
  };
  const rule = () => {
    doc.moveTo(left, doc.y).lineTo(left + width, doc.y).strokeColor('#d3cfc6').stroke();
    doc.moveDown(0.4);
  };
  if (!e.lines.length) doc.font('Helvetica').fontSize(11).text('No work listed yet.', left, doc.y, { width });
  for (const line of e.lines) row(line.description, line.totalCents);
  rule();
  row('Subtotal', e.subtotalCents);
  row(`Tax (${formatBasisPoints(e.taxRateBasisPoints)})`, e.taxCents);
  row('Total', e.totalCents, true);
  if (e.previouslyApproved) {
    doc.moveDown(0.5);
    doc
      .font('Helvetica-Bold')
      .fontSize(11)
      .text(
        latin1(
          `You approved ${formatCents(e.previouslyApproved.totalCents)} (version ${e.previouslyApproved.version}). ` +
            `The total is now ${formatCents(e.totalCents)}: the work above that amount waits for your new answer.`,
        ),
        left,
        doc.y,
        { width },
      );
  }
  doc.moveDown(1);
  doc.font('Helvetica-Bold').fontSize(13).text('What approving means', left, doc.y, { width });
  doc.font('Helvetica').fontSize(11).text(latin1(APPROVAL_MEANING), { width });
  doc.moveDown(0.6);
  doc.text(latin1(`Approve or decline on your job's page: ${e.url}`), { width });
  doc.end();
  return finished;
}

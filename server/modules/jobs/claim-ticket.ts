import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';
import { formatDate, formatDateTime } from '../../../shared/time/format.js';
import { formatCalendarDate } from '../../../shared/jobs/promised-date.js';

/** What the claim ticket shows; the service fills it from the job's rows. */
export interface ClaimTicketContent {
  jobNumber: number;
  /** the job's page in Benchrelay: the QR code the counter scans at pickup */
  url: string;
  shop: { name: string; address: string | null; phone: string | null; timeZone: string };
  openedAt: Date;
  promisedOn: string | null;
  instrument: { family: string; maker: string; model: string | null; serial: string };
  customerName: string | null;
  complaint: string;
  conditionNotes: string | null;
  accessories: string[];
  photoCount: number;
  printedAt: Date;
}

const latin1 = (s: string) =>
  s
    .replace(/→/g, '->')
    .replace(/♯/g, '#')
    .replace(/♭/g, 'b')
    .replace(/[–—]/g, '-')
    .replace(/[‘’]/g, "'")
    .replace(/[“”]/g, '"')
    .replace(/…/g, '...')
    .replace(/[^\x20-\xFF\n]/g, '?');

/**
 * The customer's claim ticket, printed at intake: the job's QR code, the instrument, what came with it,
 * the condition as written, and a line where the customer signs that the condition notes are right.
 */
export async function renderClaimTicket(t: ClaimTicketContent): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 54,
    info: { Title: latin1(`Claim ticket - job ${t.jobNumber}`), Author: latin1(t.shop.name), Subject: latin1(`Serial ${t.instrument.serial}`) },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const qr = await QRCode.toBuffer(t.url, { type: 'png', margin: 1, width: 300, errorCorrectionLevel: 'M' });
  doc.image(qr, left + width - 110, 54, { width: 110 });

  doc.font('Helvetica-Bold').fontSize(20).fillColor('#1c2024').text(latin1(`Claim ticket - job ${t.jobNumber}`), left, 58, { width: width - 130 });
  doc.font('Helvetica').fontSize(11).fillColor('#555d66').text(latin1(t.shop.name), { width: width - 130 });
  for (const line of [t.shop.address, t.shop.phone]) if (line) doc.text(latin1(line), { width: width - 130 });
  doc.fillColor('#1c2024');
  doc.y = Math.max(doc.y, 180);

  const row = (label: string, value: string) => {
    const y = doc.y;
    doc.font('Helvetica-Bold').fontSize(11).text(label, left, y, { width: 130 });
    doc.font('Helvetica').fontSize(11).text(latin1(value), left + 140, y, { width: width - 140 });
    doc.moveDown(0.4);
  };
  row('Taken in', formatDateTime(t.openedAt, t.shop.timeZone));
  row('Promised for', t.promisedOn ? formatCalendarDate(t.promisedOn) : 'No date promised yet');
  if (t.customerName) row('Customer', t.customerName);
  row('Instrument', `${t.instrument.family}, ${[t.instrument.maker, t.instrument.model].filter(Boolean).join(' ')}`);
  row('Serial number', t.instrument.serial);
  row('Came with', t.accessories.length ? t.accessories.join(', ') : 'Nothing else recorded');
  row('Reported problem', t.complaint);
  row('Condition at intake', t.conditionNotes ?? 'Not written');
  row('Photos at intake', t.photoCount ? `${t.photoCount} kept with the job` : 'None taken');

  doc.moveDown(1);
  doc
    .font('Helvetica')
    .fontSize(10)
    .text(
      'Bring this ticket (or its QR code) when you collect the instrument. By signing, you agree that the condition notes above describe the instrument as you left it.',
      left,
      doc.y,
      { width },
    );
  const signature = (label: string) => {
    doc.moveDown(1.6);
    const y = doc.y;
    doc.font('Helvetica').fontSize(11).text(label, left, y, { width: 190 });
    doc.moveTo(left + 190, y + 12).lineTo(left + width - 120, y + 12).strokeColor('#1c2024').stroke();
    doc.text('Date', left + width - 110, y, { width: 30 });
    doc.moveTo(left + width - 75, y + 12).lineTo(left + width, y + 12).stroke();
    doc.y = y + 16;
  };
  signature('Customer signature');
  signature(latin1(`For ${t.shop.name}`));
  doc.moveDown(1);
  doc.font('Helvetica').fontSize(9).fillColor('#555d66').text(latin1(`Printed ${formatDate(t.printedAt, t.shop.timeZone)}`), left, doc.y, { width });
  doc.end();
  return finished;
}

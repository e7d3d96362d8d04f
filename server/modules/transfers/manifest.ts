import PDFDocument from 'pdfkit';
import QRCode from 'qrcode';
import { INSTRUMENT_FAMILY_LABELS, type InstrumentFamily } from '../../../shared/domain.js';
import { TRANSFER_STATE_LABELS } from '../../../shared/transfers.js';
import { LIFTING_CAUTION } from '../../../shared/safety/hazards.js';
import { formatWeekdays, formatHours } from '../../../shared/routing/rank.js';
import { zoneLabel } from '../../../shared/routing/zoned.js';
import { formatDate, formatDateTime } from '../../../shared/time/format.js';
import type { TransferState } from '../../../shared/domain.js';

/** What the manifest shows; the service fills it from the transfer's rows. */
export interface ManifestContent {
  transferId: string;
  url: string;
  state: TransferState;
  serial: string;
  family: InstrumentFamily;
  maker: string;
  model: string | null;
  assetTag: string | null;
  jobNumber: number;
  complaint: string;
  from: { name: string; address: string; timeZone: string };
  to: { name: string; address: string; timeZone: string };
  run: { weekdays: number[]; departureTime: string; transitHours: number } | null;
  reason: string;
  requestedBy: string;
  approvedBy: string | null;
  packedBy: string | null;
  packedAt: Date | null;
  /** When the origin handed it over to the run or the courier. */
  handedOverAt: Date | null;
  /** The run's departure (or the courier's pick-up) once handed over. */
  departedAt: Date | null;
  expectedArrivalAt: Date | null;
  /** Packed but not handed over yet: the run it is packed for. */
  nextRunDepartureAt: Date | null;
  caseCount: number;
  contents: string | null;
  departureCondition: string | null;
  heavyCase: boolean;
  generatedAt: Date;
}

// The PDF's built-in Helvetica only has Latin-1 glyphs, so arrows and the like are spelled out.
const latin1 = (s: string) =>
  s
    .replace(/→/g, '->')
    .replace(/♯/g, '#')
    .replace(/♭/g, 'b')
    .replace(/[–—]/g, '-')
    .replace(/[‘’]/g, "'")
    .replace(/[“”]/g, '"')
    .replace(/[^\x20-\xFF\n]/g, '?');

/** A one-page PDF that travels with the instrument; the QR code opens the transfer in Benchrelay. */
export async function renderManifest(m: ManifestContent): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'LETTER',
    margin: 54,
    info: {
      Title: latin1(`Transfer manifest - ${m.serial}`),
      Subject: latin1(`Job ${m.jobNumber}: ${m.from.name} to ${m.to.name}`),
      Author: 'Benchrelay',
      Keywords: latin1(`transfer ${m.transferId} serial ${m.serial}`),
    },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const qr = await QRCode.toBuffer(m.url, { type: 'png', margin: 1, width: 300, errorCorrectionLevel: 'M' });
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  doc.image(qr, left + width - 120, 54, { width: 120 });
  doc.font('Helvetica-Bold').fontSize(20).text('Transfer manifest', left, 58, { width: width - 140 });
  doc.font('Helvetica').fontSize(10).fillColor('#555d66').text(latin1(`Benchrelay - ${m.url}`), { width: width - 140 });
  doc.text(latin1(`State: ${TRANSFER_STATE_LABELS[m.state]} - printed ${formatDateTime(m.generatedAt, m.from.timeZone)}`), {
    width: width - 140,
  });
  doc.fillColor('#1c2024');
  doc.y = Math.max(doc.y, 190);

  const row = (label: string, value: string) => {
    const y = doc.y;
    doc.font('Helvetica-Bold').fontSize(11).text(label, left, y, { width: 130 });
    doc.font('Helvetica').fontSize(11).text(latin1(value), left + 140, y, { width: width - 140 });
    doc.moveDown(0.4);
  };
  const section = (title: string) => {
    doc.moveDown(0.6);
    doc.font('Helvetica-Bold').fontSize(13).text(title, left);
    doc.moveTo(left, doc.y + 2).lineTo(left + width, doc.y + 2).strokeColor('#d3cfc6').stroke();
    doc.moveDown(0.5);
  };

  section('Instrument');
  row('Serial number', m.serial);
  row('Family', INSTRUMENT_FAMILY_LABELS[m.family]);
  row('Maker / model', [m.maker, m.model].filter(Boolean).join(' / '));
  if (m.assetTag) row('Asset tag', m.assetTag);
  row('Job', `${m.jobNumber} - ${m.complaint}`);

  section('Route');
  row('From', `${m.from.name}${m.from.address ? `, ${m.from.address}` : ''}`);
  row('To', `${m.to.name}${m.to.address ? `, ${m.to.address}` : ''}`);
  row(
    'Relay run',
    m.run
      ? `${formatWeekdays(m.run.weekdays)} at ${m.run.departureTime.slice(0, 5)} (${zoneLabel(m.from.timeZone)}), ${formatHours(m.run.transitHours)} h on the road`
      : 'No relay run chosen yet (or an ad-hoc courier)',
  );
  const runDate = m.departedAt ?? m.nextRunDepartureAt;
  if (m.run) row('Run date', runDate ? `${formatDate(runDate, m.from.timeZone)}, leaves ${formatDateTime(runDate, m.from.timeZone)}` : 'The run has no departure scheduled');
  if (m.handedOverAt) row('Handed over', formatDateTime(m.handedOverAt, m.from.timeZone));
  if (m.departedAt && !m.run) row('Left', formatDateTime(m.departedAt, m.from.timeZone));
  if (m.expectedArrivalAt) row('Expected', formatDateTime(m.expectedArrivalAt, m.to.timeZone));
  row('Reason', m.reason);

  section('Contents');
  row('Number of cases', String(m.caseCount));
  row('Contents and accessories', m.contents ?? 'Instrument in its case; nothing else recorded');
  row('Condition on departure', m.departureCondition ?? 'Not recorded at packing');

  section('People');
  row('Requested by', m.requestedBy);
  row('Approved by', m.approvedBy ?? 'Not approved yet');
  row('Packed by', m.packedBy ? `${m.packedBy}${m.packedAt ? `, ${formatDateTime(m.packedAt, m.from.timeZone)}` : ''}` : 'Not packed yet');

  if (m.heavyCase) {
    section('Lifting caution');
    doc.font('Helvetica').fontSize(11).text(latin1(LIFTING_CAUTION), left, doc.y, { width });
  }

  section('On arrival');
  doc
    .font('Helvetica')
    .fontSize(11)
    .text('Scan the QR code or open the transfer, then scan or type the serial number engraved on the instrument to confirm receipt. A different serial is refused.', left, doc.y, { width });

  section('Signatures');
  const signature = (label: string) => {
    doc.moveDown(1.2);
    const y = doc.y;
    doc.font('Helvetica').fontSize(11).text(label, left, y, { width: 200 });
    doc.moveTo(left + 200, y + 12).lineTo(left + width - 120, y + 12).strokeColor('#1c2024').stroke();
    doc.text('Date', left + width - 110, y, { width: 30 });
    doc.moveTo(left + width - 75, y + 12).lineTo(left + width, y + 12).stroke();
    doc.y = y + 16;
  };
  signature(latin1(`Handed over by (${m.from.name})`));
  signature(latin1(`Received by (${m.to.name})`));

  doc.end();
  return finished;
}

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import jsQR from 'jsqr';
import { buildApp } from '../../../server/app.js';
import { Job } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { pdfText } from '../../helpers/transfers.js';
import { makeInstrumentWithJob } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';

/** The counter's intake checklist (accessories ticked and typed) and the printed claim ticket. */
describe('intake checklist and claim ticket', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['front_desk', 'auditor']);
  });
  afterAll(closeServerResources);

  const origin = () => process.env.APP_ORIGIN!;

  it('records what came with the instrument, in the list’s order, and refuses what is not on the list', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake' });
    const res = await request(app).patch(`/api/jobs/${job.id}`).set('Cookie', w.cookies.front_desk).set('Origin', origin())
      .send({ accessories: ['swab', 'case', 'neck', 'case'], accessoriesOther: 'Two spare reeds in a tin' }).expect(200);
    expect(res.body.job.accessories).toEqual(['case', 'neck', 'swab']);
    expect(res.body.job.accessoriesOther).toBe('Two spare reeds in a tin');

    const bad = await request(app).patch(`/api/jobs/${job.id}`).set('Cookie', w.cookies.front_desk).set('Origin', origin())
      .send({ accessories: ['case', 'gold watch'] });
    expect(bad.status).toBe(400);
    expect((await Job.findByPk(job.id))!.accessories).toEqual(['case', 'neck', 'swab']);
  });

  it('prints a claim ticket with the condition notes, what came with it, a signature line and the job’s QR code', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake', serial: 'CT-448210' });
    await job.update({ customerId: w.customer.id, conditionNotes: 'Dent on the bow; lacquer worn at the thumb rest', accessories: ['case', 'mouthpiece'], accessoriesOther: 'Neck strap, brown' });
    const res = await request(app).get(`/api/jobs/${job.id}/claim-ticket.pdf`).set('Cookie', w.cookies.front_desk).buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => done(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const pdf = res.body as Buffer;
    const text = (await pdfText(pdf)).replace(/\s+/g, ' ');
    for (const expected of [`Claim ticket - job ${job.number}`, 'CT-448210', 'Dent on the bow', 'Case, Mouthpiece, Neck strap, brown', 'Customer signature', w.shop.name]) {
      expect(text).toContain(expected);
    }
    // the QR code is a PNG inside the PDF: decode it and read the job's address back
    const png = await qrImageOf(pdf);
    const code = jsQR(png.data, png.width, png.height);
    expect(code?.data).toBe(`${process.env.APP_ORIGIN}/jobs/${job.id}?shop=${w.shop.id}`);
    // auditors read jobs; they do not print tickets
    await request(app).get(`/api/jobs/${job.id}/claim-ticket.pdf`).set('Cookie', w.cookies.auditor).expect(403);
  });
});

/** The first image XObject of a pdfkit PDF as RGBA pixels (pdfkit stores a PNG's pixels Flate-compressed). */
async function qrImageOf(pdf: Buffer): Promise<{ data: Uint8ClampedArray; width: number; height: number }> {
  const { inflateSync } = await import('node:zlib');
  const raw = pdf.toString('latin1');
  const header = /\/Type \/XObject\s*\/Subtype \/Image[^>]*?\/Width (\d+)[^>]*?\/Height (\d+)[^>]*?>>\s*stream\r?\n/s.exec(raw)
    ?? /\/Subtype \/Image[\s\S]*?>>\s*stream\r?\n/.exec(raw);
  if (!header) throw new Error('no image in the PDF');
  const dict = raw.slice(raw.lastIndexOf('<<', header.index + header[0].length), header.index + header[0].length);
  const width = Number(/\/Width (\d+)/.exec(dict)![1]);
  const height = Number(/\/Height (\d+)/.exec(dict)![1]);
  const colors = /\/DeviceGray/.test(dict) ? 1 : 3;
  const start = header.index + header[0].length;
  const end = raw.indexOf('endstream', start);
  let bytes: Buffer = Buffer.from(inflateSync(pdf.subarray(start, end)));
  // PNG predictors: one filter byte per row
  const rowLength = width * colors;
  if (/\/Predictor/.test(dict)) bytes = unfilter(bytes, rowLength, colors, height);
  const rgba = new Uint8ClampedArray(width * height * 4);
  for (let i = 0; i < width * height; i++) {
    const v = colors === 1 ? [bytes[i], bytes[i], bytes[i]] : [bytes[i * 3], bytes[i * 3 + 1], bytes[i * 3 + 2]];
    rgba.set([v[0], v[1], v[2], 255], i * 4);
  }
  return { data: rgba, width, height };
}

function unfilter(data: Buffer, rowLength: number, bpp: number, rows: number): Buffer {
  const out = Buffer.alloc(rowLength * rows);
  for (let y = 0; y < rows; y++) {
    const filter = data[y * (rowLength + 1)];
    for (let x = 0; x < rowLength; x++) {
      const rawByte = data[y * (rowLength + 1) + 1 + x];
      const a = x >= bpp ? out[y * rowLength + x - bpp] : 0;
      const b = y > 0 ? out[(y - 1) * rowLength + x] : 0;
      const c = x >= bpp && y > 0 ? out[(y - 1) * rowLength + x - bpp] : 0;
      let v: number;
      if (filter === 0) v = rawByte;
      else if (filter === 1) v = rawByte + a;
      else if (filter === 2) v = rawByte + b;
      else if (filter === 3) v = rawByte + ((a + b) >> 1);
      else {
        const p = a + b - c;
        const pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
        v = rawByte + (pa <= pb && pa <= pc ? a : pb <= pc ? b : c);
      }
      out[y * rowLength + x] = v & 0xff;
    }
  }
  return out;
}

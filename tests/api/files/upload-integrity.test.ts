import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import sharp from 'sharp';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { Op } from 'sequelize';
import { buildApp } from '../../../server/app.js';
import { Attachment, HistoryEvent } from '../../../server/lib/models.js';
import { bucket, s3 } from '../../../server/lib/storage.js';
import { expireUpload, PENDING_UPLOAD_LIFETIME_MS } from '../../../server/modules/files/service.js';
import { startWorker } from '../../../workers/processors.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeUser } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import { signIn } from '../../helpers/sign-in.js';
import type { AttachmentDto, UploadTicket } from '../../../shared/jobs/dto.js';

/**
 * Attacks on the upload flow, each through the real API, the S3 stand-in and a real worker:
 * replacing a file after it was confirmed, sending more than was announced (also by swapping the
 * object between the API's checks), links that live too long, confirming someone else's upload,
 * and a decompression bomb.
 */
describe('uploads cannot be replaced, oversized, confirmed by others or used as image bombs', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let worker: ReturnType<typeof startWorker>;
  let jobId: string;
  /** A second technician of the same shop, who did not upload what they try to confirm. */
  let otherTech: string;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['technician', 'front_desk', 'regional_manager', 'owner']);
    const colleague = await makeUser(w.network.id, [{ shopId: w.shop.id, role: 'technician' }]);
    otherTech = await signIn(app, colleague.email);
    jobId = (await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'on_bench' })).job.id;
    worker = startWorker(2);
  });
  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  const begin = (cookie: string, body: object) => request(app).post(`/api/jobs/${jobId}/attachments`).set('Cookie', cookie).send(body);
  const put = (ticket: UploadTicket, bytes: Buffer) =>
    fetch(ticket.upload.url, { method: 'PUT', headers: { 'Content-Type': ticket.upload.headers['Content-Type'] }, body: new Uint8Array(bytes) });
  const confirm = (cookie: string, id: string) => request(app).post(`/api/attachments/${id}/confirm`).set('Cookie', cookie);
  const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');
  const md5 = (b: Buffer) => createHash('md5').update(b).digest('hex');
  const solid = (colour: { r: number; g: number; b: number }, width = 800, height = 600) =>
    sharp({ create: { width, height, channels: 3, background: colour } }).jpeg({ quality: 85 }).toBuffer();
  /** Every object in storage whose key names this attachment, wherever the API keeps it. */
  async function objectsOf(attachmentId: string) {
    const keys: string[] = [];
    for (const prefix of [`networks/${w.network.id}/`, `uploads/networks/${w.network.id}/`]) {
      const out = await s3.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix }));
      keys.push(...(out.Contents ?? []).map((o) => o.Key!).filter((k) => k.includes(attachmentId)));
    }
    return keys;
  }
  async function download(cookie: string, id: string) {
    const link = await request(app).get(`/api/attachments/${id}/download`).set('Cookie', cookie).expect(200);
    const res = await fetch(link.body.url);
    expect(res.status).toBe(200);
    return Buffer.from(await res.arrayBuffer());
  }
  async function waitFor<T>(probe: () => Promise<T | null | undefined>, timeoutMs = 15_000): Promise<T> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const value = await probe();
      if (value) return value;
      if (Date.now() > deadline) throw new Error('gave up waiting');
      await new Promise((r) => setTimeout(r, 150));
    }
  }
  /** Mean red and blue of a picture, to tell a red photo from a blue one without trusting any key. */
  async function redAndBlue(bytes: Buffer) {
    const { channels } = await sharp(bytes).stats();
    return { r: channels[0].mean, b: channels[2].mean };
  }

  it('a photo confirmed and then PUT again through its upload link keeps its confirmed bytes, and so does its thumbnail', async () => {
    const red = await solid({ r: 210, g: 30, b: 30 });
    const ticket = (await begin(w.cookies.technician, { kind: 'photo', tag: 'before', contentType: 'image/jpeg', size: red.length }).expect(201)).body as UploadTicket;
    expect((await put(ticket, red)).status).toBe(200);
    await confirm(w.cookies.technician, ticket.attachment.id).expect(200);
    const confirmed = await download(w.cookies.front_desk, ticket.attachment.id);
    expect((await redAndBlue(confirmed)).r).toBeGreaterThan(180);

    // the attacker still holds the link and sends another picture right away, before the thumbnail is made
    const blue = await solid({ r: 30, g: 30, b: 210 });
    await put(ticket, blue);

    const row = await waitFor(async () => {
      const a = await Attachment.findOne({ where: { id: ticket.attachment.id } });
      return a?.thumbnailKey ? a : null;
    });
    const again = await download(w.cookies.front_desk, ticket.attachment.id);
    expect(sha256(again)).toBe(sha256(confirmed));
    // the confirmed size and ETag are on the row (S3's ETag of a single PUT is the MD5 of its bytes)
    expect(Number(row.sizeBytes)).toBe(confirmed.length);
    expect(row.etag?.replace(/"/g, '')).toBe(md5(confirmed));

    const list = await request(app).get(`/api/jobs/${jobId}/attachments`).set('Cookie', w.cookies.front_desk).expect(200);
    const listed = (list.body.attachments as AttachmentDto[]).find((a) => a.id === ticket.attachment.id)!;
    const full = Buffer.from(await (await fetch(listed.url!)).arrayBuffer());
    expect(sha256(full)).toBe(sha256(confirmed));
    const thumb = Buffer.from(await (await fetch(listed.thumbnailUrl!)).arrayBuffer());
    const colour = await redAndBlue(thumb);
    expect(colour.r).toBeGreaterThan(180);
    expect(colour.b).toBeLessThan(70);

    // what the late PUT left under the upload key is cleared by the upload's expiry job; the file stays
    expect((await objectsOf(ticket.attachment.id)).some((k) => k.startsWith('uploads/'))).toBe(true);
    expect(await expireUpload(w.network.id, ticket.attachment.id, new Date(Date.now() + PENDING_UPLOAD_LIFETIME_MS + 1000))).toEqual({ expired: false });
    expect((await objectsOf(ticket.attachment.id)).some((k) => k.startsWith('uploads/'))).toBe(false);
    expect(sha256(await download(w.cookies.front_desk, ticket.attachment.id))).toBe(sha256(confirmed));
  });

  it('a document confirmed and then PUT again through its upload link still downloads as confirmed', async () => {
    const pdf = Buffer.from('%PDF-1.4\n% estimate for job, signed by the band director\n%%EOF\n');
    const ticket = (await begin(w.cookies.front_desk, { kind: 'document', caption: 'Signed estimate', contentType: 'application/pdf', size: pdf.length }).expect(201)).body as UploadTicket;
    await put(ticket, pdf);
    await confirm(w.cookies.front_desk, ticket.attachment.id).expect(200);

    const forged = Buffer.from('%PDF-1.4\n% estimate with another total, not what was signed\n%%EOF\n');
    expect((await put(ticket, forged)).status).toBe(200);
    const got = await download(w.cookies.technician, ticket.attachment.id);
    expect(got.equals(pdf)).toBe(true);
    const row = (await Attachment.findOne({ where: { id: ticket.attachment.id } }))!;
    expect(Number(row.sizeBytes)).toBe(pdf.length);
    expect(row.etag?.replace(/"/g, '')).toBe(md5(pdf));
  });

  it('refuses a file larger than announced — sent so, or swapped in between the checks — and keeps nothing', async () => {
    const big = await sharp({ create: { width: 2400, height: 1700, channels: 3, background: '#000', noise: { type: 'gaussian', mean: 128, sigma: 60 } } })
      .jpeg({ quality: 100 })
      .toBuffer();
    expect(big.length).toBeGreaterThan(5_000_000);

    // announced as 1 KB, sent as several MB
    const t1 = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/jpeg', size: 1024 }).expect(201)).body as UploadTicket;
    expect((await put(t1, big)).status).toBe(200);
    const r1 = await confirm(w.cookies.technician, t1.attachment.id).expect(422);
    expect(r1.body.error.code).toBe('upload_refused');
    expect(r1.body.error.message).toMatch(/1 KB announced/);
    expect(await objectsOf(t1.attachment.id)).toEqual([]);
    expect((await Attachment.findOne({ where: { id: t1.attachment.id } }))!.status).toBe('failed');

    // a small photo that passes the size check, then replaced by the big one before the API reads it
    const small = await solid({ r: 40, g: 160, b: 40 }, 40, 30);
    const t2 = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/jpeg', size: small.length }).expect(201)).body as UploadTicket;
    await put(t2, small);
    let swapped = false;
    s3.middlewareStack.add(
      (next, context) => async (args) => {
        const result = await next(args);
        const key = (args.input as { Key?: string }).Key ?? '';
        if (!swapped && context.commandName === 'HeadObjectCommand' && key.includes(t2.attachment.id)) {
          swapped = true;
          await put(t2, big);
        }
        return result;
      },
      { step: 'initialize', name: 'swapAfterHead' },
    );
    try {
      const r2 = await confirm(w.cookies.technician, t2.attachment.id).expect(422);
      expect(swapped).toBe(true);
      expect(r2.body.error.code).toBe('upload_refused');
      expect(r2.body.error.message).toMatch(/larger than the [\d.]+ KB announced/);
    } finally {
      s3.middlewareStack.remove('swapAfterHead');
    }
    expect(await objectsOf(t2.attachment.id)).toEqual([]);
    expect((await Attachment.findOne({ where: { id: t2.attachment.id } }))!.status).toBe('failed');
    expect(await HistoryEvent.count({ where: { networkId: w.network.id, jobId, kind: 'photo_added' } })).toBe(
      await Attachment.count({ where: { networkId: w.network.id, jobId, kind: 'photo', status: 'stored' } }),
    );
  });

  it('signs upload links for at most two minutes, fresh ones too', async () => {
    const photo = await solid({ r: 90, g: 90, b: 90 }, 200, 150);
    const start = Date.now();
    const ticket = (await begin(w.cookies.technician, { kind: 'photo', tag: 'after', contentType: 'image/jpeg', size: photo.length }).expect(201)).body as UploadTicket;
    const renewed = (await request(app).post(`/api/attachments/${ticket.attachment.id}/upload-url`).set('Cookie', w.cookies.technician).expect(200)).body as UploadTicket;
    for (const t of [ticket, renewed]) {
      const expires = Number(new URL(t.upload.url).searchParams.get('X-Amz-Expires'));
      expect(expires).toBeGreaterThan(0);
      expect(expires).toBeLessThanOrEqual(120);
      expect(new Date(t.upload.expiresAt).getTime() - start).toBeLessThanOrEqual(120_000 + 5_000);
    }
  });

  it('only the uploader or a manager of the shop confirms an upload; a colleague is refused and nothing changes', async () => {
    const pdf = Buffer.from('%PDF-1.4\n% condition report\n%%EOF\n');
    const documentsAdded = () => HistoryEvent.count({ where: { networkId: w.network.id, kind: 'document_added' } });
    const before = await documentsAdded();
    const mine = (await begin(w.cookies.technician, { kind: 'document', contentType: 'application/pdf', size: pdf.length }).expect(201)).body as UploadTicket;
    await put(mine, pdf);

    for (const cookie of [otherTech, w.cookies.front_desk]) {
      const refused = await confirm(cookie, mine.attachment.id).expect(403);
      expect(refused.body.error.message).toMatch(/uploaded this file or a manager of the shop/);
    }
    expect((await Attachment.findOne({ where: { id: mine.attachment.id } }))!.status).toBe('pending');
    expect(await documentsAdded()).toBe(before);
    // nothing was taken from the upload either: its uploader confirms it afterwards
    const done = await confirm(w.cookies.technician, mine.attachment.id).expect(200);
    expect(done.body.attachment.status).toBe('stored');

    // the shop's regional manager and the owner may confirm what a technician left unconfirmed
    for (const cookie of [w.cookies.regional_manager, w.cookies.owner]) {
      const left = (await begin(w.cookies.technician, { kind: 'document', contentType: 'application/pdf', size: pdf.length }).expect(201)).body as UploadTicket;
      await put(left, pdf);
      const byManager = await confirm(cookie, left.attachment.id).expect(200);
      expect(byManager.body.attachment.status).toBe('stored');
    }
  });

  it('refuses a 16000 × 16000 PNG (an image bomb of a few hundred KB) at confirm and keeps nothing', async () => {
    const bomb = await sharp(Buffer.alloc(1, 200), { raw: { width: 1, height: 1, channels: 1 } })
      .resize(16000, 16000, { kernel: 'nearest' })
      .toColourspace('b-w')
      .png({ compressionLevel: 9 })
      .toBuffer();
    expect(bomb.length).toBeLessThan(1024 * 1024);
    const ticket = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', caption: 'Bell flare', contentType: 'image/png', size: bomb.length }).expect(201)).body as UploadTicket;
    await put(ticket, bomb);
    const refused = await confirm(w.cookies.technician, ticket.attachment.id).expect(422);
    expect(refused.body.error.code).toBe('upload_refused');
    expect(refused.body.error.message).toMatch(/more than 40 megapixels/);

    expect(await objectsOf(ticket.attachment.id)).toEqual([]);
    const row = (await Attachment.findOne({ where: { id: ticket.attachment.id } }))!;
    expect(row.status).toBe('failed');
    expect(row.thumbnailKey).toBeNull();
    expect(await HistoryEvent.count({ where: { networkId: w.network.id, kind: 'photo_added', summary: { [Op.like]: '%Bell flare%' } } })).toBe(0);
    const list = await request(app).get(`/api/jobs/${jobId}/attachments`).set('Cookie', w.cookies.technician).expect(200);
    expect((list.body.attachments as AttachmentDto[]).map((a) => a.id)).not.toContain(ticket.attachment.id);
  });
});

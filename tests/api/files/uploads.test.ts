import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import sharp from 'sharp';
import { ListObjectsV2Command } from '@aws-sdk/client-s3';
import { buildApp } from '../../../server/app.js';
import { Attachment, HistoryEvent } from '../../../server/lib/models.js';
import { bucket, getObjectBuffer, headObject, s3 } from '../../../server/lib/storage.js';
import { expireUpload, PENDING_UPLOAD_LIFETIME_MS } from '../../../server/modules/files/service.js';
import { startWorker } from '../../../workers/processors.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import { exifHasGps, photoWithLocation } from '../../helpers/exif.js';
import type { AttachmentDto, UploadTicket } from '../../../shared/jobs/dto.js';
import { PHOTO_MAX_BYTES } from '../../../shared/files/limits.js';

/** The whole upload flow through the real S3 API against the local stand-in, with a real worker. */
describe('photos and documents through presigned uploads', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let other: Awaited<ReturnType<typeof makeBenchWorld>>;
  let worker: ReturnType<typeof startWorker>;
  let jobId: string;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['technician', 'front_desk', 'auditor']);
    other = await makeBenchWorld(app, ['technician']);
    jobId = (await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'on_bench' })).job.id;
    worker = startWorker(2);
  });
  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  const begin = (cookie: string, body: object, job = jobId) =>
    request(app).post(`/api/jobs/${job}/attachments`).set('Cookie', cookie).send(body);
  const put = (ticket: UploadTicket, bytes: Buffer, contentType = ticket.upload.headers['Content-Type']) =>
    fetch(ticket.upload.url, { method: 'PUT', headers: { 'Content-Type': contentType }, body: new Uint8Array(bytes) });
  const confirm = (cookie: string, id: string) => request(app).post(`/api/attachments/${id}/confirm`).set('Cookie', cookie);
  const keyOf = async (id: string) => (await Attachment.findOne({ where: { id } }))!.objectKey;
  /** Where the browser's link writes: a key of its own, apart from the stored file. */
  const uploadKeyOf = async (id: string) => `uploads/${await keyOf(id)}`;
  const goneFromStorage = async (id: string) => (await headObject(await keyOf(id))) === null && (await headObject(await uploadKeyOf(id))) === null;
  const listKeys = async (prefix: string) =>
    ((await s3.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix }))).Contents ?? []).map((o) => o.Key);

  async function waitFor<T>(probe: () => Promise<T | null | undefined>, timeoutMs = 15_000): Promise<T> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const value = await probe();
      if (value) return value;
      if (Date.now() > deadline) throw new Error('gave up waiting');
      await new Promise((r) => setTimeout(r, 150));
    }
  }

  it('stores a good photo without its location, makes a thumbnail in the worker and lists both', async () => {
    const original = await photoWithLocation();
    expect(exifHasGps((await sharp(original).metadata()).exif!)).toBe(true);

    const start = await begin(w.cookies.technician, { kind: 'photo', tag: 'before', caption: 'Low B pad torn', contentType: 'image/jpeg', size: original.length }).expect(201);
    const ticket = start.body as UploadTicket;
    expect(ticket.attachment.status).toBe('pending');
    // the key is the server's: network, job, attachment id — nothing from the client
    const key = await keyOf(ticket.attachment.id);
    expect(key).toBe(`networks/${w.network.id}/jobs/${jobId}/${ticket.attachment.id}/photo.jpg`);
    expect(new URL(ticket.upload.url).origin).toBe(process.env.S3_ENDPOINT);
    // the link writes the upload key only; the stored file's key is out of its reach
    expect(new URL(ticket.upload.url).pathname).toBe(`/${bucket}/uploads/${key}`);

    expect((await put(ticket, original)).status).toBe(200);
    const done = await confirm(w.cookies.technician, ticket.attachment.id).expect(200);
    expect(done.body.attachment).toMatchObject({ status: 'stored', tag: 'before', caption: 'Low B pad torn' });

    const stored = await getObjectBuffer(key);
    const meta = await sharp(stored).metadata();
    expect(meta.exif).toBeUndefined();
    expect(meta.xmp).toBeUndefined();
    expect(meta.format).toBe('jpeg');
    expect([meta.width, meta.height]).toEqual([1600, 1200]);

    const thumbKey = await waitFor(async () => (await Attachment.findOne({ where: { id: ticket.attachment.id } }))!.thumbnailKey);
    expect(thumbKey).toBe(`networks/${w.network.id}/jobs/${jobId}/${ticket.attachment.id}/thumbnail.webp`);
    const thumbMeta = await sharp(await getObjectBuffer(thumbKey)).metadata();
    expect(thumbMeta.format).toBe('webp');
    expect(Math.max(thumbMeta.width, thumbMeta.height)).toBe(480);

    const list = await request(app).get(`/api/jobs/${jobId}/attachments`).set('Cookie', w.cookies.auditor).expect(200);
    const listed = (list.body.attachments as AttachmentDto[]).find((a) => a.id === ticket.attachment.id)!;
    expect(listed).toMatchObject({ kind: 'photo', tag: 'before', status: 'stored', canDelete: false });
    const thumb = await fetch(listed.thumbnailUrl!);
    expect(thumb.status).toBe(200);
    expect(thumb.headers.get('content-type')).toBe('image/webp');
    const full = await fetch(listed.url!);
    expect(Buffer.from(await full.arrayBuffer()).equals(stored)).toBe(true);

    const event = await HistoryEvent.findOne({ where: { networkId: w.network.id, kind: 'photo_added' } });
    expect(event!.summary).toMatch(/before photo added — Low B pad torn/);
    // a repeated confirm is harmless
    await confirm(w.cookies.technician, ticket.attachment.id).expect(200);
  });

  it('refuses an oversize file after the upload and leaves no object behind', async () => {
    const announced = await begin(w.cookies.technician, { kind: 'photo', tag: 'after', contentType: 'image/jpeg', size: PHOTO_MAX_BYTES + 1 }).expect(400);
    expect(announced.body.error.fields.size).toMatch(/15 MB/);

    // the browser claims a small file and then sends a large one: storage takes it, the confirm does not
    const small = await begin(w.cookies.technician, { kind: 'photo', tag: 'after', contentType: 'image/jpeg', size: 1000 }).expect(201);
    const ticket = small.body as UploadTicket;
    expect((await put(ticket, Buffer.alloc(PHOTO_MAX_BYTES + 1024, 7))).status).toBe(200);
    expect(await headObject(await uploadKeyOf(ticket.attachment.id))).not.toBeNull();
    const refused = await confirm(w.cookies.technician, ticket.attachment.id).expect(422);
    expect(refused.body.error).toMatchObject({ code: 'upload_refused' });
    expect(refused.body.error.message).toMatch(/at most 15 MB/);
    expect(await goneFromStorage(ticket.attachment.id)).toBe(true);
    expect((await Attachment.findOne({ where: { id: ticket.attachment.id } }))!.status).toBe('failed');
  });

  it('refuses a wrong type — announced, sent, or hidden in the bytes — and leaves no object behind', async () => {
    const gif = await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/gif', size: 100 }).expect(400);
    expect(gif.body.error.fields.contentType).toMatch(/JPEG, PNG or WebP/);

    // sent with another type than the one signed
    const html = Buffer.from('<html>not a photo</html>');
    const t1 = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/png', size: html.length }).expect(201)).body as UploadTicket;
    await put(t1, html, 'text/html');
    expect((await confirm(w.cookies.technician, t1.attachment.id).expect(422)).body.error.message).toMatch(/JPEG, PNG or WebP/);
    expect(await goneFromStorage(t1.attachment.id)).toBe(true);

    // right header, wrong bytes: a PDF posing as a JPEG
    const pdf = Buffer.from('%PDF-1.7\n1 0 obj << >> endobj\ntrailer << >>\n%%EOF\n');
    const t2 = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/jpeg', size: pdf.length }).expect(201)).body as UploadTicket;
    await put(t2, pdf);
    expect((await confirm(w.cookies.technician, t2.attachment.id).expect(422)).body.error.message).toMatch(/not the photo type/);
    expect(await goneFromStorage(t2.attachment.id)).toBe(true);

    // a "PDF" that is a photo
    const jpeg = await photoWithLocation({ width: 40, height: 30 });
    const t3 = (await begin(w.cookies.front_desk, { kind: 'document', caption: 'Purchase order', contentType: 'application/pdf', size: jpeg.length }).expect(201)).body as UploadTicket;
    await put(t3, jpeg);
    expect((await confirm(w.cookies.front_desk, t3.attachment.id).expect(422)).body.error.message).toMatch(/not a PDF/);
    expect(await goneFromStorage(t3.attachment.id)).toBe(true);
  });

  it('refuses a confirm for another network’s upload, changes nothing, and lets the owner confirm it after', async () => {
    const pdf = Buffer.from('%PDF-1.4\n% condition report\n%%EOF\n');
    const ticket = (await begin(w.cookies.front_desk, { kind: 'document', caption: 'Condition report', contentType: 'application/pdf', size: pdf.length }).expect(201)).body as UploadTicket;
    await put(ticket, pdf);

    await confirm(other.cookies.technician, ticket.attachment.id).expect(404);
    await request(app).post(`/api/attachments/${ticket.attachment.id}/upload-url`).set('Cookie', other.cookies.technician).expect(404);
    await request(app).get(`/api/attachments/${ticket.attachment.id}/download`).set('Cookie', other.cookies.technician).expect(404);
    await request(app).delete(`/api/attachments/${ticket.attachment.id}`).set('Cookie', other.cookies.technician).expect(404);
    await begin(other.cookies.technician, { kind: 'document', contentType: 'application/pdf', size: 10 }).expect(404);
    expect((await Attachment.findOne({ where: { id: ticket.attachment.id } }))!.status).toBe('pending');
    // nothing was written under the other network, in storage or in the table
    expect(await listKeys(`networks/${other.network.id}/`)).toEqual([]);
    expect(await Attachment.count({ where: { networkId: other.network.id } })).toBe(0);

    const mine = await confirm(w.cookies.front_desk, ticket.attachment.id).expect(200);
    expect(mine.body.attachment.status).toBe('stored');
    const link = await request(app).get(`/api/attachments/${ticket.attachment.id}/download`).set('Cookie', w.cookies.auditor).expect(200);
    expect(new URL(link.body.url).searchParams.get('X-Amz-Expires')).toBe('60');
    const file = await fetch(link.body.url);
    expect(file.headers.get('content-disposition')).toMatch(/attachment; filename="job-\d+-document-/);
    expect(Buffer.from(await file.arrayBuffer()).equals(pdf)).toBe(true);
  });

  it('a failed upload can be retried with a fresh link; an abandoned one is cleared away', async () => {
    const photo = await photoWithLocation({ width: 800, height: 600 });
    const ticket = (await begin(w.cookies.technician, { kind: 'photo', tag: 'after', contentType: 'image/jpeg', size: photo.length }).expect(201)).body as UploadTicket;
    // nothing arrived yet (the connection dropped): the confirm says so and keeps the upload open
    const early = await confirm(w.cookies.technician, ticket.attachment.id).expect(409);
    expect(early.body.error.code).toBe('upload_missing');
    // only the uploader retries
    await request(app).post(`/api/attachments/${ticket.attachment.id}/upload-url`).set('Cookie', w.cookies.front_desk).expect(403);
    const retry = (await request(app).post(`/api/attachments/${ticket.attachment.id}/upload-url`).set('Cookie', w.cookies.technician).expect(200)).body as UploadTicket;
    expect(await keyOf(retry.attachment.id)).toBe(await keyOf(ticket.attachment.id));
    expect((await put(retry, photo)).status).toBe(200);
    await confirm(w.cookies.technician, ticket.attachment.id).expect(200);

    const abandoned = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/jpeg', size: photo.length }).expect(201)).body as UploadTicket;
    await put(abandoned, photo);
    const key = await uploadKeyOf(abandoned.attachment.id);
    expect(await headObject(key)).not.toBeNull();
    expect(await expireUpload(w.network.id, abandoned.attachment.id)).toEqual({ expired: false }); // still within its time
    const later = new Date(Date.now() + PENDING_UPLOAD_LIFETIME_MS + 1000);
    expect(await expireUpload(w.network.id, abandoned.attachment.id, later)).toEqual({ expired: true });
    expect(await headObject(key)).toBeNull();
    expect(await Attachment.findOne({ where: { id: abandoned.attachment.id } })).toBeNull();
  });

  it('deleting an attachment removes its objects; auditors and other shops cannot add or delete', async () => {
    const photo = await photoWithLocation({ width: 600, height: 400 });
    const ticket = (await begin(w.cookies.technician, { kind: 'photo', tag: 'detail', contentType: 'image/jpeg', size: photo.length }).expect(201)).body as UploadTicket;
    await put(ticket, photo);
    await confirm(w.cookies.technician, ticket.attachment.id).expect(200);
    const row = await waitFor(async () => {
      const a = await Attachment.findOne({ where: { id: ticket.attachment.id } });
      return a?.thumbnailKey ? a : null;
    });
    await begin(w.cookies.auditor, { kind: 'photo', tag: 'detail', contentType: 'image/jpeg', size: 10 }).expect(403);
    await request(app).delete(`/api/attachments/${row.id}`).set('Cookie', w.cookies.auditor).expect(403);
    // front desk may only take back what they uploaded themselves
    await request(app).delete(`/api/attachments/${row.id}`).set('Cookie', w.cookies.front_desk).expect(403);
    await request(app).delete(`/api/attachments/${row.id}`).set('Cookie', w.cookies.technician).expect(204);
    expect(await headObject(row.objectKey)).toBeNull();
    expect(await headObject(row.thumbnailKey!)).toBeNull();
    expect(await Attachment.findOne({ where: { id: row.id } })).toBeNull();
  });
});

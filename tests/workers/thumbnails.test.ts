import { createHash, randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import type { Worker } from 'bullmq';
import { Attachment } from '../../server/lib/models.js';
import { appQueue } from '../../server/lib/queue.js';
import { getObjectBuffer, headObject, putObject } from '../../server/lib/storage.js';
import { startWorker } from '../../workers/processors.js';
import { closeServerResources } from '../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { waitFor } from '../helpers/transfers.js';

/**
 * The thumbnail job through the real worker on the PostgreSQL queue. It reads a stored photo only in
 * the version confirm recorded and decodes it under the pixel limit. The rows here are written
 * directly, as a photo stored before these checks existed, or an object changed in the bucket
 * behind the API's back, would look.
 */
describe('thumbnails in the worker (PostgreSQL queue)', { timeout: 60_000 }, () => {
  let worker: Worker;
  let place: { networkId: string; shopId: string; userId: string; jobId: string; instrumentId: string };
  const md5 = (b: Buffer) => createHash('md5').update(b).digest('hex');

  beforeAll(async () => {
    const network = await makeNetwork();
    const shop = await makeShop(network.id);
    const tech = await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }]);
    const { job } = await makeInstrumentWithJob(network.id, shop.id, tech.id, { stage: 'on_bench' });
    place = { networkId: network.id, shopId: shop.id, userId: tech.id, jobId: job.id, instrumentId: job.instrumentId };
    worker = startWorker(4);
  });
  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  /** A stored photo row whose object holds `bytes`; size and ETag as given (defaults: those of `bytes`). */
  async function storedPhoto(bytes: Buffer, contentType: string, recorded: { sizeBytes?: number; etag?: string | null } = {}) {
    const id = randomUUID();
    const objectKey = `networks/${place.networkId}/jobs/${place.jobId}/${id}/photo.${contentType === 'image/png' ? 'png' : 'jpg'}`;
    await putObject(objectKey, bytes, contentType);
    return Attachment.create({
      id, networkId: place.networkId, jobId: place.jobId, instrumentId: place.instrumentId, shopId: place.shopId, kind: 'photo', tag: 'detail',
      objectKey, contentType, sizeBytes: recorded.sizeBytes ?? bytes.length, etag: recorded.etag === undefined ? md5(bytes) : recorded.etag,
      status: 'stored', uploadedByUserId: place.userId,
    });
  }

  async function runThumbnail(attachmentId: string) {
    const job = await appQueue().add('make-thumbnail', { networkId: place.networkId, attachmentId }, { jobId: `thumbnail-${attachmentId}-${uniq()}`, attempts: 4 });
    return waitFor(async () => {
      const state = await job.getState();
      if (state !== 'completed' && state !== 'failed') return null;
      const finished = (await appQueue().getJob(job.id!))!;
      return { state, result: finished.returnvalue as { thumbnailKey: string | null; refused?: string } | null, attempts: finished.attemptsMade };
    }, 'the thumbnail job to finish');
  }
  const thumbnailOf = (a: Attachment) => a.objectKey.replace(/[^/]+$/, 'thumbnail.webp');

  it('makes a thumbnail of a photo that is the version confirmed', async () => {
    const photo = await sharp({ create: { width: 1200, height: 800, channels: 3, background: { r: 20, g: 120, b: 200 } } }).jpeg().toBuffer();
    const a = await storedPhoto(photo, 'image/jpeg');
    const run = await runThumbnail(a.id);
    expect(run).toMatchObject({ state: 'completed', result: { thumbnailKey: thumbnailOf(a) } });
    const meta = await sharp(await getObjectBuffer(thumbnailOf(a))).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['webp', 480, 320]);
  });

  it('refuses an image bomb stored before the pixel limit, once, without a thumbnail', async () => {
    const bomb = await sharp(Buffer.alloc(1, 200), { raw: { width: 1, height: 1, channels: 1 } })
      .resize(16000, 16000, { kernel: 'nearest' })
      .toColourspace('b-w')
      .png({ compressionLevel: 9 })
      .toBuffer();
    const a = await storedPhoto(bomb, 'image/png', { etag: null });
    const run = await runThumbnail(a.id);
    expect(run.state).toBe('completed');
    expect(run.attempts).toBe(1);
    expect(run.result).toEqual({ thumbnailKey: null, refused: expect.stringMatching(/more than 40 megapixels/) });
    expect(await headObject(thumbnailOf(a))).toBeNull();
    expect((await Attachment.findByPk(a.id))!.thumbnailKey).toBeNull();
  });

  it('reads no more than the confirmed size, and no other version than the confirmed one', async () => {
    const small = await sharp({ create: { width: 300, height: 200, channels: 3, background: '#b4860b' } }).jpeg().toBuffer();
    const bigger = await sharp({ create: { width: 1600, height: 1200, channels: 3, background: '#202020', noise: { type: 'gaussian', mean: 100, sigma: 40 } } })
      .jpeg()
      .toBuffer();
    // confirmed as the small photo, then the object was overwritten in the bucket with a larger one
    const grown = await storedPhoto(bigger, 'image/jpeg', { sizeBytes: small.length, etag: md5(small) });
    // same size cap satisfied, other bytes
    const swapped = await storedPhoto(small, 'image/jpeg', { sizeBytes: bigger.length, etag: md5(bigger) });
    for (const a of [grown, swapped]) {
      const run = await runThumbnail(a.id);
      expect(run).toMatchObject({ state: 'completed', result: { thumbnailKey: null, refused: 'The stored file is not the one that was confirmed.' } });
      expect(await headObject(thumbnailOf(a))).toBeNull();
    }
  });
});

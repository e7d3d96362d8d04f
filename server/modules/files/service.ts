import { randomUUID } from 'node:crypto';
import { subject } from '@casl/ability';
import { GetObjectCommand } from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { Op } from 'sequelize';
import { Attachment, Instrument, Job, User, sequelize } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { appendHistory } from '../registry/index.js';
import { AppError, conflict, forbidden, notFound } from '../../lib/errors.js';
import { logger } from '../../lib/logger.js';
import { enqueue } from '../../lib/queue-jobs.js';
import { isPixelLimitError, oneImageAtATime, openImage } from '../../lib/images.js';
import {
  bucket,
  copyObject,
  deleteObject,
  getObjectCapped,
  headObject,
  ObjectChangedError,
  ObjectTooLargeError,
  presignPut,
  putObject,
  s3,
} from '../../lib/storage.js';
import {
  EXTENSION_BY_TYPE,
  limitFor,
  PHOTO_MAX_PIXELS,
  PHOTO_TAG_LABELS,
  type AttachmentCreate,
  type DocumentType,
  type PhotoTag,
  type PhotoType,
} from '../../../shared/files/limits.js';
import type { AttachmentDto, UploadTicket } from '../../../shared/jobs/dto.js';

/**
 * Photos and documents: the browser uploads straight to object storage with a presigned PUT, then
 * asks the API to confirm. Storage enforces neither size nor type (the local stand-in does not even
 * check signatures), so confirming is where the rules hold: HeadObject for size and type, the bytes
 * themselves (never more than were announced) for what the file really is, and for photos a re-encode
 * that drops location and every other embedded metadata, with a pixel limit against image bombs.
 *
 * The browser uploads to an *upload key* (`uploads/…`); confirm writes what it checked to the
 * attachment's *object key*, which no upload link names, records the stored size and ETag, and
 * deletes the upload key. A link that is still valid after confirm can therefore only write to the
 * upload key again, which nothing reads and the expiry job clears. Every later read (the thumbnail)
 * is capped at the recorded size and pinned to the recorded ETag. Whatever fails is deleted.
 */

/** Long enough to start a phone's upload; a dropped one asks for a fresh link (renewUpload). */
export const UPLOAD_URL_SECONDS = 2 * 60;
const VIEW_URL_SECONDS = 10 * 60;
const DOWNLOAD_URL_SECONDS = 60;
export const THUMBNAIL_MAX_PX = 480;

const SHARP_FORMAT: Record<PhotoType, 'jpeg' | 'png' | 'webp'> = {
  'image/jpeg': 'jpeg',
  'image/png': 'png',
  'image/webp': 'webp',
};

/** Keys are made here from ids only (never from a file name) and always start with the network. */
export function objectKeyFor(a: { networkId: string; jobId: string; id: string; kind: 'photo' | 'document'; contentType: string }) {
  const ext = EXTENSION_BY_TYPE[a.contentType as PhotoType | DocumentType];
  return `networks/${a.networkId}/jobs/${a.jobId}/${a.id}/${a.kind}.${ext}`;
}
export const thumbnailKeyFor = (objectKey: string) => objectKey.replace(/\/[^/]+$/, '/thumbnail.webp');
/**
 * Where the browser's presigned PUT writes. A prefix of its own keeps it apart from stored files, and
 * lets a bucket lifecycle rule clear forgotten uploads without touching them.
 */
export const uploadKeyFor = (objectKey: string) => `uploads/${objectKey}`;

const rowOf = (a: Attachment) => a.get({ plain: true }) as unknown as Record<string, unknown>;

async function signedGet(key: string, seconds: number, downloadName?: string) {
  return getSignedUrl(
    s3,
    new GetObjectCommand({
      Bucket: bucket,
      Key: key,
      ...(downloadName ? { ResponseContentDisposition: `attachment; filename="${downloadName}"` } : {}),
    }),
    { expiresIn: seconds },
  );
}

async function toDto(actor: Actor, a: Attachment, jobNumber: number | null): Promise<AttachmentDto> {
  const stored = a.status === 'stored';
  const photo = a.kind === 'photo';
  return {
    id: a.id,
    kind: a.kind,
    tag: a.tag ?? null,
    caption: a.caption ?? null,
    contentType: a.contentType,
    sizeBytes: a.sizeBytes,
    status: a.status,
    jobId: a.jobId ?? null,
    jobNumber,
    instrumentId: a.instrumentId,
    uploadedBy: a.uploadedBy ? { id: a.uploadedBy.id, name: a.uploadedBy.name } : null,
    createdAt: new Date(a.createdAt).toISOString(),
    url: stored && photo ? await signedGet(a.objectKey, VIEW_URL_SECONDS) : null,
    thumbnailUrl: stored && photo && a.thumbnailKey ? await signedGet(a.thumbnailKey, VIEW_URL_SECONDS) : null,
    canDelete: actor.ability.can('delete', subject('Attachment', rowOf(a))),
  };
}

async function readableJob(actor: Actor, jobId: string) {
  const job = await Job.findOne({ where: { networkId: actor.networkId, id: jobId } });
  if (!job || !actor.ability.can('read', subject('Job', job.get({ plain: true }) as Record<string, unknown>))) {
    throw notFound('That job');
  }
  return job;
}

async function findAttachment(actor: Actor, id: string) {
  const a = await Attachment.findOne({
    where: { networkId: actor.networkId, id },
    include: [{ model: User, as: 'uploadedBy', attributes: ['id', 'name'] }],
  });
  if (!a) throw notFound('That file');
  return a;
}

async function ticketFor(actor: Actor, a: Attachment, jobNumber: number): Promise<UploadTicket> {
  const url = await presignPut(uploadKeyFor(a.objectKey), a.contentType, UPLOAD_URL_SECONDS);
  return {
    attachment: await toDto(actor, a, jobNumber),
    upload: {
      url,
      method: 'PUT',
      // part of the signature: the browser must send exactly this
      headers: { 'Content-Type': a.contentType },
      expiresAt: new Date(Date.now() + UPLOAD_URL_SECONDS * 1000).toISOString(),
    },
  };
}

/** Step 1: a pending row and a presigned PUT for a key the server chose. */
export async function createUpload(actor: Actor, jobId: string, input: AttachmentCreate): Promise<UploadTicket> {
  const job = await readableJob(actor, jobId);
  assertCan(actor.ability, 'create', 'Attachment', { shopId: job.shopId }, 'You cannot add files to jobs at this shop.');
  if (job.stage === 'released') throw conflict('This job has been released; add files to a new visit.');
  const id = randomUUID();
  const a = await Attachment.create({
    id,
    networkId: actor.networkId,
    jobId: job.id,
    instrumentId: job.instrumentId,
    shopId: job.shopId,
    kind: input.kind,
    tag: input.kind === 'photo' ? input.tag : null,
    caption: input.caption || null,
    objectKey: objectKeyFor({ networkId: actor.networkId, jobId: job.id, id, kind: input.kind, contentType: input.contentType }),
    contentType: input.contentType,
    sizeBytes: input.size,
    uploadedByUserId: actor.id,
  });
  await queueUploadExpiry(a);
  return ticketFor(actor, a, job.number);
}

/** How long an unconfirmed upload may sit before its object and row are cleared away. */
export const PENDING_UPLOAD_LIFETIME_MS = (UPLOAD_URL_SECONDS + 15 * 60) * 1000;

async function queueUploadExpiry(a: Attachment) {
  try {
    await enqueue('expire-upload', { networkId: a.networkId, attachmentId: a.id }, {
      // one check per issued link: a renewed link gets its own, later check
      jobId: `expire-upload-${a.id}-${new Date(a.updatedAt).getTime()}`,
      delay: PENDING_UPLOAD_LIFETIME_MS,
      attempts: 3,
      backoff: { type: 'exponential', delay: 5000 },
      removeOnComplete: 1000,
    });
  } catch (err) {
    logger.warn({ err: (err as Error).message, attachmentId: a.id }, 'could not schedule the clean-up of an upload');
  }
}

/**
 * Worker step: an upload nobody confirmed in time (the phone lost its connection for good, the page
 * was closed) loses its object and its row, so storage keeps nothing the API never checked.
 */
export async function expireUpload(networkId: string, attachmentId: string, now = new Date()): Promise<{ expired: boolean }> {
  const a = await Attachment.findOne({ where: { networkId, id: attachmentId } });
  if (!a) return { expired: false };
  if (a.status === 'stored') {
    // a link still valid after confirm may have written the upload key again; the stored file stays
    await deleteObject(uploadKeyFor(a.objectKey));
    return { expired: false };
  }
  if (a.status === 'pending' && new Date(a.updatedAt).getTime() + PENDING_UPLOAD_LIFETIME_MS > now.getTime()) return { expired: false };
  await deleteObject(uploadKeyFor(a.objectKey));
  await deleteObject(a.objectKey);
  await a.destroy();
  return { expired: true };
}

/** A fresh PUT link for an upload that has not been confirmed (the connection dropped, the link expired). */
export async function renewUpload(actor: Actor, attachmentId: string): Promise<UploadTicket> {
  const a = await findAttachment(actor, attachmentId);
  assertCan(actor.ability, 'create', 'Attachment', rowOf(a), 'You cannot add files at this shop.');
  if (a.uploadedByUserId !== actor.id) throw forbidden('Only the person who started this upload can retry it.');
  if (a.status !== 'pending') throw conflict(a.status === 'stored' ? 'This file is already stored.' : 'This upload was refused; start a new one.');
  const job = await Job.findOne({ where: { networkId: actor.networkId, id: a.jobId! } });
  // a new link restarts the clock on the clean-up
  a.changed('updatedAt', true);
  await a.save();
  await queueUploadExpiry(a);
  return ticketFor(actor, a, job?.number ?? 0);
}

async function refuse(a: Attachment, message: string): Promise<never> {
  for (const key of [uploadKeyFor(a.objectKey), a.objectKey]) {
    await deleteObject(key).catch((err: Error) => logger.warn({ err: err.message, key }, 'could not delete a refused upload'));
  }
  await a.update({ status: 'failed' });
  throw new AppError(422, 'upload_refused', message);
}

/** The first bytes of an object, without downloading all of it. */
async function firstBytes(key: string, count: number): Promise<Buffer> {
  const out = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key, Range: `bytes=0-${count - 1}` }));
  return Buffer.from((await out.Body?.transformToByteArray()) ?? []).subarray(0, count);
}

const sizeText = (n: number) => (n < 1024 * 1024 ? `${Math.max(1, Math.round(n / 1024))} KB` : `${(n / 1024 / 1024).toFixed(1)} MB`);
const largerThanAnnounced = (a: Attachment) => `The file in storage is larger than the ${sizeText(a.sizeBytes)} announced; upload it again.`;
const TOO_MANY_PIXELS = `That photo has more than ${PHOTO_MAX_PIXELS / 1_000_000} megapixels. Set the camera to a lower resolution or pick a smaller copy, then add it again.`;

/**
 * A photo as the person will see it: the bytes read from the upload key (never more than were
 * announced) checked for their real format and pixel count, turned upright and re-encoded without
 * metadata, or the reason it is refused.
 */
async function cleanPhoto(a: Attachment, original: Buffer): Promise<{ clean: Buffer } | { refused: string }> {
  return oneImageAtATime(async () => {
    let format: string | undefined;
    try {
      format = (await openImage(original).metadata()).format;
    } catch (err) {
      if (isPixelLimitError(err)) return { refused: TOO_MANY_PIXELS };
      format = undefined;
    }
    if (format !== SHARP_FORMAT[a.contentType as PhotoType]) return { refused: 'That file is not the photo type it claims to be.' };
    // Re-encoding without withMetadata() drops EXIF (location included), XMP and IPTC; rotate() first
    // turns the picture upright, since the orientation tag goes with the rest.
    try {
      const clean = await openImage(original, { failOn: 'error' })
        .rotate()
        .toFormat(SHARP_FORMAT[a.contentType as PhotoType], { quality: 90 })
        .toBuffer();
      return { clean };
    } catch (err) {
      if (isPixelLimitError(err)) return { refused: TOO_MANY_PIXELS };
      return { refused: 'That photo could not be read. Take it again or pick another file.' };
    }
  });
}

/**
 * Step 2: the browser says the PUT finished. Checks the upload as storage holds it and either writes
 * it to the attachment's object key (photos re-encoded without metadata, a thumbnail queued) or
 * deletes it and refuses. Only the uploader, or a manager of the shop, confirms.
 */
export async function confirmUpload(actor: Actor, attachmentId: string): Promise<AttachmentDto> {
  const a = await findAttachment(actor, attachmentId);
  assertCan(actor.ability, 'create', 'Attachment', rowOf(a), 'You cannot add files at this shop.');
  assertCan(actor.ability, 'confirm', 'Attachment', rowOf(a), 'Only the person who uploaded this file or a manager of the shop can confirm it.');
  const job = await Job.findOne({ where: { networkId: actor.networkId, id: a.jobId! } });
  if (a.status === 'stored') return toDto(actor, a, job?.number ?? null); // a repeated confirm changes nothing
  if (a.status === 'failed') throw conflict('This upload was refused; start a new one.');

  const uploadKey = uploadKeyFor(a.objectKey);
  const announced = a.sizeBytes;
  const head = await headObject(uploadKey);
  if (!head) throw new AppError(409, 'upload_missing', 'The file has not arrived in storage yet. Retry the upload.');
  const { types, maxBytes } = limitFor(a.kind);
  if (head.size > maxBytes) await refuse(a, `The file is ${sizeText(head.size)}; ${a.kind}s may be at most ${maxBytes / 1024 / 1024} MB.`);
  if (head.size > announced) await refuse(a, largerThanAnnounced(a));
  if (head.size !== announced) await refuse(a, `The file in storage is ${sizeText(head.size)}, not the ${sizeText(announced)} announced; upload it again.`);
  if (!head.contentType || !types.includes(head.contentType) || head.contentType !== a.contentType) {
    await refuse(a, a.kind === 'photo' ? 'Photos must be JPEG, PNG or WebP.' : 'Documents must be PDF files.');
  }

  if (a.kind === 'photo') {
    // the bytes checked are the bytes stored: read once, capped at what was announced
    let original: Buffer;
    try {
      original = (await getObjectCapped(uploadKey, announced)).body;
    } catch (err) {
      if (err instanceof ObjectTooLargeError) return refuse(a, largerThanAnnounced(a));
      throw err;
    }
    if (original.length !== announced) await refuse(a, 'The file changed in storage while it was being checked; upload it again.');
    const photo = await cleanPhoto(a, original);
    if ('refused' in photo) return refuse(a, photo.refused);
    await putObject(a.objectKey, photo.clean, a.contentType);
  } else {
    // storage copies the version that was checked (If-Match); the copy is checked again below
    try {
      await copyObject(uploadKey, a.objectKey, { ifMatch: head.etag });
    } catch (err) {
      if (err instanceof ObjectChangedError) return refuse(a, 'The file changed in storage while it was being checked; upload it again.');
      throw err;
    }
  }

  // From here on only the object key counts: no upload link can write it.
  const stored = await headObject(a.objectKey);
  if (!stored) throw new Error(`Object ${a.objectKey} vanished right after it was written`);
  if (a.kind === 'document') {
    if (stored.size > announced) await refuse(a, largerThanAnnounced(a));
    if (stored.size !== announced || stored.etag !== head.etag) await refuse(a, 'The file changed in storage while it was being checked; upload it again.');
    const magic = await firstBytes(a.objectKey, 5);
    if (magic.toString('latin1') !== '%PDF-') await refuse(a, 'That file is not a PDF document.');
  }
  await deleteObject(uploadKey);

  const confirmed = await sequelize.transaction(async (transaction) => {
    // one confirm wins when two arrive together (a double tap): only it writes the history
    const [count] = await Attachment.update(
      { status: 'stored', sizeBytes: stored.size, etag: stored.etag ?? null },
      { where: { networkId: a.networkId, id: a.id, status: 'pending' }, transaction },
    );
    if (count === 0) return false;
    const tag: PhotoTag = a.tag ?? 'detail';
    const what = a.kind === 'photo' ? `${PHOTO_TAG_LABELS[tag].toLowerCase()} photo` : 'document';
    await appendHistory(
      {
        networkId: a.networkId,
        instrumentId: a.instrumentId,
        jobId: a.jobId,
        shopId: a.shopId,
        userId: actor.id,
        kind: a.kind === 'photo' ? 'photo_added' : 'document_added',
        summary: `${job ? `Job ${job.number}: ` : ''}${what} added${a.caption ? ` — ${a.caption}` : ''}`,
        data: { attachmentId: a.id, tag: a.tag ?? null },
      },
      transaction,
    );
    return true;
  });
  if (confirmed && a.kind === 'photo') await queueThumbnail(a.networkId, a.id);
  await a.reload();
  return toDto(actor, a, job?.number ?? null);
}

export const thumbnailJobId = (attachmentId: string) => `thumbnail-${attachmentId}`;

async function queueThumbnail(networkId: string, attachmentId: string) {
  try {
    await enqueue('make-thumbnail', { networkId, attachmentId }, {
      jobId: thumbnailJobId(attachmentId),
      attempts: 4,
      backoff: { type: 'exponential', delay: 1000 },
      removeOnComplete: 1000,
    });
  } catch (err) {
    // the photo is stored and shown full size; only its small copy is missing
    logger.warn({ err: (err as Error).message, attachmentId }, 'could not queue a thumbnail');
  }
}

export type ThumbnailResult = { thumbnailKey: string } | { thumbnailKey: null; refused: string } | null;

/**
 * Worker step: a small WebP copy for lists. Repeating it rewrites the same object. It reads the
 * stored object only in the version confirm recorded (size cap and ETag), and decodes it under the
 * pixel limit, one picture at a time. A picture it refuses keeps its full-size view, without a
 * thumbnail; retrying could not change the answer, so it is not retried.
 */
export async function makeThumbnail(networkId: string, attachmentId: string): Promise<ThumbnailResult> {
  const a = await Attachment.findOne({ where: { networkId, id: attachmentId } });
  if (!a || a.kind !== 'photo' || a.status !== 'stored') return null;
  const key = thumbnailKeyFor(a.objectKey);
  let original: Buffer;
  try {
    original = (await getObjectCapped(a.objectKey, a.sizeBytes, { etag: a.etag ?? undefined })).body;
  } catch (err) {
    if (err instanceof ObjectTooLargeError || err instanceof ObjectChangedError) {
      logger.error({ attachmentId, key: a.objectKey, err: err.message }, 'a stored photo is not the version that was confirmed; no thumbnail made');
      return { thumbnailKey: null, refused: 'The stored file is not the one that was confirmed.' };
    }
    throw err;
  }
  let thumb: Buffer;
  try {
    thumb = await oneImageAtATime(() =>
      openImage(original)
        .rotate()
        .resize({ width: THUMBNAIL_MAX_PX, height: THUMBNAIL_MAX_PX, fit: 'inside', withoutEnlargement: true })
        .webp({ quality: 78 })
        .toBuffer(),
    );
  } catch (err) {
    const refused = isPixelLimitError(err) ? TOO_MANY_PIXELS : 'That photo could not be read.';
    logger.warn({ attachmentId, err: (err as Error).message }, 'no thumbnail made for a stored photo');
    return { thumbnailKey: null, refused };
  }
  await putObject(key, thumb, 'image/webp');
  await Attachment.update({ thumbnailKey: key }, { where: { networkId, id: attachmentId } });
  return { thumbnailKey: key };
}

function readableAttachmentsWhere(actor: Actor) {
  return accessibleWhere(actor.ability, 'read', 'Attachment');
}

export async function listJobAttachments(actor: Actor, jobId: string): Promise<{ attachments: AttachmentDto[] }> {
  const job = await readableJob(actor, jobId);
  const where = readableAttachmentsWhere(actor);
  if (!where) return { attachments: [] };
  const rows = await Attachment.findAll({
    where: { [Op.and]: [{ networkId: actor.networkId, jobId: job.id, status: 'stored' }, where] },
    include: [{ model: User, as: 'uploadedBy', attributes: ['id', 'name'] }],
    order: [['createdAt', 'ASC']],
  });
  return { attachments: await Promise.all(rows.map((r) => toDto(actor, r, job.number))) };
}

/** Every stored photo of an instrument across its visits, for the before/after view on its page. */
export async function listInstrumentPhotos(actor: Actor, instrumentId: string): Promise<{ attachments: AttachmentDto[] }> {
  const instrument = await Instrument.findOne({ where: { networkId: actor.networkId, id: instrumentId } });
  if (!instrument || !actor.ability.can('read', subject('Instrument', instrument.get({ plain: true }) as Record<string, unknown>))) {
    throw notFound('That instrument');
  }
  const where = readableAttachmentsWhere(actor);
  if (!where) return { attachments: [] };
  const rows = await Attachment.findAll({
    where: { [Op.and]: [{ networkId: actor.networkId, instrumentId, kind: 'photo', status: 'stored' }, where] },
    include: [
      { model: User, as: 'uploadedBy', attributes: ['id', 'name'] },
      { model: Job, as: 'job', attributes: ['id', 'number'] },
    ],
    order: [['createdAt', 'ASC']],
  });
  return { attachments: await Promise.all(rows.map((r) => toDto(actor, r, r.job?.number ?? null))) };
}

/** A short-lived link that downloads the file under a readable name. */
export async function downloadLink(actor: Actor, attachmentId: string): Promise<{ url: string; expiresAt: string }> {
  const a = await findAttachment(actor, attachmentId);
  if (!actor.ability.can('read', subject('Attachment', rowOf(a)))) throw notFound('That file');
  if (a.status !== 'stored') throw conflict('This file is not stored yet.');
  const job = a.jobId ? await Job.findOne({ where: { networkId: actor.networkId, id: a.jobId } }) : null;
  const ext = EXTENSION_BY_TYPE[a.contentType as PhotoType | DocumentType];
  const name = `${job ? `job-${job.number}-` : ''}${a.kind}-${a.id.slice(0, 8)}.${ext}`;
  return {
    url: await signedGet(a.objectKey, DOWNLOAD_URL_SECONDS, name),
    expiresAt: new Date(Date.now() + DOWNLOAD_URL_SECONDS * 1000).toISOString(),
  };
}

/** Removes the row and its objects (the file and its thumbnail). */
export async function deleteAttachment(actor: Actor, attachmentId: string): Promise<void> {
  const a = await findAttachment(actor, attachmentId);
  if (!actor.ability.can('read', subject('Attachment', rowOf(a)))) throw notFound('That file');
  assertCan(actor.ability, 'delete', 'Attachment', rowOf(a), 'You cannot remove this file.');
  const keys = [a.objectKey, a.thumbnailKey ?? thumbnailKeyFor(a.objectKey), uploadKeyFor(a.objectKey)];
  await sequelize.transaction(async (transaction) => {
    await a.destroy({ transaction });
    if (a.status === 'stored') {
      const job = a.jobId ? await Job.findOne({ where: { networkId: actor.networkId, id: a.jobId }, transaction }) : null;
      await appendHistory(
        {
          networkId: a.networkId,
          instrumentId: a.instrumentId,
          jobId: a.jobId,
          shopId: a.shopId,
          userId: actor.id,
          kind: 'attachment_removed',
          summary: `${job ? `Job ${job.number}: ` : ''}${a.kind} removed${a.caption ? ` — ${a.caption}` : ''}`,
          data: { attachmentId: a.id },
        },
        transaction,
      );
    }
  });
  // after the row is gone, so a failure here leaves an orphan object rather than a row without a file
  for (const key of keys) await deleteObject(key);
}

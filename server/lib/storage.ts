import type { Readable } from 'node:stream';
import {
  CopyObjectCommand,
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { config, type Config } from '../config.js';

const CHECK_TIMEOUT_MS = 2000;

export interface ObjectInfo {
  size: number;
  contentType: string | undefined;
  /** Without quotes. For an object written in one PUT (or copied from one), the MD5 of its bytes. */
  etag: string | undefined;
}

/** The object holds more bytes than the reader allowed; nothing past the limit was read. */
export class ObjectTooLargeError extends Error {
  constructor(readonly key: string, readonly limit: number) {
    super(`Object ${key} is larger than ${limit} bytes`);
    this.name = 'ObjectTooLargeError';
  }
}

/** The object is not the version the reader expected (its ETag differs). */
export class ObjectChangedError extends Error {
  constructor(readonly key: string) {
    super(`Object ${key} changed`);
    this.name = 'ObjectChangedError';
  }
}

/** Object storage did not answer (refused or dropped connection, timeout): the API answers 503. */
export class StorageUnavailableError extends Error {
  constructor(cause: unknown) {
    super(`Object storage is not reachable: ${(cause as Error)?.message ?? String(cause)}`);
    this.name = 'StorageUnavailableError';
  }
}

const NETWORK_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND', 'EPIPE', 'EAI_AGAIN']);

function isNetworkFailure(err: unknown): boolean {
  const e = err as { code?: unknown; name?: string; errors?: Array<{ code?: unknown }>; cause?: { code?: unknown } } | null;
  if (!e) return false;
  const codes = [e.code, e.cause?.code, ...(e.errors ?? []).map((inner) => inner.code)];
  return codes.some((c) => typeof c === 'string' && NETWORK_CODES.has(c)) || e.name === 'TimeoutError';
}

const unquote = (etag: string | undefined) => etag?.replace(/"/g, '');

/** A storage client bound to one S3 configuration; the module exports one bound to `config.s3`. */
export function createStorage(s3Config: Config['s3']) {
  const s3 = new S3Client({
    endpoint: s3Config.endpoint,
    region: s3Config.region,
    forcePathStyle: s3Config.forcePathStyle,
    credentials: { accessKeyId: s3Config.accessKeyId, secretAccessKey: s3Config.secretAccessKey },
    // Newer SDKs add CRC checksums (and aws-chunked bodies) to every upload, which neither
    // s3rver nor a browser holding a presigned URL can produce; send them only where S3 demands.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  const bucket = s3Config.bucket;
  const rawSend = s3.send.bind(s3);
  // every call goes through here, so a storage outage is one recognisable error wherever it happens
  const s3send: typeof rawSend = (async (...args: Parameters<typeof rawSend>) => {
    try {
      // with no callback, send returns a Promise; lint reads the callback overload, which returns void
      // eslint-disable-next-line @typescript-eslint/await-thenable -- see the line above
      return await rawSend(...args);
    } catch (err) {
      throw isNetworkFailure(err) ? new StorageUnavailableError(err) : err;
    }
  }) as typeof rawSend;

  async function putObject(key: string, body: Buffer | Uint8Array | string, contentType: string) {
    await s3send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType }));
  }

  async function getObjectBuffer(key: string): Promise<Buffer> {
    const out = await s3send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    if (!out.Body) throw new Error(`Object ${key} has no body`);
    return Buffer.from(await out.Body.transformToByteArray());
  }

  /**
   * The object's bytes, refusing to read more than `maxBytes` (ObjectTooLargeError) and, with `etag`,
   * any other version of it (ObjectChangedError). Storage is asked for that version with If-Match and
   * the answer's ETag is checked again, since not every S3-compatible server honours the condition.
   */
  async function getObjectCapped(key: string, maxBytes: number, opts: { etag?: string } = {}): Promise<{ body: Buffer; etag: string | undefined }> {
    const expected = unquote(opts.etag);
    let out;
    try {
      out = await s3send(new GetObjectCommand({ Bucket: bucket, Key: key, ...(expected ? { IfMatch: `"${expected}"` } : {}) }));
    } catch (err) {
      if (err instanceof S3ServiceException && (err.name === 'PreconditionFailed' || err.$metadata.httpStatusCode === 412)) {
        throw new ObjectChangedError(key);
      }
      throw err;
    }
    const stream = out.Body as Readable | undefined;
    if (!stream) throw new Error(`Object ${key} has no body`);
    try {
      if (expected && unquote(out.ETag) !== expected) throw new ObjectChangedError(key);
      if ((out.ContentLength ?? 0) > maxBytes) throw new ObjectTooLargeError(key, maxBytes);
      const chunks: Buffer[] = [];
      let total = 0;
      for await (const chunk of stream) {
        total += (chunk as Buffer).length;
        // a server may send more than its Content-Length said, or none at all
        if (total > maxBytes) throw new ObjectTooLargeError(key, maxBytes);
        chunks.push(chunk as Buffer);
      }
      return { body: Buffer.concat(chunks, total), etag: unquote(out.ETag) };
    } finally {
      // stops the transfer of whatever was not read
      stream.destroy();
    }
  }

  /**
   * Server-side copy. With `ifMatch`, storage copies only that version of the source; callers check
   * the copy's HeadObject as well, since not every S3-compatible server honours the condition.
   */
  async function copyObject(fromKey: string, toKey: string, opts: { ifMatch?: string } = {}) {
    const expected = unquote(opts.ifMatch);
    try {
      await s3send(
        new CopyObjectCommand({
          Bucket: bucket,
          Key: toKey,
          CopySource: `${bucket}/${fromKey.split('/').map(encodeURIComponent).join('/')}`,
          ...(expected ? { CopySourceIfMatch: `"${expected}"` } : {}),
        }),
      );
    } catch (err) {
      if (err instanceof S3ServiceException && (err.name === 'PreconditionFailed' || err.$metadata.httpStatusCode === 412)) {
        throw new ObjectChangedError(fromKey);
      }
      throw err;
    }
  }

  /** Size, type and ETag as storage recorded them, or null when there is no such object. */
  async function headObject(key: string): Promise<ObjectInfo | null> {
    try {
      const out = await s3send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
      return { size: out.ContentLength ?? 0, contentType: out.ContentType, etag: unquote(out.ETag) };
    } catch (err) {
      if (isNotFound(err)) return null;
      throw err;
    }
  }

  async function deleteObject(key: string) {
    await s3send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
  }

  /** The uploader must send exactly this Content-Type: it is part of the signature. */
  function presignPut(key: string, contentType: string, expiresSeconds = 300) {
    return getSignedUrl(s3, new PutObjectCommand({ Bucket: bucket, Key: key, ContentType: contentType }), {
      expiresIn: expiresSeconds,
    });
  }

  function presignGet(key: string, expiresSeconds = 300) {
    return getSignedUrl(s3, new GetObjectCommand({ Bucket: bucket, Key: key }), { expiresIn: expiresSeconds });
  }

  /** True when the bucket answers within about two seconds; never throws. */
  async function checkStorage(): Promise<boolean> {
    try {
      await s3send(new HeadBucketCommand({ Bucket: bucket }), { abortSignal: AbortSignal.timeout(CHECK_TIMEOUT_MS) });
      return true;
    } catch {
      return false;
    }
  }

  /** Creates the bucket when it is missing (a fresh storage server); an existing one is left alone. */
  async function ensureBucket() {
    try {
      await s3send(new HeadBucketCommand({ Bucket: bucket }));
    } catch (err) {
      if (!isNotFound(err)) throw err;
      await s3send(new CreateBucketCommand({ Bucket: bucket }));
    }
  }

  return {
    s3, bucket, ensureBucket, putObject, getObjectBuffer, getObjectCapped, copyObject, headObject, deleteObject, presignPut, presignGet,
    checkStorage,
  };
}

function isNotFound(err: unknown) {
  if (err instanceof S3ServiceException) {
    return err.name === 'NotFound' || err.name === 'NoSuchKey' || err.$metadata.httpStatusCode === 404;
  }
  return false;
}

const storage = createStorage(config.s3);
export const s3 = storage.s3;
export const bucket = storage.bucket;
export const ensureBucket = storage.ensureBucket;
export const putObject = storage.putObject;
export const getObjectBuffer = storage.getObjectBuffer;
export const getObjectCapped = storage.getObjectCapped;
export const copyObject = storage.copyObject;
export const headObject = storage.headObject;
export const deleteObject = storage.deleteObject;
export const presignPut = storage.presignPut;
export const presignGet = storage.presignGet;
export const checkStorage = storage.checkStorage;

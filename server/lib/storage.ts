import {
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
}

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

  async function putObject(key: string, body: Buffer | Uint8Array | string, contentType: string) {
    await s3.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType }));
  }

  async function getObjectBuffer(key: string): Promise<Buffer> {
    const out = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    if (!out.Body) throw new Error(`Object ${key} has no body`);
    return Buffer.from(await out.Body.transformToByteArray());
  }

  /** Size and type as storage recorded them, or null when there is no such object. */
  async function headObject(key: string): Promise<ObjectInfo | null> {
    try {
      const out = await s3.send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
      return { size: out.ContentLength ?? 0, contentType: out.ContentType };
    } catch (err) {
      if (isNotFound(err)) return null;
      throw err;
    }
  }

  async function deleteObject(key: string) {
    await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
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
      await s3.send(new HeadBucketCommand({ Bucket: bucket }), { abortSignal: AbortSignal.timeout(CHECK_TIMEOUT_MS) });
      return true;
    } catch {
      return false;
    }
  }

  /** Creates the bucket when it is missing (a fresh storage server); an existing one is left alone. */
  async function ensureBucket() {
    try {
      await s3.send(new HeadBucketCommand({ Bucket: bucket }));
    } catch (err) {
      if (!isNotFound(err)) throw err;
      await s3.send(new CreateBucketCommand({ Bucket: bucket }));
    }
  }

  return { s3, bucket, ensureBucket, putObject, getObjectBuffer, headObject, deleteObject, presignPut, presignGet, checkStorage };
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
export const headObject = storage.headObject;
export const deleteObject = storage.deleteObject;
export const presignPut = storage.presignPut;
export const presignGet = storage.presignGet;
export const checkStorage = storage.checkStorage;

import { TEST_PORTS, TEST_DATA_DIR } from '../helpers/test-env.js';
import { createHash, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { startS3Server } from '../../docker-free-dev/s3-server.js';

// Its own port and folder, next to the shared test stand-ins (4579, .data/test-s3), so this file
// can start and stop its S3 server while the global setup's is running.
const PORT = TEST_PORTS.spareS3;
const ENDPOINT = `http://127.0.0.1:${PORT}`;
const BUCKET = 'storage-test';
const DIRECTORY = path.resolve(TEST_DATA_DIR, 's3-storage');
const APP_ORIGIN = 'http://localhost:3110';

type Storage = typeof import('../../server/lib/storage.js');
let storage: Storage;
let server: { close(): Promise<void> } | undefined;
/** S3's ETag of an object written in one PUT is the MD5 of its bytes (Amazon S3 API reference, "ETag"). */
const md5 = (b: Buffer | string) => createHash('md5').update(b).digest('hex');

async function freePort(): Promise<number> {
  const probe = net.createServer();
  await new Promise<void>((resolve) => probe.listen(0, '127.0.0.1', resolve));
  const { port } = probe.address() as net.AddressInfo;
  await new Promise((resolve) => probe.close(resolve));
  return port;
}

beforeAll(async () => {
  fs.rmSync(DIRECTORY, { recursive: true, force: true });
  server = await startS3Server({ port: PORT, directory: DIRECTORY, bucket: BUCKET, corsOrigins: [APP_ORIGIN] });
  // server/config.ts reads the environment when first imported: point it here, then load afresh.
  vi.stubEnv('S3_ENDPOINT', ENDPOINT);
  vi.stubEnv('S3_BUCKET', BUCKET);
  vi.stubEnv('S3_ACCESS_KEY_ID', 'S3RVER');
  vi.stubEnv('S3_SECRET_ACCESS_KEY', 'S3RVER');
  vi.resetModules();
  storage = await import('../../server/lib/storage.js');
});

afterAll(async () => {
  storage?.s3.destroy();
  await server?.close();
  vi.unstubAllEnvs();
});

describe('server/lib/storage against the local S3 server', () => {
  it('stores an object and returns it byte for byte, with its size and type', async () => {
    const body = Buffer.concat([Buffer.from(Array.from({ length: 256 }, (_, i) => i)), randomBytes(70_000)]);
    await storage.putObject('photos/intake-1.jpg', body, 'image/jpeg');

    const back = await storage.getObjectBuffer('photos/intake-1.jpg');
    expect(back.equals(body)).toBe(true);
    expect(await storage.headObject('photos/intake-1.jpg')).toEqual({ size: body.length, contentType: 'image/jpeg', etag: md5(body) });
  });

  it('reports a missing object as null', async () => {
    expect(await storage.headObject('photos/never-uploaded.jpg')).toBeNull();
  });

  it('accepts a browser-style upload to a presigned PUT URL and serves it through a presigned GET URL', async () => {
    const body = randomBytes(12_345);
    const putUrl = await storage.presignPut('documents/estimate.pdf', 'application/pdf', 60);
    expect(new URL(putUrl).searchParams.get('X-Amz-Expires')).toBe('60');

    const put = await fetch(putUrl, { method: 'PUT', headers: { 'Content-Type': 'application/pdf', Origin: APP_ORIGIN }, body });
    expect(put.status).toBe(200);
    expect(put.headers.get('etag')).toBeTruthy();
    // the browser may only read the ETag of a cross-origin upload when storage exposes it
    expect(put.headers.get('access-control-allow-origin')).toBe(APP_ORIGIN);
    expect(put.headers.get('access-control-expose-headers')).toContain('ETag');

    expect((await storage.getObjectBuffer('documents/estimate.pdf')).equals(body)).toBe(true);
    expect(await storage.headObject('documents/estimate.pdf')).toEqual({ size: body.length, contentType: 'application/pdf', etag: md5(body) });

    const get = await fetch(await storage.presignGet('documents/estimate.pdf'));
    expect(get.status).toBe(200);
    expect(Buffer.from(await get.arrayBuffer()).equals(body)).toBe(true);
  });

  it('answers the browser preflight for the app origin only', async () => {
    const preflight = (origin: string) =>
      fetch(`${ENDPOINT}/${BUCKET}/photos/preflight.jpg`, {
        method: 'OPTIONS',
        headers: { Origin: origin, 'Access-Control-Request-Method': 'PUT', 'Access-Control-Request-Headers': 'content-type' },
      });
    const allowed = await preflight(APP_ORIGIN);
    expect(allowed.status).toBe(200);
    // s3rver answers an accepted preflight with '*' rather than echoing the origin
    expect(['*', APP_ORIGIN]).toContain(allowed.headers.get('access-control-allow-origin'));
    expect(allowed.headers.get('access-control-allow-methods')).toContain('PUT');
    expect(allowed.headers.get('access-control-allow-headers')).toBe('content-type');

    const foreign = await preflight('http://elsewhere.test');
    expect(foreign.status).toBe(403);
    expect(foreign.headers.get('access-control-allow-origin')).toBeNull();
  });

  it('reads an object only up to a byte limit, and only in the version asked for', async () => {
    const body = randomBytes(300_000);
    await storage.putObject('photos/capped.jpg', body, 'image/jpeg');
    const whole = await storage.getObjectCapped('photos/capped.jpg', body.length);
    expect(whole.body.equals(body)).toBe(true);
    expect(whole.etag).toBe(md5(body));
    await expect(storage.getObjectCapped('photos/capped.jpg', body.length - 1)).rejects.toBeInstanceOf(storage.ObjectTooLargeError);
    await expect(storage.getObjectCapped('photos/capped.jpg', 1024)).rejects.toThrow(/larger than 1024 bytes/);
    expect((await storage.getObjectCapped('photos/capped.jpg', body.length, { etag: md5(body) })).body.equals(body)).toBe(true);

    // replaced behind the reader's back: the version it was told to expect is gone
    await storage.putObject('photos/capped.jpg', randomBytes(1000), 'image/jpeg');
    await expect(storage.getObjectCapped('photos/capped.jpg', body.length, { etag: md5(body) })).rejects.toBeInstanceOf(storage.ObjectChangedError);
  });

  it('copies an object on the server, bytes, type and ETag', async () => {
    const body = randomBytes(20_000);
    await storage.putObject('uploads/estimate-2.pdf', body, 'application/pdf');
    await storage.copyObject('uploads/estimate-2.pdf', 'documents/estimate-2.pdf', { ifMatch: md5(body) });
    expect(await storage.headObject('documents/estimate-2.pdf')).toEqual({ size: body.length, contentType: 'application/pdf', etag: md5(body) });
    expect((await storage.getObjectBuffer('documents/estimate-2.pdf')).equals(body)).toBe(true);
  });

  it('deletes an object', async () => {
    await storage.putObject('photos/to-delete.png', Buffer.from('not really a png'), 'image/png');
    expect(await storage.headObject('photos/to-delete.png')).not.toBeNull();
    await storage.deleteObject('photos/to-delete.png');
    expect(await storage.headObject('photos/to-delete.png')).toBeNull();
  });

  it('creates a missing bucket with ensureBucket and leaves an existing one alone', async () => {
    const other = storage.createStorage({ ...loadS3(), bucket: 'storage-test-fresh' });
    try {
      expect(await other.checkStorage()).toBe(false);
      await other.ensureBucket();
      expect(await other.checkStorage()).toBe(true);
      await other.putObject('kept.txt', 'kept', 'text/plain');
      await other.ensureBucket();
      expect(await other.headObject('kept.txt')).toEqual({ size: 4, contentType: 'text/plain', etag: md5('kept') });
    } finally {
      other.s3.destroy();
    }
  });

  it('checkStorage is true while the bucket answers', async () => {
    expect(await storage.checkStorage()).toBe(true);
  });

  it('checkStorage is false, quickly and without throwing, when nothing listens', async () => {
    const dead = storage.createStorage({ ...loadS3(), endpoint: `http://127.0.0.1:${await freePort()}` });
    try {
      const started = Date.now();
      expect(await dead.checkStorage()).toBe(false);
      expect(Date.now() - started).toBeLessThan(3000);
    } finally {
      dead.s3.destroy();
    }
  });

  it('restarts on the same folder with the bucket and its objects intact, and frees its port on close', async () => {
    await storage.putObject('photos/survives.txt', 'still here', 'text/plain');
    await server!.close();
    server = undefined;
    expect(await storage.checkStorage()).toBe(false);
    await expectPortFree(PORT);

    server = await startS3Server({ port: PORT, directory: DIRECTORY, bucket: BUCKET, corsOrigins: [APP_ORIGIN] });
    expect(await storage.checkStorage()).toBe(true);
    expect((await storage.getObjectBuffer('photos/survives.txt')).toString()).toBe('still here');
  });
});

function loadS3() {
  return {
    endpoint: ENDPOINT,
    region: 'us-east-1',
    bucket: BUCKET,
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    forcePathStyle: true,
  };
}

async function expectPortFree(port: number) {
  const probe = net.createServer();
  await new Promise<void>((resolve, reject) => {
    probe.once('error', reject);
    probe.listen(port, '127.0.0.1', resolve);
  });
  await new Promise((resolve) => probe.close(resolve));
}

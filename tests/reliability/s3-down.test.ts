import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';

// This file's own S3 stand-in on the spare port, so stopping it never disturbs other test files.
const own = vi.hoisted(() => {
  const slot = Number(process.env.TEST_SLOT ?? 0);
  const port = 4580 + slot * 20; // TEST_PORTS.spareS3 (tests/helpers/test-env.ts)
  process.env.S3_ENDPOINT = `http://127.0.0.1:${port}`;
  return { port, dir: `.data/test-s3-down${slot ? `-${slot}` : ''}` };
});

import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { Attachment } from '../../server/lib/models.js';
import { config } from '../../server/config.js';
import { headObject } from '../../server/lib/storage.js';
import { startS3Server, type RunningS3Server } from '../../docker-free-dev/s3-server.js';
import { closeServerResources } from '../helpers/close.js';
import { makeBenchWorld } from '../helpers/bench-world.js';
import { makeInstrumentWithJob } from '../helpers/factories.js';

/**
 * The S3 stand-in stops while a document is being uploaded. Confirming it answers 503 with words and
 * writes nothing (the attachment stays pending, no stored object); once storage is back the same
 * upload is confirmed by the same running app, and new uploads work, without any restart.
 */
describe('object storage down', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let jobId: string;
  let s3: RunningS3Server | undefined;
  const start = async () => {
    s3 = await startS3Server({ port: own.port, directory: path.resolve(own.dir), bucket: config.s3.bucket, corsOrigins: [config.appOrigin] });
  };
  const pdf = Buffer.from('%PDF-1.4\n% work order for a pad-cup repair\n%%EOF\n');
  const begin = () =>
    request(app).post(`/api/jobs/${jobId}/attachments`).set('Cookie', w.cookies.technician).send({ kind: 'document', contentType: 'application/pdf', size: pdf.length });
  const put = (ticket: { upload: { url: string; headers: Record<string, string> } }) =>
    fetch(ticket.upload.url, { method: 'PUT', headers: { 'Content-Type': ticket.upload.headers['Content-Type'] }, body: new Uint8Array(pdf) });
  const confirm = (id: string) => request(app).post(`/api/attachments/${id}/confirm`).set('Cookie', w.cookies.technician);

  beforeAll(async () => {
    fs.rmSync(own.dir, { recursive: true, force: true });
    await start();
    w = await makeBenchWorld(app, ['technician']);
    jobId = (await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'on_bench' })).job.id;
  });

  afterAll(async () => {
    await s3?.close();
    await closeServerResources();
  });

  it('refuses with a clear 503 while it is down, keeps nothing half-done, and works again once it is back', { timeout: 60_000 }, async () => {
    const ticket = (await begin().expect(201)).body;
    expect((await put(ticket)).status).toBe(200);

    await s3!.close();
    s3 = undefined;
    const down = await confirm(ticket.attachment.id);
    expect(down.status, down.text).toBe(503);
    expect(down.body.error.code).toBe('storage_unavailable');
    expect(down.body.error.message).toMatch(/storage is not reachable/i);
    const pending = await Attachment.findByPk(ticket.attachment.id);
    expect(pending?.status).toBe('pending');
    expect(pending?.etag ?? null).toBeNull();
    // the upload's page answers too: a download link needs no storage call, a health check says storage is down
    const health = await request(app).get('/api/health');
    expect(health.status).toBe(503);

    await start();
    const back = await confirm(ticket.attachment.id);
    expect(back.status, back.text).toBe(200);
    expect((await Attachment.findByPk(ticket.attachment.id))?.status).toBe('stored');
    expect((await headObject(pending!.objectKey))?.size).toBe(pdf.length);

    const again = (await begin().expect(201)).body;
    expect((await put(again)).status).toBe(200);
    expect((await confirm(again.attachment.id)).status).toBe(200);
  });
});

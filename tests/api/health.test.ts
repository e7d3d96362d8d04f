import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { closeServerResources } from '../helpers/close.js';
import { TEST_PORTS } from '../helpers/test-env.js';

describe('GET /api/health', () => {
  afterAll(closeServerResources);

  it('answers without sign-in and checks every part for real', async () => {
    const res = await request(buildApp()).get('/api/health').expect(200);
    expect(res.body).toEqual({ ok: true, db: 'up', storage: 'up', mail: 'up', queue: 'up' });
  });

  it('reports a part that is down with ok=false and 503', async () => {
    // a fresh module graph whose storage and mail point at closed ports
    const { vi } = await import('vitest');
    vi.resetModules();
    const saved = { s3: process.env.S3_ENDPOINT, smtp: process.env.SMTP_PORT };
    process.env.S3_ENDPOINT = `http://127.0.0.1:${TEST_PORTS.spareS3 + 7}`;
    process.env.SMTP_PORT = String(TEST_PORTS.spareSmtp + 7);
    try {
      const { buildApp: buildBroken } = await import('../../server/app.js');
      const res = await request(buildBroken()).get('/api/health').expect(503);
      expect(res.body).toMatchObject({ ok: false, db: 'up', storage: 'down', mail: 'down', queue: 'up' });
      const fresh = await import('../helpers/close.js');
      await fresh.closeServerResources();
    } finally {
      process.env.S3_ENDPOINT = saved.s3;
      process.env.SMTP_PORT = saved.smtp;
    }
  });
});

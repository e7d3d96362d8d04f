import { afterAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { SMTPServer } from 'smtp-server';
import { buildApp } from '../../server/app.js';
import { closeServerResources } from '../helpers/close.js';
import { TEST_PORTS } from '../helpers/test-env.js';

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** An app in a fresh module graph whose configuration is read with `env` set (config is read at import). */
async function appWith(env: Record<string, string>, healthCacheMs?: number): Promise<{ app: Express; close: () => Promise<void> }> {
  vi.resetModules();
  const saved = Object.fromEntries(Object.keys(env).map((k) => [k, process.env[k]]));
  Object.assign(process.env, env);
  try {
    const { buildApp: build } = await import('../../server/app.js');
    const fresh = await import('../helpers/close.js');
    return { app: build({ healthCacheMs }), close: fresh.closeServerResources };
  } finally {
    for (const [k, v] of Object.entries(saved)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
  }
}

/** A small SMTP server of the test's own that counts who connects to it. */
async function countingSmtp(port: number) {
  let connections = 0;
  const server = new SMTPServer({
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    logger: false,
    onConnect: (_session, callback) => {
      connections += 1;
      callback();
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  return {
    get connections() {
      return connections;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

describe('GET /api/health', () => {
  afterAll(closeServerResources);

  it('answers without sign-in and checks every part for real', async () => {
    const res = await request(buildApp()).get('/api/health').expect(200);
    expect(res.body).toEqual({ ok: true, db: 'up', storage: 'up', mail: 'up', queue: 'up' });
  });

  it('reports a part that is down with ok=false and 503', async () => {
    // storage and mail point at closed ports
    const { app, close } = await appWith({
      S3_ENDPOINT: `http://127.0.0.1:${TEST_PORTS.spareS3 + 7}`,
      SMTP_PORT: String(TEST_PORTS.spareSmtp + 7),
    });
    try {
      const res = await request(app).get('/api/health').expect(503);
      expect(res.body).toMatchObject({ ok: false, db: 'up', storage: 'down', mail: 'down', queue: 'up' });
    } finally {
      await close();
    }
  });

  it('answers a crowd of callers from one check, and checks again once the answer is a few seconds old', async () => {
    const port = TEST_PORTS.spareSmtp + 3;
    const smtp = await countingSmtp(port);
    const { app, close } = await appWith({ SMTP_PORT: String(port) }, 1500);
    try {
      // at once: all wait for the same check
      const crowd = await Promise.all(Array.from({ length: 8 }, () => request(app).get('/api/health')));
      for (const res of crowd) expect(res.body).toEqual({ ok: true, db: 'up', storage: 'up', mail: 'up', queue: 'up' });
      // one after another: the answer just checked
      for (let n = 0; n < 4; n++) await request(app).get('/api/health').expect(200);
      expect(smtp.connections).toBe(1);

      await sleep(1600);
      await request(app).get('/api/health').expect(200);
      expect(smtp.connections).toBe(2);
    } finally {
      await close();
      await smtp.close();
    }
  });

  it('shows a service that went down as down once the kept answer expires, and up again once it is back', async () => {
    const port = TEST_PORTS.spareSmtp + 4;
    const smtp = await countingSmtp(port);
    const { app, close } = await appWith({ SMTP_PORT: String(port) }, 1000);
    let back: Awaited<ReturnType<typeof countingSmtp>> | undefined;
    try {
      await request(app).get('/api/health').expect(200);
      await smtp.close();
      await sleep(1100);
      const down = await request(app).get('/api/health').expect(503);
      expect(down.body).toEqual({ ok: false, db: 'up', storage: 'up', mail: 'down', queue: 'up' });

      // the "down" answer is kept too: the mail server is not asked again within the window
      back = await countingSmtp(port);
      await request(app).get('/api/health').expect(503);
      expect(back.connections).toBe(0);
      await sleep(1100);
      const up = await request(app).get('/api/health').expect(200);
      expect(up.body.mail).toBe('up');
      expect(back.connections).toBe(1);
    } finally {
      await close();
      await back?.close();
    }
  });
});

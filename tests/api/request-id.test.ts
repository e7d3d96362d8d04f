import { Writable } from 'node:stream';
import pino from 'pino';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../server/app.js';
import { closeServerResources } from '../helpers/close.js';

/*
 * Every request has an id a person can quote: the X-Request-Id header of every answer, `error.requestId`
 * in every error answer, and the `requestId` of the request's log line.
 */

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-4[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/;

function capturedLog() {
  const lines: Array<Record<string, unknown>> = [];
  const stream = new Writable({
    write(chunk, _enc, done) {
      for (const line of String(chunk).split('\n')) if (line.trim()) lines.push(JSON.parse(line));
      done();
    },
  });
  return { logger: pino({ level: 'info' }, stream), lines };
}

describe('request ids', () => {
  const log = capturedLog();
  const app = buildApp({ logger: log.logger });
  afterAll(closeServerResources);

  it('gives each request its own id, returned as X-Request-Id', async () => {
    const a = await request(app).get('/api/me').expect(401);
    const b = await request(app).get('/api/me').expect(401);
    expect(a.headers['x-request-id']).toMatch(UUID);
    expect(b.headers['x-request-id']).toMatch(UUID);
    expect(a.headers['x-request-id']).not.toBe(b.headers['x-request-id']);
  });

  it('puts the id in every error answer: not signed in, not found, bad input, refused from another site', async () => {
    const answers = [
      await request(app).get('/api/me').expect(401),
      await request(app).get('/api/no-such-thing').expect(404),
      await request(app).post('/api/invitations/accept').set('Content-Type', 'application/json').send('{"broken').expect(400),
      await request(app).post('/api/transfers').set('Origin', 'https://elsewhere.example').send({}).expect(403),
    ];
    for (const res of answers) {
      expect(res.body.error.code).toBeTruthy();
      expect(res.body.error.requestId).toBe(res.headers['x-request-id']);
    }
    expect(answers[3].body.error.code).toBe('cross_site');
  });

  it('keeps a sane incoming X-Request-Id and replaces one that is not', async () => {
    const kept = await request(app).get('/api/no-such-thing').set('X-Request-Id', 'lb-7f3a.2026:12_05-xyz').expect(404);
    expect(kept.headers['x-request-id']).toBe('lb-7f3a.2026:12_05-xyz');
    expect(kept.body.error.requestId).toBe('lb-7f3a.2026:12_05-xyz');

    for (const bad of ['has space', 'semi;colon', 'x'.repeat(129), '<script>']) {
      const res = await request(app).get('/api/no-such-thing').set('X-Request-Id', bad).expect(404);
      expect(res.headers['x-request-id'], bad).toMatch(UUID);
      expect(res.body.error.requestId).toBe(res.headers['x-request-id']);
    }
  });

  it('logs one line per request with its id, method, path and status, and no invitation token', async () => {
    const res = await request(app).get('/api/invitations/preview/secret-token-abc?x=1').set('X-Request-Id', 'trace-invite-1');
    const line = log.lines.find((l) => l.requestId === 'trace-invite-1');
    expect(line).toMatchObject({ req: { method: 'GET', path: '/api/invitations/preview/[token]' }, res: { statusCode: res.status } });
    expect(JSON.stringify(log.lines)).not.toContain('secret-token-abc');
  });
});

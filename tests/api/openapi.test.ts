import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildApp } from '../../server/app.js';
import { API_OPERATIONS } from '../../server/openapi.js';
import { closeServerResources } from '../helpers/close.js';
import { makeNetwork, makeUser } from '../helpers/factories.js';
import { listRoutes } from '../helpers/list-routes.js';
import { signIn } from '../helpers/sign-in.js';

/*
 * GET /api/openapi.json describes every route the app registers, with request shapes taken from the
 * shared zod schemas. A new route without a line in server/openapi.ts fails here.
 */

// The client's own catch-all that serves index.html (present when the client is built).
const isClientFallback = (route: string) => route.endsWith(' /{*splat}');
const asOpenApi = (route: string) => {
  const [method, path] = route.split(' ');
  return `${method.toLowerCase()} ${path.replace(/:([A-Za-z0-9_]+)/g, '{$1}')}`;
};

describe('the API description', () => {
  const app = buildApp();
  let cookie: string;
  let doc: { openapi: string; paths: Record<string, Record<string, Record<string, unknown>>> };

  beforeAll(async () => {
    const network = await makeNetwork();
    const owner = await makeUser(network.id, [{ shopId: null, role: 'owner' }]);
    cookie = await signIn(app, owner.email);
    doc = (await request(app).get('/api/openapi.json').set('Cookie', cookie).expect(200)).body;
  });
  afterAll(closeServerResources);

  it('is OpenAPI 3.1 and lists every registered route, and nothing that is not one', () => {
    expect(doc.openapi).toBe('3.1.0');
    const registered = listRoutes(app).filter((r) => !isClientFallback(r)).map(asOpenApi).sort();
    const described = Object.entries(doc.paths).flatMap(([path, ops]) => Object.keys(ops).map((m) => `${m} ${path}`)).sort();
    expect(registered.filter((r) => !described.includes(r)), 'registered routes missing from server/openapi.ts').toEqual([]);
    // the development mail page exists only outside production and when a catcher folder is set
    expect(described.filter((d) => !registered.includes(d) && d !== 'get /api/dev/mail'), 'described routes the app does not have').toEqual([]);
    expect(Object.keys(API_OPERATIONS).length).toBe(described.length);
  });

  it('takes request shapes from the shared schemas: a stage move needs `to`, one of the stages', () => {
    const move = doc.paths['/api/jobs/{jobId}/stage'].post as {
      parameters: Array<{ name: string; in: string }>;
      requestBody: { content: { 'application/json': { schema: { properties: Record<string, { enum?: string[] }>; required: string[] } } } };
    };
    expect(move.parameters).toContainEqual(expect.objectContaining({ name: 'jobId', in: 'path' }));
    const schema = move.requestBody.content['application/json'].schema;
    expect(schema.required).toContain('to');
    expect(schema.properties.to.enum).toEqual(expect.arrayContaining(['assessed', 'on_bench', 'ready', 'released']));
  });

  it('describes query parameters and the error answer with its request id', () => {
    const board = doc.paths['/api/jobs'].get as { parameters: Array<{ name: string; in: string }>; responses: Record<string, unknown> };
    expect(board.parameters.filter((p) => p.in === 'query').length).toBeGreaterThan(0);
    expect(board.responses['401']).toBeTruthy();
    const error = (doc as unknown as { components: { schemas: { Error: { properties: { error: { properties: Record<string, unknown> } } } } } }).components.schemas.Error;
    expect(Object.keys(error.properties.error.properties)).toEqual(['code', 'message', 'fields', 'requestId']);
    expect((doc.paths['/api/health'].get as { security?: unknown[] }).security).toEqual([]);
  });

  it('is for signed-in people only', async () => {
    const res = await request(app).get('/api/openapi.json').expect(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });
});

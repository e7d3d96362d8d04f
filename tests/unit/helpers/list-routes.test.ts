import express, { Router } from 'express';
import { describe, expect, it } from 'vitest';
import { listRoutes } from '../../helpers/list-routes.js';

/** The authorization matrix trusts this walker to see every route, so it is checked on its own. */
describe('listRoutes', () => {
  it('lists routes on the app, in routers, in routers mounted under a path, and nested routers', () => {
    const app = express();
    app.get('/api/health', (_req, res) => res.end());
    const plain = Router();
    plain.get('/api/people/:id', (_req, res) => res.end());
    plain.route('/api/shops').get((_req, res) => res.end()).post((_req, res) => res.end());
    const inner = Router();
    inner.delete('/:id', (_req, res) => res.end());
    const mounted = Router();
    mounted.patch('/runs/:id', (_req, res) => res.end());
    mounted.use('/inner', inner);
    app.use(plain);
    app.use('/api/relay', mounted);
    app.use((_req, _res, next) => next()); // middleware is not a route
    app.get('/{*splat}', (_req, res) => res.end());

    expect(listRoutes(app)).toEqual([
      'DELETE /api/relay/inner/:id',
      'GET /api/health',
      'GET /api/people/:id',
      'GET /api/shops',
      'GET /{*splat}',
      'PATCH /api/relay/runs/:id',
      'POST /api/shops',
    ]);
  });
});

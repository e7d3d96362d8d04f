import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import { pinoHttp } from 'pino-http';
import type { Logger } from 'pino';

/**
 * Every request gets an id: the caller's `X-Request-Id` when it is a sane one (a proxy in front, a
 * support tool), otherwise a fresh UUID. It goes back as the `X-Request-Id` header and in every error
 * answer (`error.requestId`, server/lib/errors.ts), and it is on every log line of the request, so a
 * person who quotes it leads straight to the log.
 */
export const REQUEST_ID_HEADER = 'X-Request-Id';

/** Letters, digits and `._:-`, 1–128 characters: nothing that could forge a log line or bloat it. */
const SANE_REQUEST_ID = /^[A-Za-z0-9._:-]{1,128}$/;

export function requestIdFor(incoming: string | string[] | undefined): string {
  const value = Array.isArray(incoming) ? incoming[0] : incoming;
  return value && SANE_REQUEST_ID.test(value) ? value : randomUUID();
}

/** Paths whose segments are secrets (an invitation's token) are logged without them; query strings never are. */
export function loggablePath(url: string | undefined): string {
  const path = (url ?? '').split('?')[0];
  return path.replace(/^(\/api\/invitations\/preview\/)[^/]+/, '$1[token]');
}

/** pino-http, one line per finished request: method, path, status, time and the request id. */
export function requestLogger(logger: Logger) {
  return pinoHttp({
    logger,
    genReqId: (req: IncomingMessage, res: ServerResponse) => {
      const id = requestIdFor(req.headers['x-request-id']);
      res.setHeader(REQUEST_ID_HEADER, id);
      return id;
    },
    // req.log (used by the error handler) and the request's line both carry `requestId`
    quietReqLogger: true,
    customAttributeKeys: { reqId: 'requestId' },
    serializers: {
      req: (req: { id: string; method: string; url: string }) => ({ method: req.method, path: loggablePath(req.url) }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    // the health check is polled by load balancers; its lines would drown the rest
    autoLogging: { ignore: (req) => req.url === '/api/health' },
  });
}

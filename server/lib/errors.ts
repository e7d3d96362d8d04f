import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import { logger } from './logger.js';

/** The one type for expected failures: an HTTP status, a stable code, a message for people, field errors. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const badRequest = (message: string, fields?: Record<string, string>) =>
  new AppError(400, 'invalid_request', message, fields);
export const unauthenticated = (message = 'Please sign in.') => new AppError(401, 'unauthenticated', message);
export const forbidden = (message = 'You do not have permission to do that.') => new AppError(403, 'forbidden', message);
export const notFound = (what = 'That record') => new AppError(404, 'not_found', `${what} was not found.`);
export const conflict = (message: string, fields?: Record<string, string>) => new AppError(409, 'conflict', message, fields);

/** Turns zod issues into `{ field: message }` using the dotted path of each issue. */
export function zodFields(err: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of err.issues) {
    const key = issue.path.join('.') || '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

export function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return badRequest('Some fields need attention.', zodFields(err));
  const e = err as { type?: string; status?: number; name?: string };
  // body-parser errors (malformed JSON, too large) are the client's fault
  if (e && typeof e.status === 'number' && e.status >= 400 && e.status < 500) {
    return new AppError(e.status, e.type === 'entity.too.large' ? 'too_large' : 'invalid_request', 'The request could not be read.');
  }
  if (e?.name === 'SequelizeUniqueConstraintError') return conflict('That already exists.');
  if (e?.name === 'SequelizeForeignKeyConstraintError') return badRequest('A referenced record does not exist.');
  if (isStorageUnavailable(err)) {
    return new AppError(503, 'storage_unavailable', 'File storage is not reachable at the moment. Nothing was saved; please try again in a few minutes.');
  }
  if (isDatabaseUnavailable(err)) {
    return new AppError(503, 'database_unavailable', 'The database is not reachable at the moment (it may be restarting). Nothing was saved; please try again in a few seconds.');
  }
  // a value the schema let through but PostgreSQL cannot hold (class 22: out of range, bad encoding, too long)
  if (sqlState(err)?.startsWith('22')) return badRequest('A value is out of the range Benchrelay can store.');
  // a check or not-null constraint the request's validation should have caught first
  if (sqlState(err) === '23514' || sqlState(err) === '23502') return badRequest('A value is not allowed here.');
  return new AppError(500, 'internal', 'Something went wrong on our side. Please try again.');
}

/** The SQLSTATE of a database error, whether Sequelize wrapped it or pg threw it. */
function sqlState(err: unknown): string | undefined {
  const e = err as { code?: unknown; parent?: { code?: unknown }; original?: { code?: unknown } } | null;
  const code = e?.parent?.code ?? e?.original?.code ?? e?.code;
  return typeof code === 'string' ? code : undefined;
}

const CONNECTION_ERRORS = new Set([
  'SequelizeConnectionError',
  'SequelizeConnectionRefusedError',
  'SequelizeConnectionTimedOutError',
  'SequelizeHostNotReachableError',
  'SequelizeConnectionAcquireTimeoutError',
  'ConnectionError',
]);

/**
 * The database went away under a request: refused or dropped connections, a server shutting down
 * (57P01 admin shutdown, 57P02 crash shutdown, 57P03 starting up) or connection-class errors (08xxx).
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  const e = err as { name?: string; message?: string; parent?: { code?: unknown; message?: string }; code?: unknown } | null;
  if (!e) return false;
  if (e.name && CONNECTION_ERRORS.has(e.name)) return true;
  const state = sqlState(err);
  if (state && (state.startsWith('08') || state === '57P01' || state === '57P02' || state === '57P03')) return true;
  if (state === 'ECONNREFUSED' || state === 'ECONNRESET' || state === 'EPIPE') return true;
  const message = `${e.message ?? ''} ${e.parent?.message ?? ''}`;
  return /Connection terminated|connection is closed|Client has encountered a connection error|terminating connection due to administrator command/i.test(message);
}

/**
 * Object storage did not answer: server/lib/storage.ts turns a refused or dropped connection into a
 * StorageUnavailableError; an overloaded or failing server answers 5xx through the AWS SDK (`$metadata`).
 */
export function isStorageUnavailable(err: unknown): boolean {
  const e = err as { $metadata?: { httpStatusCode?: number }; name?: string } | null;
  if (!e || typeof e !== 'object') return false;
  if (e.name === 'StorageUnavailableError') return true;
  return '$metadata' in e && (e.$metadata?.httpStatusCode ?? 0) >= 500;
}

/**
 * HTTP error handler: clients get `{ error: { code, message, fields?, requestId } }`, never a stack
 * trace. `requestId` is the request's id (server/lib/request-log.ts), so a person can quote it.
 */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const appErr = toAppError(err);
  const requestId = typeof req.id === 'string' ? req.id : undefined;
  if (appErr.status >= 500) (req.log ?? logger).error({ err, path: req.path, requestId }, 'request failed');
  if (res.headersSent) return;
  res.status(appErr.status).json({
    error: {
      code: appErr.code,
      message: appErr.message,
      ...(appErr.fields ? { fields: appErr.fields } : {}),
      ...(appErr.extra ?? {}),
      ...(requestId ? { requestId } : {}),
    },
  });
};

export const notFoundHandler: RequestHandler = (req, _res, next) => next(notFound(`${req.method} ${req.path}`));

/** Process-level events land in the same log with the same shape. */
export function installProcessHandlers() {
  process.on('unhandledRejection', (reason) => logger.error({ err: reason }, 'unhandled rejection'));
  process.on('uncaughtException', (err) => {
    logger.fatal({ err }, 'uncaught exception');
    process.exitCode = 1;
  });
}

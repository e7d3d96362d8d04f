import pino from 'pino';
import { config } from '../config.js';

/** Secrets never reach a log line: session cookies, auth headers and tokens are redacted. */
export const logger = pino({
  level: config.logLevel,
  redact: ['req.headers.cookie', 'req.headers.authorization', '*.password', '*.token', '*.secret', '*.accessToken'],
});

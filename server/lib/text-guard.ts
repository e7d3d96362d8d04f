import type { RequestHandler } from 'express';
import { badRequest } from './errors.js';

/**
 * Text that is never something a person typed: the NUL character (PostgreSQL cannot store it in a
 * text column and fails the whole statement) and a lone UTF-16 surrogate (no character at all; the
 * database driver would silently store U+FFFD in its place, so what was saved is not what was sent).
 */
// eslint-disable-next-line no-control-regex -- NUL is exactly the character this guard looks for
const UNSTORABLE = /\u0000|\p{Surrogate}/u;

const MESSAGE = 'Contains a character that cannot be stored (a NUL or a broken unicode character).';

/** `{ 'a.b.0': message }` for every string (and every key) in a JSON value that holds such a character. */
export function unstorableText(value: unknown, prefix = '', found: Record<string, string> = {}, depth = 0): Record<string, string> {
  if (typeof value === 'string') {
    if (UNSTORABLE.test(value)) found[prefix || '_'] = MESSAGE;
  } else if (value && typeof value === 'object' && depth < 64) {
    for (const [key, child] of Object.entries(value)) {
      const at = prefix ? `${prefix}.${key}` : key;
      if (UNSTORABLE.test(key)) found[at] = MESSAGE;
      unstorableText(child, at, found, depth + 1);
    }
  }
  return found;
}

/**
 * Refuses, before any route reads it, a request whose JSON body or query string carries such text,
 * with a field error at each place, so every route answers 400 instead of failing in the database.
 */
export function refuseUnstorableText(): RequestHandler {
  return (req, _res, next) => {
    const fields = { ...unstorableText(req.query), ...unstorableText(req.body) };
    if (Object.keys(fields).length) return next(badRequest('Some fields contain characters that cannot be stored.', fields));
    next();
  };
}

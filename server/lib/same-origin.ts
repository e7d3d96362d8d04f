import type { RequestHandler } from 'express';
import { AppError } from './errors.js';

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

const crossSite = () =>
  new AppError(403, 'cross_site', 'This request came from another site, so Benchrelay did not carry it out. Use Benchrelay itself to make changes.');

function originOf(url: string): string | null {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
}

/**
 * Refuses a state-changing request (POST, PUT, PATCH, DELETE) that a page of another site made the
 * browser send, whatever the session cookie's SameSite setting lets through:
 * - `Origin` present and not one of `allowedOrigins` (the app's own; in development also Vite's), or
 *   `Origin: null` (sandboxed frames, data: pages, some redirects) → 403;
 * - `Sec-Fetch-Site` present and not `same-origin` → 403;
 * - neither present: `Referer`, when present, must be of an allowed origin.
 * When all three are absent the request did not come from a browser page: every browser Benchrelay
 * supports sends `Origin` (and `Sec-Fetch-Site`) on a cross-site POST, PUT, PATCH or DELETE, so a
 * request without them is a script or tool that holds the cookie itself, and is allowed. GET, HEAD
 * and OPTIONS never change anything (no route that answers them writes), so they pass, including the
 * identity provider's redirect to /auth/callback.
 */
export function sameOriginOnly(allowedOrigins: readonly string[]): RequestHandler {
  const allowed = new Set(allowedOrigins);
  return (req, _res, next) => {
    if (!STATE_CHANGING.has(req.method)) return next();
    const origin = req.get('origin');
    const fetchSite = req.get('sec-fetch-site');
    if (origin !== undefined) {
      if (origin === 'null' || !allowed.has(originOf(origin) ?? '')) return next(crossSite());
    }
    // same-site is not enough: another app on a sibling subdomain is not Benchrelay. (Through Vite's
    // dev proxy the browser still sees one origin, :5173, and says same-origin.)
    if (fetchSite !== undefined && fetchSite !== 'same-origin') return next(crossSite());
    if (origin === undefined && fetchSite === undefined) {
      const referer = req.get('referer');
      if (referer !== undefined && !allowed.has(originOf(referer) ?? '')) return next(crossSite());
    }
    next();
  };
}

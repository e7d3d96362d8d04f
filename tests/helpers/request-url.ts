/** The address a stubbed `fetch` was called with, in whichever form the caller passed it. */
export function requestUrl(input: RequestInfo | URL): URL {
  return new URL(typeof input === 'string' || input instanceof URL ? input : input.url, 'http://localhost');
}

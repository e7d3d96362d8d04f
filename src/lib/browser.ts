/**
 * Full page loads go through here: leaving for the identity provider or after sign-out must drop the
 * whole client state, which a router navigation would keep. One seam also lets tests observe it.
 */
export function assignLocation(url: string): void {
  window.location.assign(url);
}

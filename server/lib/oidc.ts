import * as client from 'openid-client';
import { config } from '../config.js';

/**
 * OpenID Connect relying party (authorization code + PKCE). Discovery is cached after the first
 * success and retried on the next sign-in after a failure, so the app can start before the provider.
 */
let discovered: Promise<client.Configuration> | undefined;

export function oidcConfiguration(): Promise<client.Configuration> {
  discovered ??= client
    .discovery(
      new URL(config.oidc.issuer),
      config.oidc.clientId,
      config.oidc.clientSecret,
      undefined,
      config.oidc.allowInsecure ? { execute: [client.allowInsecureRequests] } : undefined,
    )
    .catch((err) => {
      discovered = undefined;
      throw err;
    });
  return discovered;
}

export interface PendingSignIn {
  codeVerifier: string;
  state: string;
  returnTo: string;
}

export async function beginSignIn(returnTo: string): Promise<{ url: string; pending: PendingSignIn }> {
  const cfg = await oidcConfiguration();
  const codeVerifier = client.randomPKCECodeVerifier();
  const state = client.randomState();
  const url = client.buildAuthorizationUrl(cfg, {
    redirect_uri: config.oidc.redirectUri,
    scope: 'openid email profile',
    code_challenge: await client.calculatePKCECodeChallenge(codeVerifier),
    code_challenge_method: 'S256',
    state,
  });
  return { url: url.href, pending: { codeVerifier, state, returnTo } };
}

export interface SignedInIdentity {
  /** The provider that vouched for this person (the ID token's `iss`, checked by openid-client). */
  issuer: string;
  /** The provider's own, stable id of the account (`sub`). Together with `issuer` it names the account. */
  subject: string;
  email: string;
  /** True only when the provider says it checked that the account holder receives mail at `email`. */
  emailVerified: boolean;
  name: string;
  idToken?: string;
}

/** `email_verified` as providers send it: a boolean, or (some older providers) the string "true". */
function verifiedClaim(value: unknown): boolean | undefined {
  if (value === true || value === 'true') return true;
  if (value === false || value === 'false') return false;
  return undefined;
}

export async function finishSignIn(callbackUrl: URL, pending: PendingSignIn): Promise<SignedInIdentity> {
  const cfg = await oidcConfiguration();
  const tokens = await client.authorizationCodeGrant(cfg, callbackUrl, {
    pkceCodeVerifier: pending.codeVerifier,
    expectedState: pending.state,
  });
  const claims = tokens.claims();
  if (!claims) throw new Error('The identity provider returned no ID token.');
  let email = typeof claims.email === 'string' ? claims.email : undefined;
  let name = typeof claims.name === 'string' ? claims.name : undefined;
  let emailVerified = email ? verifiedClaim(claims.email_verified) : undefined;
  // Providers that keep ID tokens minimal put e-mail, its verification and name only in userinfo.
  if (!email || !name || emailVerified === undefined) {
    const info = await client.fetchUserInfo(cfg, tokens.access_token, claims.sub);
    const infoEmail = typeof info.email === 'string' ? info.email : undefined;
    if (!email && infoEmail) email = infoEmail;
    // a verification flag speaks only for the address it came with
    if (emailVerified === undefined && infoEmail && email && infoEmail.toLowerCase() === email.toLowerCase()) {
      emailVerified = verifiedClaim(info.email_verified);
    }
    name ??= typeof info.name === 'string' ? info.name : undefined;
  }
  if (!email) throw new Error('The identity provider did not share an e-mail address.');
  return {
    issuer: claims.iss,
    subject: claims.sub,
    email: email.toLowerCase(),
    emailVerified: emailVerified === true,
    name: name ?? email,
    idToken: tokens.id_token,
  };
}

export async function signOutUrl(idToken: string | undefined): Promise<string> {
  try {
    const cfg = await oidcConfiguration();
    if (!cfg.serverMetadata().end_session_endpoint) return '/';
    return client.buildEndSessionUrl(cfg, {
      post_logout_redirect_uri: `${config.appOrigin}/`,
      ...(idToken ? { id_token_hint: idToken } : {}),
    }).href;
  } catch {
    return '/';
  }
}

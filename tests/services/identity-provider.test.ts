import { TEST_PORTS } from '../helpers/test-env.js';
import net from 'node:net';
import * as client from 'openid-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startIdentityProvider } from '../../docker-free-dev/identity-provider.js';
import { demoPeople } from '../../server/seed/demo-people.js';

// Its own port, next to the shared test identity provider (4410), so this file can start and stop
// its provider while the global setup's is running.
const PORT = TEST_PORTS.spareOidc;
const ISSUER = `http://127.0.0.1:${PORT}`;
const APP = 'http://localhost:3199';
const REDIRECT_URI = `${APP}/auth/callback`;
const CLIENT = { client_id: 'services-test', client_secret: 'services-test-secret' };

let idp: { issuer: string; close(): Promise<void> } | undefined;
let oidc: client.Configuration;

beforeAll(async () => {
  idp = await startIdentityProvider({
    port: PORT,
    issuer: ISSUER,
    clients: [{ ...CLIENT, redirect_uris: [REDIRECT_URI], post_logout_redirect_uris: [`${APP}/`] }],
    accounts: demoPeople,
  });
  oidc = await client.discovery(new URL(ISSUER), CLIENT.client_id, CLIENT.client_secret, undefined, {
    execute: [client.allowInsecureRequests],
  });
});

afterAll(async () => {
  await idp?.close();
});

/** A browser in miniature: keeps the provider's cookies and does not follow redirects on its own. */
function browser() {
  const jar = new Map<string, string>();
  return async function go(url: string, init: { method?: string; form?: Record<string, string> } = {}) {
    const response = await fetch(new URL(url, ISSUER), {
      method: init.method ?? (init.form ? 'POST' : 'GET'),
      redirect: 'manual',
      headers: {
        cookie: [...jar].map(([k, v]) => `${k}=${v}`).join('; '),
        ...(init.form ? { 'content-type': 'application/x-www-form-urlencoded' } : {}),
      },
      body: init.form ? new URLSearchParams(init.form).toString() : undefined,
    });
    for (const cookie of response.headers.getSetCookie()) {
      const [pair] = cookie.split(';');
      const at = pair.indexOf('=');
      jar.set(pair.slice(0, at), pair.slice(at + 1));
    }
    return response;
  };
}

async function beginSignIn(go: ReturnType<typeof browser>) {
  const codeVerifier = client.randomPKCECodeVerifier();
  const state = client.randomState();
  const authorizationUrl = client.buildAuthorizationUrl(oidc, {
    redirect_uri: REDIRECT_URI,
    scope: 'openid email profile',
    code_challenge: await client.calculatePKCECodeChallenge(codeVerifier),
    code_challenge_method: 'S256',
    state,
  });
  const started = await go(authorizationUrl.href);
  expect(started.status).toBe(303);
  const interactionPath = started.headers.get('location')!;
  expect(interactionPath).toMatch(/^\/interaction\/[\w-]+$/);
  return { codeVerifier, state, interactionPath };
}

/** Follows the provider's redirects until it hands the browser back to the app. */
async function followToApp(go: ReturnType<typeof browser>, response: Response) {
  let current = response;
  for (let hops = 0; hops < 5; hops++) {
    expect([302, 303]).toContain(current.status);
    const location = new URL(current.headers.get('location')!, ISSUER);
    if (location.origin === APP) return location;
    current = await go(location.href);
  }
  throw new Error('the provider never redirected back to the app');
}

describe('local identity provider', () => {
  it('serves a discovery document for its issuer with code flow, PKCE S256 and the three scopes', async () => {
    const response = await fetch(`${ISSUER}/.well-known/openid-configuration`);
    expect(response.status).toBe(200);
    const discovery = (await response.json()) as Record<string, unknown>;
    expect(discovery.issuer).toBe(ISSUER);
    expect(discovery.authorization_endpoint).toBe(`${ISSUER}/auth`);
    expect(discovery.code_challenge_methods_supported).toEqual(['S256']);
    expect(discovery.response_types_supported).toContain('code');
    expect(discovery.scopes_supported).toEqual(expect.arrayContaining(['openid', 'email', 'profile']));
    expect(discovery.claims_supported).toEqual(expect.arrayContaining(['sub', 'email', 'email_verified', 'name']));
    expect(discovery.end_session_endpoint).toBe(`${ISSUER}/session/end`);
  });

  it('shows a sign-in page with every demo person as a button and a field for any other address', async () => {
    const go = browser();
    const { interactionPath } = await beginSignIn(go);
    const page = await go(interactionPath);
    expect(page.status).toBe(200);
    const html = await page.text();
    expect(html).toContain('Benchrelay local sign-in (development stand-in)');
    for (const person of demoPeople) {
      const button = new RegExp(`<button[^>]*type="submit"[^>]*value="${person.email}"[^>]*>[\\s\\S]*?</button>`).exec(html);
      expect(button, person.email).not.toBeNull();
      expect(button![0]).toContain(person.name);
      expect(button![0]).toContain(person.note);
    }
    expect(html).toMatch(/<input[^>]*name="email"[^>]*type="email"/);
  });

  it('signs in a demo person with PKCE and issues their e-mail and name in the ID token and userinfo', async () => {
    const go = browser();
    const person = demoPeople[0];
    const { codeVerifier, state, interactionPath } = await beginSignIn(go);
    const callback = await followToApp(go, await go(`${interactionPath}/login`, { form: { email: person.email } }));

    const tokens = await client.authorizationCodeGrant(oidc, callback, { pkceCodeVerifier: codeVerifier, expectedState: state });
    expect(tokens.claims()).toMatchObject({ sub: person.email, email: person.email, email_verified: true, name: person.name });
    const userinfo = await client.fetchUserInfo(oidc, tokens.access_token, person.email);
    expect(userinfo).toMatchObject({ email: person.email, name: person.name });
  });

  it('signs in any typed address, lower-cased, and rejects something that is not an address', async () => {
    const go = browser();
    const { codeVerifier, state, interactionPath } = await beginSignIn(go);
    const refused = await go(`${interactionPath}/login`, { form: { email: 'not-an-address' } });
    expect(refused.status).toBe(400);
    expect(await refused.text()).toContain('Enter a whole e-mail address');

    const accepted = await go(`${interactionPath}/login`, { form: { email: 'New.Invitee@Example.TEST', name: 'Noor Invitee' } });
    const tokens = await client.authorizationCodeGrant(oidc, await followToApp(go, accepted), {
      pkceCodeVerifier: codeVerifier,
      expectedState: state,
    });
    expect(tokens.claims()).toMatchObject({ sub: 'new.invitee@example.test', email: 'new.invitee@example.test', email_verified: true, name: 'Noor Invitee' });
  });

  it('testing options: another account (subject) with the same address, and an address reported as not verified', async () => {
    const person = demoPeople[0];
    const go = browser();
    const first = await beginSignIn(go);
    const other = await go(`${first.interactionPath}/login`, { form: { email: person.email, subject: 'someone-else-42' } });
    const otherTokens = await client.authorizationCodeGrant(oidc, await followToApp(go, other), {
      pkceCodeVerifier: first.codeVerifier,
      expectedState: first.state,
    });
    expect(otherTokens.claims()).toMatchObject({ sub: 'someone-else-42', email: person.email, email_verified: true });

    const go2 = browser();
    const second = await beginSignIn(go2);
    const unverified = await go2(`${second.interactionPath}/login`, { form: { email: 'unchecked@example.test', unverified: 'yes' } });
    const unverifiedTokens = await client.authorizationCodeGrant(oidc, await followToApp(go2, unverified), {
      pkceCodeVerifier: second.codeVerifier,
      expectedState: second.state,
    });
    expect(unverifiedTokens.claims()).toMatchObject({ sub: 'unchecked@example.test', email: 'unchecked@example.test', email_verified: false });
    const info = await client.fetchUserInfo(oidc, unverifiedTokens.access_token, 'unchecked@example.test');
    expect(info).toMatchObject({ email: 'unchecked@example.test', email_verified: false });

    // a subject with spaces is not an account id
    const go3 = browser();
    const third = await beginSignIn(go3);
    const bad = await go3(`${third.interactionPath}/login`, { form: { email: person.email, subject: 'two words' } });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain('An account subject is');
  });

  it('refuses an authorization request without PKCE', async () => {
    const go = browser();
    const response = await go(client.buildAuthorizationUrl(oidc, { redirect_uri: REDIRECT_URI, scope: 'openid' }).href);
    const back = new URL(response.headers.get('location')!);
    expect(back.origin + back.pathname).toBe(REDIRECT_URI);
    expect(back.searchParams.get('error')).toBe('invalid_request');
  });

  it('signs out through end_session and returns to the registered post-logout address', async () => {
    const go = browser();
    const person = demoPeople[1];
    const { codeVerifier, state, interactionPath } = await beginSignIn(go);
    const callback = await followToApp(go, await go(`${interactionPath}/login`, { form: { email: person.email } }));
    const tokens = await client.authorizationCodeGrant(oidc, callback, { pkceCodeVerifier: codeVerifier, expectedState: state });

    const logoutPage = await go(
      client.buildEndSessionUrl(oidc, { id_token_hint: tokens.id_token!, post_logout_redirect_uri: `${APP}/` }).href,
    );
    expect(logoutPage.status).toBe(200);
    const html = await logoutPage.text();
    const action = /<form id="op.logoutForm" method="post" action="([^"]+)"/.exec(html)![1];
    const xsrf = /name="xsrf" value="([^"]+)"/.exec(html)![1];
    expect(html).toContain('name="logout" value="yes"');

    const done = await go(action, { form: { xsrf, logout: 'yes' } });
    expect(done.status).toBe(303);
    expect(done.headers.get('location')).toBe(`${APP}/`);

    // the provider session is gone: the next sign-in asks who you are again
    const again = await beginSignIn(go);
    expect((await (await go(again.interactionPath)).text())).toContain('Any other e-mail address');
  });

  it('frees its port on close', async () => {
    await idp!.close();
    idp = undefined;
    const probe = net.createServer();
    await new Promise<void>((resolve, reject) => {
      probe.once('error', reject);
      probe.listen(PORT, '127.0.0.1', resolve);
    });
    await new Promise((resolve) => probe.close(resolve));
  });
});

import { generateKeyPairSync } from 'node:crypto';
import http from 'node:http';
import Provider, { type InteractionDetails, type KoaLikeContext } from 'oidc-provider';

/**
 * Local OpenID Connect provider for development and tests. It stands in for a company's real
 * identity provider: the app talks to it exactly as it would to a hosted one (discovery, code
 * flow with PKCE, userinfo, RP-initiated logout), but signing in is a pick-a-person page.
 *
 * Every account it signs in says `email_verified: true` and has its e-mail address as its subject
 * (`sub`), unless the free field's testing options say otherwise: *Account subject* signs in as
 * another account that carries the same address (what an attacker with an account at some provider
 * would present), and *Report the address as not verified* sends `email_verified: false`.
 * Tests use both through tests/helpers/sign-in.ts.
 */

export interface IdentityClient {
  client_id: string;
  client_secret: string;
  redirect_uris: string[];
  post_logout_redirect_uris?: string[];
  /** openid-client 6 sends the secret in the body unless told otherwise, hence the default. */
  token_endpoint_auth_method?: 'client_secret_post' | 'client_secret_basic';
}

export interface IdentityAccount {
  email: string;
  name: string;
  note?: string;
}

export interface IdentityProviderOptions {
  port: number;
  issuer: string;
  clients: IdentityClient[];
  accounts: IdentityAccount[];
}

export interface RunningIdentityProvider {
  issuer: string;
  close(): Promise<void>;
}

const EMAIL = /^[^\s@<>"]+@[^\s@<>"]+\.[^\s@<>"]+$/;
const SUBJECT = /^[\x21-\x7e]{1,255}$/;

export async function startIdentityProvider(opts: IdentityProviderOptions): Promise<RunningIdentityProvider> {
  const issuer = opts.issuer.replace(/\/+$/, '');
  const accounts = opts.accounts.map((a) => ({ ...a, email: a.email.trim().toLowerCase() }));

  // Accounts by subject. Addresses typed into the free field are remembered so userinfo can answer
  // for them later; after a restart an unknown subject still works as a verified address, named
  // after its local part.
  interface Profile {
    email: string;
    name: string;
    emailVerified: boolean;
  }
  const profiles = new Map<string, Profile>();
  for (const a of accounts) profiles.set(a.email, { email: a.email, name: a.name, emailVerified: true });
  const profileFor = (sub: string): Profile => profiles.get(sub) ?? { email: sub, name: sub.split('@')[0], emailVerified: true };

  const provider = new Provider(issuer, {
    clients: opts.clients.map((c) => ({
      client_id: c.client_id,
      client_secret: c.client_secret,
      redirect_uris: c.redirect_uris,
      post_logout_redirect_uris: c.post_logout_redirect_uris ?? [],
      grant_types: ['authorization_code'],
      response_types: ['code'],
      token_endpoint_auth_method: c.token_endpoint_auth_method ?? 'client_secret_post',
    })),
    // A fresh signing key per start: tokens from a previous run must not verify anyway.
    jwks: { keys: [{ ...generateKeyPairSync('rsa', { modulusLength: 2048 }).privateKey.export({ format: 'jwk' }), use: 'sig', alg: 'RS256' }] },
    // Fixed keys: this provider only ever runs on loopback with throwaway in-memory state.
    cookies: { keys: ['benchrelay-local-identity-provider-cookie-key-dev-only'] },
    scopes: ['openid', 'email', 'profile'],
    claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'] },
    // Put email/name into the ID token so the app can skip a userinfo round trip.
    conformIdTokenClaims: false,
    pkce: { required: () => true },
    features: {
      devInteractions: { enabled: false },
      rpInitiatedLogout: { enabled: true, logoutSource, postLogoutSuccessSource },
    },
    interactions: { url: (_ctx: unknown, interaction: { uid: string }) => `/interaction/${interaction.uid}` },
    // oidc-provider awaits what each hook returns (these and the page hooks below), so plain values are enough
    findAccount: (_ctx: unknown, sub: string) => {
      const profile = profileFor(sub);
      return {
        accountId: sub,
        claims: () => ({ sub, email: profile.email, email_verified: profile.emailVerified, name: profile.name }),
      };
    },
    clientBasedCORS: (_ctx: unknown, origin: string) => isLoopbackOrigin(origin),
    renderError,
    ttl: {
      AccessToken: 60 * 60,
      AuthorizationCode: 10 * 60,
      IdToken: 60 * 60,
      Interaction: 60 * 60,
      Session: 14 * 24 * 60 * 60,
      Grant: 14 * 24 * 60 * 60,
    },
  });

  async function finish(req: http.IncomingMessage, res: http.ServerResponse, details: InteractionDetails, accountId: string) {
    const clientId = String(details.params.client_id);
    // Signing in as someone else must not reuse the previous person's grant.
    let grant = details.grantId ? await provider.Grant.find(details.grantId) : undefined;
    if (!grant || grant.accountId !== accountId) grant = new provider.Grant({ accountId, clientId });
    grant.addOIDCScope(String(details.params.scope ?? 'openid'));
    const missing = details.prompt.details as {
      missingOIDCClaims?: string[];
      missingResourceScopes?: Record<string, string[]>;
    };
    if (missing.missingOIDCClaims) grant.addOIDCClaims(missing.missingOIDCClaims);
    for (const [resource, scopes] of Object.entries(missing.missingResourceScopes ?? {})) {
      grant.addResourceScope(resource, scopes.join(' '));
    }
    const grantId = await grant.save();
    await provider.interactionFinished(req, res, { login: { accountId }, consent: { grantId } }, { mergeWithLastSubmission: false });
  }

  async function handleInteraction(req: http.IncomingMessage, res: http.ServerResponse, uid: string, action: string | undefined) {
    let details: InteractionDetails;
    try {
      details = await provider.interactionDetails(req, res);
    } catch {
      return sendHtml(res, 400, page('Sign-in request expired', `
        <h1>This sign-in request has expired</h1>
        <p>Go back to Benchrelay and choose <em>Sign in</em> again.</p>`));
    }
    if (details.uid !== uid) return sendHtml(res, 400, page('Wrong sign-in request', '<h1>This link belongs to another sign-in request</h1>'));

    if (req.method === 'GET' && !action) {
      // Already signed in and only consent is missing: a stand-in has nobody to ask, so grant it.
      if (details.prompt.name === 'consent' && details.session?.accountId) {
        return finish(req, res, details, details.session.accountId);
      }
      return sendHtml(res, 200, signInPage(uid, accounts));
    }

    if (req.method === 'POST' && action === 'login') {
      const form = new URLSearchParams(await readBody(req));
      const email = (form.get('email') ?? '').trim().toLowerCase();
      if (!EMAIL.test(email)) {
        return sendHtml(res, 400, signInPage(uid, accounts, 'Enter a whole e-mail address, such as someone@benchrelay.test.'));
      }
      const typedName = (form.get('name') ?? '').trim();
      const override = (form.get('subject') ?? '').trim();
      const subject = override || email;
      if (override && !SUBJECT.test(override)) {
        return sendHtml(res, 400, signInPage(uid, accounts, 'An account subject is 1 to 255 visible characters without spaces.'));
      }
      const known = profiles.get(subject) ?? profiles.get(email);
      profiles.set(subject, {
        email,
        name: typedName || known?.name || email.split('@')[0],
        emailVerified: form.get('unverified') !== 'yes',
      });
      return finish(req, res, details, subject);
    }

    res.statusCode = 405;
    res.end();
  }

  const callback = provider.callback();
  const server = http.createServer((req, res) => {
    const { pathname } = new URL(req.url ?? '/', issuer);
    const match = /^\/interaction\/([\w-]+)(?:\/(login))?\/?$/.exec(pathname);
    if (!match) return callback(req, res);
    handleInteraction(req, res, match[1], match[2]).catch((err: unknown) => {
      console.error('identity provider: interaction failed', err);
      if (!res.headersSent) sendHtml(res, 500, page('Sign-in failed', '<h1>Sign-in failed</h1><p>See the stand-in\'s console.</p>'));
      else res.end();
    });
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });

  return {
    issuer,
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((err) => (err ? reject(err) : resolve()));
        // Browsers and fetch keep connections alive; without this close() waits for them.
        server.closeAllConnections();
      }),
  };
}

function isLoopbackOrigin(origin: string) {
  return /^https?:\/\/(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/.test(origin);
}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    let size = 0;
    const chunks: Buffer[] = [];
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > 64 * 1024) {
        reject(new Error('form too large'));
        req.destroy();
        return;
      }
      chunks.push(chunk);
    });
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

function escapeHtml(value: unknown) {
  return String(value).replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

function sendHtml(res: http.ServerResponse, status: number, html: string) {
  res.statusCode = status;
  res.setHeader('Content-Type', 'text/html; charset=utf-8');
  res.setHeader('Cache-Control', 'no-store');
  res.end(html);
}

const STYLE = `
  :root { color-scheme: light; font-family: system-ui, -apple-system, "Segoe UI", sans-serif; color: #1f2933; background: #f4f5f7; }
  body { margin: 0; padding: 2rem 1rem; }
  main { max-width: 30rem; margin: 0 auto; background: #fff; border: 1px solid #d9dde3; border-radius: 0.5rem; padding: 1.5rem; }
  h1 { font-size: 1.25rem; margin: 0 0 0.25rem; }
  .lead { margin: 0 0 1.25rem; color: #52606d; font-size: 0.9rem; }
  .people { display: grid; gap: 0.5rem; margin: 0 0 1.5rem; padding: 0; list-style: none; }
  .person { width: 100%; text-align: left; padding: 0.65rem 0.85rem; border: 1px solid #c5ccd6; border-radius: 0.4rem; background: #fff; cursor: pointer; font: inherit; display: grid; gap: 0.1rem; }
  .person:hover, .person:focus-visible { border-color: #2f6f9f; background: #f0f6fb; outline: none; }
  .person .name { font-weight: 600; }
  .person .email, .person .note { font-size: 0.85rem; color: #52606d; }
  fieldset { border: 1px solid #d9dde3; border-radius: 0.4rem; padding: 0.75rem 0.85rem 1rem; margin: 0; }
  legend { font-weight: 600; padding: 0 0.25rem; }
  label { display: block; font-size: 0.85rem; margin: 0.5rem 0 0.2rem; }
  input { width: 100%; box-sizing: border-box; padding: 0.45rem 0.55rem; border: 1px solid #c5ccd6; border-radius: 0.3rem; font: inherit; }
  .primary { margin-top: 0.85rem; padding: 0.5rem 0.9rem; border: 0; border-radius: 0.3rem; background: #2f6f9f; color: #fff; font: inherit; font-weight: 600; cursor: pointer; }
  .error { color: #a61b1b; background: #fdecec; padding: 0.5rem 0.75rem; border-radius: 0.3rem; }
  details { margin-top: 0.75rem; font-size: 0.85rem; }
  summary { cursor: pointer; color: #52606d; }
  label.check { display: flex; gap: 0.4rem; align-items: center; }
  label.check input { width: auto; }
  .badge { display: inline-block; font-size: 0.75rem; text-transform: uppercase; letter-spacing: 0.04em; color: #7b4a00; background: #fff4dc; border-radius: 0.25rem; padding: 0.1rem 0.4rem; margin-bottom: 0.75rem; }
`;

function page(title: string, body: string) {
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body><main>${body}</main></body>
</html>`;
}

function signInPage(uid: string, accounts: IdentityAccount[], error?: string) {
  const action = `/interaction/${encodeURIComponent(uid)}/login`;
  const people = accounts
    .map(
      (a) => `<li><button class="person" type="submit" name="email" value="${escapeHtml(a.email)}">
        <span class="name">${escapeHtml(a.name)}</span>
        <span class="email">${escapeHtml(a.email)}</span>
        ${a.note ? `<span class="note">${escapeHtml(a.note)}</span>` : ''}
      </button></li>`,
    )
    .join('\n');
  return page(
    'Benchrelay local sign-in (development stand-in)',
    `<span class="badge">Development stand-in</span>
    <h1>Benchrelay local sign-in (development stand-in)</h1>
    <p class="lead">This page stands in for your company's sign-in while developing. No password is asked.</p>
    ${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ''}
    <form method="post" action="${action}" aria-label="Demo people">
      <ul class="people">${people}</ul>
    </form>
    <form method="post" action="${action}">
      <fieldset>
        <legend>Any other e-mail address</legend>
        <label for="email">E-mail address</label>
        <input id="email" name="email" type="email" required autocomplete="off" placeholder="someone@benchrelay.test">
        <label for="name">Name (optional)</label>
        <input id="name" name="name" type="text" autocomplete="off">
        <details>
          <summary>Testing options</summary>
          <label for="subject">Account subject (empty: the address itself)</label>
          <input id="subject" name="subject" type="text" autocomplete="off" placeholder="another-account-1">
          <label class="check"><input name="unverified" type="checkbox" value="yes"> Report the address as not verified</label>
        </details>
        <button class="primary" type="submit">Sign in with this address</button>
      </fieldset>
    </form>`,
  );
}

// Signing out ends the whole provider session (logout=yes) and confirms itself, so switching
// people in development is one click; the button is there for browsers without scripts.
function logoutSource(ctx: KoaLikeContext, form: string) {
  const withLogout = form.replace('</form>', '<input type="hidden" name="logout" value="yes"/></form>');
  ctx.type = 'html';
  ctx.body = page(
    'Signing out',
    `<h1>Signing out</h1>
    <p class="lead">Ending your session with the local identity provider.</p>
    ${withLogout}
    <button class="primary" type="submit" form="op.logoutForm">Sign out</button>
    <script>document.getElementById('op.logoutForm').submit();</script>`,
  );
}

function postLogoutSuccessSource(ctx: KoaLikeContext) {
  ctx.type = 'html';
  ctx.body = page('Signed out', '<h1>Signed out</h1><p class="lead">You are signed out of the local identity provider.</p>');
}

function renderError(ctx: KoaLikeContext, out: { error?: string; error_description?: string }) {
  ctx.type = 'html';
  ctx.body = page(
    'Sign-in error',
    `<h1>Sign-in error</h1>
    <p class="error">${escapeHtml(out.error ?? 'error')}: ${escapeHtml(out.error_description ?? '')}</p>`,
  );
}

import request from 'supertest';
import type { Express } from 'express';

/**
 * Signs in through the real identity provider stand-in, exactly as a browser would: the app's
 * /auth/login redirect, the provider's sign-in page (pick a person by e-mail), the code grant back
 * at /auth/callback. Returns the app's session cookie.
 */
export async function signIn(app: Express, email: string, account: AccountOptions = {}): Promise<string> {
  return (await signInFollowing(app, email, undefined, account)).cookie;
}

/**
 * The stand-in's testing options (docker-free-dev/identity-provider.ts): `subject` signs in as another
 * account carrying the same address; `unverified` makes the provider say `email_verified: false`.
 */
export interface AccountOptions {
  subject?: string;
  unverified?: boolean;
  /** The app cookie the browser already holds (someone signed in who signs in again). */
  cookie?: string;
}

/**
 * The same sign-in, starting from `/auth/login?returnTo=…`; also returns where the app sent the
 * browser afterwards (the `returnTo`, or /no-access for an e-mail without a role).
 */
export async function signInFollowing(app: Express, email: string, returnTo?: string, account: AccountOptions = {}): Promise<{ cookie: string; location: string }> {
  const start = await request(app)
    .get('/auth/login')
    .query(returnTo ? { returnTo } : {})
    .set('Cookie', account.cookie ?? '')
    .expect(302);
  let appCookie = cookieHeader(start.headers['set-cookie']) || account.cookie || '';
  const jar = new Map<string, string>(); // the provider's cookies
  let url = new URL(start.headers.location);
  let callback: URL | undefined;

  for (let hop = 0; hop < 10 && !callback; hop++) {
    const res = await fetch(url, { redirect: 'manual', headers: { cookie: jarHeader(jar) } });
    absorb(jar, res.headers.getSetCookie());
    if (res.status >= 300 && res.status < 400) {
      const next = new URL(res.headers.get('location') as string, url);
      if (next.pathname === '/auth/callback') callback = next;
      else url = next;
      continue;
    }
    if (res.status !== 200) throw new Error(`sign-in page answered ${res.status}`);
    // the provider's page: post the chosen e-mail to the interaction
    const html = await res.text();
    const action = /<form method="post" action="([^"]+)"/.exec(html)?.[1];
    if (!action) throw new Error('no sign-in form on the provider page');
    const post = await fetch(new URL(action.replace(/&amp;/g, '&'), url), {
      method: 'POST',
      redirect: 'manual',
      headers: { cookie: jarHeader(jar), 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({
        email,
        ...(account.subject ? { subject: account.subject } : {}),
        ...(account.unverified ? { unverified: 'yes' } : {}),
      }).toString(),
    });
    absorb(jar, post.headers.getSetCookie());
    if (post.status < 300 || post.status >= 400) throw new Error(`sign-in post answered ${post.status}: ${await post.text()}`);
    url = new URL(post.headers.get('location') as string, url);
  }
  if (!callback) throw new Error('the provider never sent the browser back to the app');

  const done = await request(app).get(callback.pathname + callback.search).set('Cookie', appCookie);
  if (done.status !== 302) throw new Error(`callback answered ${done.status}`);
  appCookie = cookieHeader(done.headers['set-cookie']) || appCookie;
  return { cookie: appCookie, location: done.headers.location };
}

function cookieHeader(setCookie: string[] | string | undefined): string {
  const list = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : [];
  return list.map((c) => c.split(';')[0]).join('; ');
}

function absorb(jar: Map<string, string>, setCookies: string[]) {
  for (const c of setCookies) {
    const [pair] = c.split(';');
    const i = pair.indexOf('=');
    jar.set(pair.slice(0, i), pair.slice(i + 1));
  }
}

const jarHeader = (jar: Map<string, string>) => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');

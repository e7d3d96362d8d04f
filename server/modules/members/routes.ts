import { Router } from 'express';
import { z } from 'zod';
import { config } from '../../config.js';
import { actorOf, requireActor } from '../../lib/auth.js';
import { beginSignIn, finishSignIn, signOutUrl } from '../../lib/oidc.js';
import { logger } from '../../lib/logger.js';
import { describeMe, resolveSignIn } from './service.js';

/** Only same-site paths may follow sign-in, never another origin. */
const returnToSchema = z
  .string()
  .regex(/^\/(?!\/)[^\s\\]*$/)
  .catch('/');

const regenerate = (req: Express.Request) =>
  new Promise<void>((resolve, reject) => req.session.regenerate((err) => (err ? reject(err) : resolve())));
const save = (req: Express.Request) =>
  new Promise<void>((resolve, reject) => req.session.save((err) => (err ? reject(err) : resolve())));

export const authRouter = Router();

authRouter.get('/auth/login', async (req, res) => {
  const returnTo = returnToSchema.parse(req.query.returnTo ?? '/');
  const { url, pending } = await beginSignIn(returnTo);
  req.session.pendingSignIn = pending;
  await save(req);
  res.redirect(url);
});

authRouter.get('/auth/callback', async (req, res) => {
  const pending = req.session.pendingSignIn;
  if (!pending) return res.redirect('/sign-in?error=expired');
  let identity;
  try {
    identity = await finishSignIn(new URL(req.originalUrl, config.appOrigin), pending);
  } catch (err) {
    logger.warn({ err: (err as Error).message }, 'sign-in failed');
    delete req.session.pendingSignIn;
    return res.redirect('/sign-in?error=failed');
  }
  const who = await resolveSignIn(identity);
  // a fresh session id at every sign-in, so a planted cookie can never become a signed-in session
  await regenerate(req);
  req.session.idToken = identity.idToken;
  if (who) {
    req.session.user = who;
  } else {
    req.session.noAccessEmail = identity.email;
  }
  await save(req);
  res.redirect(who ? pending.returnTo : '/no-access');
});

authRouter.post('/auth/logout', async (req, res) => {
  const redirectTo = await signOutUrl(req.session.idToken);
  await new Promise<void>((resolve) => req.session.destroy(() => resolve()));
  res.clearCookie('benchrelay.sid');
  res.json({ redirectTo });
});

export const meRouter = Router();

meRouter.get('/api/me', requireActor, async (req, res) => {
  res.json(await describeMe(actorOf(req)));
});

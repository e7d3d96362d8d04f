import { promisify } from 'node:util';
import { Router } from 'express';
import { z } from 'zod';
import { config } from '../../config.js';
import { actorOf, requireActor, startSessionClock } from '../../lib/auth.js';
import { beginSignIn, finishSignIn, signOutUrl } from '../../lib/oidc.js';
import { logger } from '../../lib/logger.js';
import { notFound, unauthenticated } from '../../lib/errors.js';
import {
  auditLogQuerySchema,
  invitationAcceptSchema,
  invitationCreateSchema,
  invitationTokenSchema,
  membershipUpdateSchema,
  peopleQuerySchema,
  personUpdateSchema,
  roleAssignmentSchema,
} from '../../../shared/schemas/people.js';
import {
  assignRole,
  changeMembership,
  deactivatePerson,
  describeMe,
  getPerson,
  listAuditLog,
  listPeople,
  reactivatePerson,
  removeMembership,
  resolveSignIn,
  updatePerson,
} from './service.js';
import {
  acceptInvitation,
  createInvitation,
  listInvitations,
  previewInvitation,
  resendInvitation,
  revokeInvitation,
} from './invitations.js';

/** Where an invitation link sends a person after sign-in, even before they hold any role. */
const INVITATION_RETURN = /^\/invitations\/[A-Za-z0-9_-]+\/accept$/;
const uuid = z.uuid();

/** Only same-site paths may follow sign-in, never another origin. */
export const returnToSchema = z
  .string()
  .regex(/^\/(?!\/)[^\s\\]*$/)
  .catch('/');

const regenerate = (req: Express.Request) => promisify(req.session.regenerate.bind(req.session))();
const save = (req: Express.Request) => promisify(req.session.save.bind(req.session))();

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
  const outcome = await resolveSignIn(identity);
  // a fresh session id at every sign-in, so a planted cookie can never become a signed-in session;
  // a refused sign-in also leaves whoever was signed in here signed out
  await regenerate(req);
  if (outcome.kind === 'refused') return res.redirect(`/sign-in?error=${outcome.reason}`);
  req.session.idToken = identity.idToken;
  req.session.identity = {
    issuer: identity.issuer,
    subject: identity.subject,
    email: identity.email,
    name: identity.name,
    emailVerified: identity.emailVerified,
  };
  startSessionClock(req.session);
  if (outcome.kind === 'member') {
    req.session.user = { id: outcome.id, networkId: outcome.networkId };
  } else {
    req.session.noAccessEmail = identity.email;
  }
  await save(req);
  // someone accepting an invitation has no role yet: the invitation page finishes the job
  res.redirect(outcome.kind === 'member' || INVITATION_RETURN.test(pending.returnTo) ? pending.returnTo : '/no-access');
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

/** A uuid route parameter; anything else cannot name a record, so it is simply not found. */
function idParam(value: string | string[] | undefined, what: string): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

export const peopleRouter = Router();

peopleRouter.get('/api/people', requireActor, async (req, res) => {
  res.json({ people: await listPeople(actorOf(req), peopleQuerySchema.parse(req.query)) });
});

peopleRouter.get('/api/people/:id', requireActor, async (req, res) => {
  res.json({ person: await getPerson(actorOf(req), idParam(req.params.id, 'That person')) });
});

peopleRouter.patch('/api/people/:id', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That person');
  res.json({ person: await updatePerson(actorOf(req), id, personUpdateSchema.parse(req.body)) });
});

peopleRouter.post('/api/people/:id/memberships', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That person');
  res.json({ person: await assignRole(actorOf(req), id, roleAssignmentSchema.parse(req.body)) });
});

peopleRouter.post('/api/people/:id/deactivate', requireActor, async (req, res) => {
  res.json(await deactivatePerson(actorOf(req), idParam(req.params.id, 'That person')));
});

peopleRouter.post('/api/people/:id/reactivate', requireActor, async (req, res) => {
  res.json({ person: await reactivatePerson(actorOf(req), idParam(req.params.id, 'That person')) });
});

peopleRouter.patch('/api/memberships/:id', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That role');
  res.json({ person: await changeMembership(actorOf(req), id, membershipUpdateSchema.parse(req.body)) });
});

peopleRouter.delete('/api/memberships/:id', requireActor, async (req, res) => {
  res.json({ person: await removeMembership(actorOf(req), idParam(req.params.id, 'That role')) });
});

peopleRouter.get('/api/audit-log', requireActor, async (req, res) => {
  res.json(await listAuditLog(actorOf(req), auditLogQuerySchema.parse(req.query)));
});

export const invitationsRouter = Router();

invitationsRouter.get('/api/invitations', requireActor, async (req, res) => {
  res.json({ invitations: await listInvitations(actorOf(req)) });
});

invitationsRouter.post('/api/invitations', requireActor, async (req, res) => {
  res.status(201).json(await createInvitation(actorOf(req), invitationCreateSchema.parse(req.body)));
});

invitationsRouter.delete('/api/invitations/:id', requireActor, async (req, res) => {
  res.json({ invitation: await revokeInvitation(actorOf(req), idParam(req.params.id, 'That invitation')) });
});

invitationsRouter.post('/api/invitations/:id/resend', requireActor, async (req, res) => {
  res.json(await resendInvitation(actorOf(req), idParam(req.params.id, 'That invitation')));
});

// Public: the token in the link is the key. Shown before sign-in so the person knows what they accept.
invitationsRouter.get('/api/invitations/preview/:token', async (req, res) => {
  const token = invitationTokenSchema.safeParse(req.params.token);
  if (!token.success) throw notFound('That invitation');
  res.json({ invitation: await previewInvitation(token.data) });
});

/**
 * Accepts with the identity provider account of this session (a member's, or that of someone signed
 * in without any role yet): its e-mail must be the invited one and verified by the provider. On
 * success the session becomes that network's member.
 */
invitationsRouter.post('/api/invitations/accept', async (req, res) => {
  const { token } = invitationAcceptSchema.parse(req.body);
  const identity = req.session?.identity;
  if (!identity || !(req.actor || req.session.noAccessEmail)) throw unauthenticated('Sign in with the invited e-mail address to accept.');
  const who = await acceptInvitation(identity, token);
  // a new session id whenever the session gains rights; the sign-in time (and so the lifetime) stays
  const { idToken, signedInAt, touchedAt } = req.session;
  await regenerate(req);
  req.session.user = { id: who.userId, networkId: who.networkId };
  req.session.idToken = idToken;
  req.session.identity = identity;
  req.session.signedInAt = signedInAt;
  req.session.touchedAt = touchedAt;
  await save(req);
  res.json({ accepted: true });
});

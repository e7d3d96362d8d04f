import { createHash } from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { config } from '../../config.js';
import { sequelize } from '../../lib/db.js';
import { mailAttachments, transport, type OutgoingMail } from '../../lib/mail.js';
import { logger } from '../../lib/logger.js';
import { enqueue } from '../../lib/queue-jobs.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { notFound } from '../../lib/errors.js';
import type { Actor } from '../../lib/auth.js';
import { Membership, Notification, NotificationPreference, OutboxMessage, User } from '../../lib/models.js';
import { NOTIFICATION_EMAIL_DEFAULTS, NOTIFICATION_KINDS, type NotificationKind, type Role } from '../../../shared/domain.js';
import type { Inbox, NotificationPreferences } from '../../../shared/notifications.js';

/**
 * Notices: an in-app inbox entry per person and, unless they turned e-mail off for that kind, an e-mail
 * written to the outbox in the caller's transaction. The outbox is sent afterwards (`deliverOutbox` for a
 * step's rows, `deliverOutboxMessage` for one row), so a crash between the commit and the send loses
 * nothing; every send claims its row with FOR UPDATE SKIP LOCKED and marks it sent in the same
 * transaction, so two workers never send one message twice.
 */

export interface NoticeInput {
  networkId: string;
  kind: NotificationKind;
  userIds: string[];
  title: string;
  body: string;
  /** In-app path such as /transfers/…; e-mails carry it as an absolute link. */
  link: string | null;
  /** Stable for the event (e.g. `transfer:<id>:approved`); each person's copy appends their id. */
  dedupeKey: string;
  email?: { subject: string; text: string };
  /**
   * Queue a 'send-outbox' job for these e-mails once the transaction commits (a step in a web request).
   * Worker steps that send their own outbox rows afterwards leave this off.
   */
  sendAfterCommit?: boolean;
}

/** BullMQ job ids may not contain ':'; a digest of the event key keeps one job per event. */
const sendJobId = (dedupeKey: string) => `notice-${createHash('sha1').update(dedupeKey).digest('hex')}`;

function sendAfterCommit(dedupeKey: string, transaction?: Transaction) {
  const add = () => {
    enqueue('send-outbox', { dedupePrefix: `${dedupeKey}:` }, {
      jobId: sendJobId(dedupeKey),
      attempts: 6,
      backoff: { type: 'exponential', delay: 2000 },
      removeOnComplete: 1000,
    }).catch((err: Error) => logger.warn({ err: err.message, dedupeKey }, 'could not enqueue notice e-mails; the outbox sweep sends them'));
  };
  if (transaction) transaction.afterCommit(add);
  else add();
}

export interface OutboxPayload {
  to: string;
  subject: string;
  text: string;
  userId: string;
  [key: string]: unknown;
}

/** Writes the in-app notices and queues the e-mails; a repeated call with the same key adds nothing. */
export async function notify(input: NoticeInput, transaction?: Transaction) {
  const userIds = [...new Set(input.userIds)];
  if (!userIds.length) return { notified: 0, emailsQueued: 0, outboxKeys: [] as string[] };
  const users = await User.findAll({
    where: { networkId: input.networkId, id: { [Op.in]: userIds }, active: true },
    transaction,
  });
  await Notification.bulkCreate(
    users.map((u) => ({
      networkId: input.networkId,
      userId: u.id,
      kind: input.kind,
      title: input.title,
      body: input.body,
      link: input.link,
      dedupeKey: `${input.dedupeKey}:${u.id}`,
    })),
    { transaction, ignoreDuplicates: true },
  );

  let outboxKeys: string[] = [];
  if (input.email && users.length) {
    const choices = await NotificationPreference.findAll({
      where: { networkId: input.networkId, userId: { [Op.in]: users.map((u) => u.id) }, kind: input.kind },
      transaction,
    });
    const chosen = new Map(choices.map((p) => [p.userId, p.email]));
    const wantsEmail = (userId: string) => chosen.get(userId) ?? NOTIFICATION_EMAIL_DEFAULTS[input.kind];
    const link = input.link ? `\n\nOpen it in Benchrelay: ${config.appOrigin}${input.link}` : '';
    const rows = users
      .filter((u) => wantsEmail(u.id))
      .map((u) => ({
        networkId: input.networkId,
        kind: 'email',
        dedupeKey: `${input.dedupeKey}:email:${u.id}`,
        payload: {
          to: `${u.name.replace(/[<>"]/g, '')} <${u.email}>`,
          subject: input.email!.subject,
          text: `${input.email!.text}${link}\n\nYou get this because you work at one of the shops involved. Change which notices reach you by e-mail in Benchrelay.`,
          userId: u.id,
        } satisfies OutboxPayload,
      }));
    await OutboxMessage.bulkCreate(rows, { transaction, ignoreDuplicates: true });
    outboxKeys = rows.map((r) => r.dedupeKey);
    if (input.sendAfterCommit && rows.length) sendAfterCommit(input.dedupeKey, transaction);
  }
  return { notified: users.length, emailsQueued: outboxKeys.length, outboxKeys };
}

/** Active people holding one of `roles` at any of `shopIds` (owners are network-wide: ask with shopIds = null). */
export async function peopleAt(networkId: string, shopIds: string[] | null, roles: Role[], transaction?: Transaction) {
  const memberships = await Membership.findAll({
    where: {
      networkId,
      role: { [Op.in]: roles },
      ...(shopIds ? { shopId: { [Op.in]: shopIds } } : {}),
    },
    transaction,
  });
  const ids = [...new Set(memberships.map((m) => m.userId))];
  if (!ids.length) return [];
  const users = await User.findAll({ where: { networkId, id: { [Op.in]: ids }, active: true }, transaction });
  return users.map((u) => u.id);
}

const MAX_ATTEMPTS = 10;

interface ClaimedRow {
  id: string;
  networkId: string;
  payload: Partial<OutgoingMail> & Record<string, unknown>;
  attempts: number;
}

type SendOutcome = { kind: 'sent'; messageId: string } | { kind: 'failed'; error: Error };

/**
 * Sends a claimed row and records the outcome in the caller's transaction. The Message-ID comes from the
 * row id: should a send ever repeat after a crash mid-commit, receiving servers can tell it is the same.
 */
async function sendClaimed(row: ClaimedRow, transaction: Transaction): Promise<SendOutcome> {
  const where = { networkId: row.networkId, id: row.id };
  const p = row.payload;
  try {
    const info = await transport.sendMail({
      from: config.smtp.from,
      to: p.to,
      subject: p.subject,
      text: p.text,
      ...(p.html ? { html: p.html } : {}),
      ...(Array.isArray(p.attachments) ? { attachments: mailAttachments(p.attachments) } : {}),
      messageId: `<${row.id}@outbox.benchrelay>`,
    });
    await OutboxMessage.update({ attempts: row.attempts + 1, sentAt: new Date(), lastError: null }, { where, transaction });
    return { kind: 'sent', messageId: info.messageId };
  } catch (err) {
    await OutboxMessage.update({ attempts: row.attempts + 1, lastError: (err as Error).message.slice(0, 500) }, { where, transaction });
    return { kind: 'failed', error: err as Error };
  }
}

/**
 * Sends pending outbox e-mails one at a time (those whose dedupe key starts with `dedupePrefix`, or all).
 * A failed send is counted on the row and the call throws, so the queued job retries with backoff.
 */
export async function deliverOutbox(options: { dedupePrefix?: string; limit?: number } = {}) {
  const limit = options.limit ?? 500;
  let sent = 0;
  for (let i = 0; i < limit; i++) {
    const outcome = await sequelize.transaction(async (transaction) => {
      const rows = await sequelize.query<{ id: string; network_id: string; payload: ClaimedRow['payload']; attempts: number }>(
        `select id, network_id, payload, attempts
           from outbox
          where sent_at is null and attempts < :maxAttempts
            and (cast(:prefix as text) is null or left(dedupe_key, length(cast(:prefix as text))) = cast(:prefix as text))
          order by created_at, id
          limit 1
          for update skip locked`,
        { type: QueryTypes.SELECT, transaction, replacements: { prefix: options.dedupePrefix ?? null, maxAttempts: MAX_ATTEMPTS } },
      );
      const row = rows[0];
      if (!row) return null;
      return sendClaimed({ id: row.id, networkId: row.network_id, payload: row.payload, attempts: row.attempts }, transaction);
    });
    if (!outcome) break;
    if (outcome.kind === 'failed') {
      logger.warn({ err: outcome.error.message }, 'outbox e-mail not sent; will retry');
      throw new Error(`An e-mail could not be sent: ${outcome.error.message}`);
    }
    sent++;
  }
  return { sent };
}

/**
 * One e-mail through the outbox, for a change that tells one person (a stage move): the row is written in
 * the caller's transaction and, after the commit, a 'deliver-outbox' job sends it. `dedupeKey` makes a
 * repeated step write the message once, and the job id makes a repeated enqueue run once.
 */
export interface QueuedEmail extends OutgoingMail {
  networkId: string;
  dedupeKey: string;
}

export const deliverOutboxJobId = (outboxId: string) => `outbox-${outboxId}`;

export async function queueEmail(mail: QueuedEmail, transaction: Transaction): Promise<string | null> {
  const { networkId, dedupeKey, ...message } = mail;
  const [row, created] = await OutboxMessage.findOrCreate({
    where: { networkId, dedupeKey },
    defaults: { networkId, dedupeKey, kind: 'email', payload: { ...message } },
    transaction,
  });
  if (!created) return row.id;
  transaction.afterCommit(() => {
    enqueue('deliver-outbox', { networkId, outboxId: row.id }, {
      jobId: deliverOutboxJobId(row.id),
      attempts: 6,
      backoff: { type: 'exponential', delay: 2000 },
      removeOnComplete: 1000,
    }).catch((err: Error) => logger.warn({ err: err.message, outboxId: row.id }, 'could not enqueue an e-mail; it stays in the outbox'));
  });
  return row.id;
}

/** Sends one outbox message unless it went already (or another worker is sending it); failures are recorded and rethrown. */
export async function deliverOutboxMessage(networkId: string, outboxId: string): Promise<{ sent: boolean; messageId?: string }> {
  const outcome = await sequelize.transaction(async (transaction) => {
    const row = await OutboxMessage.findOne({
      where: { networkId, id: outboxId },
      lock: transaction.LOCK.UPDATE,
      skipLocked: true,
      transaction,
    });
    if (!row || row.sentAt) return null;
    return sendClaimed({ id: row.id, networkId, payload: row.payload, attempts: row.attempts }, transaction);
  });
  if (!outcome) return { sent: false };
  if (outcome.kind === 'failed') throw outcome.error;
  return { sent: true, messageId: outcome.messageId };
}

/** The signed-in person's own notices (a notice is personal: not even the owner reads someone else's). */
function inboxScope(actor: Actor) {
  const where = accessibleWhere(actor.ability, 'read', 'Notification');
  if (!where) return null;
  return { ...where, networkId: actor.networkId, userId: actor.id };
}

export interface InboxQuery {
  limit?: number;
  unreadOnly?: boolean;
}

/** The signed-in person's inbox, newest first, with the count still unread. */
export async function listInbox(actor: Actor, options: InboxQuery = {}): Promise<Inbox<Date>> {
  const scope = inboxScope(actor);
  if (!scope) return { notifications: [], unread: 0, total: 0 };
  const where = options.unreadOnly ? { ...scope, readAt: null } : scope;
  const [rows, unread, total] = await Promise.all([
    Notification.findAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: Math.min(options.limit ?? 50, 200) }),
    Notification.count({ where: { ...scope, readAt: null } }),
    Notification.count({ where }),
  ]);
  return {
    notifications: rows.map((n) => ({
      id: n.id,
      kind: n.kind,
      title: n.title,
      body: n.body,
      link: n.link,
      readAt: n.readAt,
      createdAt: n.createdAt,
    })),
    unread,
    total,
  };
}

/** Just the number for the header badge, which asks often: one indexed count. */
export async function unreadCount(actor: Actor) {
  const scope = inboxScope(actor);
  if (!scope) return { unread: 0 };
  return { unread: await Notification.count({ where: { ...scope, readAt: null } }) };
}

export async function markRead(actor: Actor, id: string) {
  const row = await Notification.findOne({ where: { networkId: actor.networkId, id, userId: actor.id } });
  if (!row) throw notFound('That notice');
  assertCan(actor.ability, 'update', 'Notification', row.get({ plain: true }));
  if (!row.readAt) await row.update({ readAt: new Date() });
  return { id: row.id, readAt: row.readAt };
}

/**
 * Marks every unread notice read, up to `upTo` (the newest notice the person saw), so one that arrived
 * while they were reading is not swept away unseen.
 */
export async function markAllRead(actor: Actor, upTo?: Date) {
  const scope = inboxScope(actor);
  if (!scope || !actor.ability.can('update', 'Notification')) return { marked: 0, unread: 0 };
  const [marked] = await Notification.update(
    { readAt: new Date() },
    { where: { ...scope, readAt: null, ...(upTo ? { createdAt: { [Op.lte]: upTo } } : {}) } },
  );
  return { marked, ...(await unreadCount(actor)) };
}

/** For each kind, whether the person gets it by e-mail too (their choice, or the default). */
export async function getPreferences(actor: Actor): Promise<NotificationPreferences> {
  const [rows, user] = await Promise.all([
    NotificationPreference.findAll({ where: { networkId: actor.networkId, userId: actor.id } }),
    User.findOne({ where: { networkId: actor.networkId, id: actor.id }, attributes: ['email'] }),
  ]);
  const chosen = new Map(rows.map((r) => [r.kind, r.email]));
  return {
    email: user?.email ?? '',
    preferences: NOTIFICATION_KINDS.map((kind) => ({
      kind,
      email: chosen.get(kind) ?? NOTIFICATION_EMAIL_DEFAULTS[kind],
      chosen: chosen.has(kind),
      defaultEmail: NOTIFICATION_EMAIL_DEFAULTS[kind],
    })),
  };
}

/** Saves the person's choices (only the kinds given); every kind is valid for everyone, the inbox always gets it. */
export async function setPreferences(actor: Actor, choices: Array<{ kind: NotificationKind; email: boolean }>) {
  await sequelize.transaction(async (transaction) => {
    for (const c of choices) {
      await NotificationPreference.upsert(
        { networkId: actor.networkId, userId: actor.id, kind: c.kind, email: c.email },
        { transaction },
      );
    }
  });
  return getPreferences(actor);
}

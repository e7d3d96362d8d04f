import { Op, QueryTypes, type Transaction } from 'sequelize';
import { config } from '../../config.js';
import { sequelize } from '../../lib/db.js';
import { transport } from '../../lib/mail.js';
import { logger } from '../../lib/logger.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { notFound } from '../../lib/errors.js';
import type { Actor } from '../../lib/auth.js';
import { Membership, Notification, NotificationPreference, OutboxMessage, User } from '../../lib/models.js';
import type { NotificationKind, Role } from '../../../shared/domain.js';

/**
 * Notices: an in-app inbox entry per person and, unless they turned e-mail off for that kind, an e-mail
 * written to the outbox in the caller's transaction. The outbox is sent afterwards (`deliverOutbox`),
 * so a crash between the commit and the send loses nothing, and the row's `sent_at` means a message is
 * sent once.
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
    const optedOut = await NotificationPreference.findAll({
      where: { networkId: input.networkId, userId: { [Op.in]: users.map((u) => u.id) }, kind: input.kind, email: false },
      transaction,
    });
    const quiet = new Set(optedOut.map((p) => p.userId));
    const link = input.link ? `\n\nOpen it in Benchrelay: ${config.appOrigin}${input.link}` : '';
    const rows = users
      .filter((u) => !quiet.has(u.id))
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

/**
 * Sends pending outbox e-mails one at a time: each row is claimed with FOR UPDATE SKIP LOCKED, sent, and
 * marked sent in the same transaction, so two workers never send the same row. A failed send is counted
 * on the row and the call throws, so the queued job retries with backoff. The Message-ID comes from the
 * row id: should a send ever repeat after a crash mid-commit, receiving servers can tell it is the same.
 */
export async function deliverOutbox(options: { dedupePrefix?: string; limit?: number } = {}) {
  const limit = options.limit ?? 500;
  let sent = 0;
  for (let i = 0; i < limit; i++) {
    const outcome = await sequelize.transaction(async (transaction) => {
      const rows = await sequelize.query<{ id: string; network_id: string; payload: OutboxPayload; attempts: number }>(
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
      if (!row) return { kind: 'empty' as const };
      const where = { networkId: row.network_id, id: row.id };
      try {
        await transport.sendMail({
          from: config.smtp.from,
          to: row.payload.to,
          subject: row.payload.subject,
          text: row.payload.text,
          messageId: `<${row.id}@outbox.benchrelay>`,
        });
      } catch (err) {
        await OutboxMessage.update(
          { attempts: row.attempts + 1, lastError: (err as Error).message.slice(0, 500) },
          { where, transaction },
        );
        return { kind: 'failed' as const, error: err as Error };
      }
      await OutboxMessage.update({ attempts: row.attempts + 1, sentAt: new Date() }, { where, transaction });
      return { kind: 'sent' as const };
    });
    if (outcome.kind === 'empty') break;
    if (outcome.kind === 'failed') {
      logger.warn({ err: outcome.error.message }, 'outbox e-mail not sent; will retry');
      throw new Error(`An e-mail could not be sent: ${outcome.error.message}`);
    }
    sent++;
  }
  return { sent };
}

/** The signed-in person's inbox, newest first, with the count still unread. */
export async function listInbox(actor: Actor, options: { limit?: number } = {}) {
  const where = accessibleWhere(actor.ability, 'read', 'Notification');
  if (!where) return { notifications: [], unread: 0 };
  const scope = { ...where, networkId: actor.networkId, userId: actor.id };
  const [rows, unread] = await Promise.all([
    Notification.findAll({ where: scope, order: [['createdAt', 'DESC']], limit: Math.min(options.limit ?? 50, 200) }),
    Notification.count({ where: { ...scope, readAt: null } }),
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
  };
}

export async function markRead(actor: Actor, id: string) {
  // a notice is personal: not even the owner marks someone else's as read
  const row = await Notification.findOne({ where: { networkId: actor.networkId, id, userId: actor.id } });
  if (!row) throw notFound('That notice');
  assertCan(actor.ability, 'update', 'Notification', row.get({ plain: true }));
  if (!row.readAt) await row.update({ readAt: new Date() });
  return { id: row.id, readAt: row.readAt };
}

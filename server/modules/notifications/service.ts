import type { Transaction } from 'sequelize';
import { OutboxMessage } from '../../lib/models.js';
import { sendMail, type OutgoingMail } from '../../lib/mail.js';
import { appQueue } from '../../lib/queue.js';
import { logger } from '../../lib/logger.js';

/**
 * E-mail through the outbox: the message row is written in the same transaction as the change that
 * caused it (a stage move), so a rolled-back change sends nothing and a committed one is never
 * forgotten; after the commit a queued 'deliver-outbox' job sends it. `dedupeKey` makes a repeated
 * step write the message once, and the job id makes a repeated enqueue run once.
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
    appQueue()
      .add('deliver-outbox', { networkId, outboxId: row.id }, {
        jobId: deliverOutboxJobId(row.id),
        attempts: 6,
        backoff: { type: 'exponential', delay: 2000 },
        removeOnComplete: 1000,
      })
      .catch((err: Error) => logger.warn({ err: err.message, outboxId: row.id }, 'could not enqueue an e-mail; it stays in the outbox'));
  });
  return row.id;
}

/** Sends one outbox message unless it went already; records failures for the next attempt. */
export async function deliverOutboxMessage(networkId: string, outboxId: string): Promise<{ sent: boolean; messageId?: string }> {
  const row = await OutboxMessage.findOne({ where: { networkId, id: outboxId } });
  if (!row || row.sentAt) return { sent: false };
  try {
    const messageId = await sendMail(row.payload as unknown as OutgoingMail);
    await OutboxMessage.update({ sentAt: new Date(), attempts: row.attempts + 1, lastError: null }, { where: { networkId, id: outboxId } });
    return { sent: true, messageId };
  } catch (err) {
    await OutboxMessage.update({ attempts: row.attempts + 1, lastError: (err as Error).message.slice(0, 500) }, { where: { networkId, id: outboxId } });
    throw err;
  }
}

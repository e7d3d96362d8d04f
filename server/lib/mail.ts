import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import nodemailer from 'nodemailer';
import { config, type Config } from '../config.js';

/** One message as the local mail catcher stores it (docker-free-dev/mail-catcher.ts writes these). */
export interface CaughtMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** Files sent with the message (the catcher keeps them so tests can read them). */
  attachments?: Array<{ filename: string; contentType: string; size: number; contentBase64: string }>;
}

export interface MailAttachment {
  filename: string;
  contentType: string;
  /** base64: outbox rows keep their message as JSON */
  contentBase64: string;
}

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html?: string;
  attachments?: MailAttachment[];
}

/** nodemailer's shape of the attachments an outbox row keeps. */
export const mailAttachments = (list: MailAttachment[] | undefined) =>
  (list ?? []).map((a) => ({ filename: a.filename, contentType: a.contentType, content: Buffer.from(a.contentBase64, 'base64') }));

const CHECK_TIMEOUT_MS = 2000;

function isLoopbackHost(host: string) {
  return host === 'localhost' || host === '::1' || /^127\.\d+\.\d+\.\d+$/.test(host);
}

function transportOptions(smtp: Config['smtp'], timeoutMs?: number) {
  return {
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    // The loopback catcher has no usable certificate; elsewhere nodemailer upgrades with STARTTLS.
    ignoreTLS: !smtp.secure && isLoopbackHost(smtp.host),
    auth: smtp.user ? { user: smtp.user, pass: smtp.pass ?? '' } : undefined,
    ...(timeoutMs ? { connectionTimeout: timeoutMs, greetingTimeout: timeoutMs, socketTimeout: timeoutMs } : {}),
  };
}

/** A mailer bound to one SMTP configuration; the module exports one bound to `config.smtp`. */
export function createMailer(smtp: Config['smtp']) {
  const transport = nodemailer.createTransport(transportOptions(smtp));

  async function sendMail(mail: OutgoingMail): Promise<string> {
    const { attachments, ...rest } = mail;
    const info = await transport.sendMail({ from: smtp.from, ...rest, attachments: mailAttachments(attachments) });
    return info.messageId;
  }

  /** True when the SMTP server greets us and accepts our login; never throws. */
  async function checkMail(): Promise<boolean> {
    // A separate short-fused transport: the main one's defaults wait minutes for a dead server.
    const probe = nodemailer.createTransport(transportOptions(smtp, CHECK_TIMEOUT_MS));
    let timer: NodeJS.Timeout | undefined;
    try {
      return await Promise.race([
        probe.verify().then(() => true),
        new Promise<boolean>((resolve) => {
          timer = setTimeout(() => resolve(false), CHECK_TIMEOUT_MS + 500);
        }),
      ]);
    } catch {
      return false;
    } finally {
      clearTimeout(timer);
      probe.close();
    }
  }

  return { transport, sendMail, checkMail, close: () => transport.close() };
}

const mailer = createMailer(config.smtp);
export const transport = mailer.transport;
export const sendMail = mailer.sendMail;
export const checkMail = mailer.checkMail;

/**
 * Messages caught by the local mail catcher, newest first. Files still being written or not
 * readable as a message are skipped; a missing folder (nothing caught yet, or production) is empty.
 */
export async function listCaughtMail(directory: string | undefined = config.mailCatcherDir): Promise<CaughtMail[]> {
  if (!directory) return [];
  let names: string[];
  try {
    names = await readdir(directory);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  // File names start with a sortable timestamp, so name order is arrival order.
  const files = names.filter((n) => n.endsWith('.json') && !n.startsWith('.')).sort().reverse();
  const messages: CaughtMail[] = [];
  for (const name of files) {
    try {
      const parsed = JSON.parse(await readFile(path.join(directory, name), 'utf8')) as CaughtMail;
      if (typeof parsed.id === 'string' && Array.isArray(parsed.to)) messages.push(parsed);
    } catch {
      // removed or damaged between readdir and readFile: not a message to show
    }
  }
  return messages;
}

/** Polls the caught-mail folder until a message matches; for tests and development scripts. */
export async function waitForMail(
  predicate: (mail: CaughtMail) => boolean,
  options: { timeoutMs?: number; intervalMs?: number; directory?: string } = {},
): Promise<CaughtMail> {
  const { timeoutMs = 5000, intervalMs = 100, directory = config.mailCatcherDir } = options;
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await listCaughtMail(directory)).find(predicate);
    if (found) return found;
    if (Date.now() >= deadline) {
      throw new Error(`No caught mail matched within ${timeoutMs} ms in ${directory ?? '(no mail catcher directory)'}`);
    }
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
}

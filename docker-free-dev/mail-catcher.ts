import { randomBytes } from 'node:crypto';
import { mkdir, rename, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { CaughtMail } from '../server/lib/mail.js';

/**
 * Local SMTP server that delivers nowhere: every message is written as one JSON file in
 * `directory`, where the development mail page and the tests read it.
 */

export interface MailCatcherOptions {
  port: number;
  directory: string;
}

export interface RunningMailCatcher {
  close(): Promise<void>;
}

export async function startMailCatcher(opts: MailCatcherOptions): Promise<RunningMailCatcher> {
  await mkdir(opts.directory, { recursive: true });
  const nextId = sortableIds();

  const server = new SMTPServer({
    // The certificate built into smtp-server has expired, so offering STARTTLS breaks clients.
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    // Accept whatever credentials a configured client sends: this catcher guards nothing.
    onAuth: (auth, _session, callback) => callback(null, { user: auth.username ?? 'local' }),
    banner: 'Benchrelay local mail catcher (development stand-in)',
    logger: false,
    closeTimeout: 1000,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      store(stream, session.envelope)
        .then(() => callback())
        .catch((err: Error) => callback(err));
    },
  });

  async function store(stream: Readable, envelope: { mailFrom: false | { address: string }; rcptTo: Array<{ address: string }> }) {
    const parsed = await simpleParser(stream);
    const id = nextId();
    const mail: CaughtMail = {
      id,
      receivedAt: new Date().toISOString(),
      from: displayAddress(parsed.from) || (envelope.mailFrom ? envelope.mailFrom.address : ''),
      // The envelope, not the To header: it includes Bcc and is who would really receive it.
      to: envelope.rcptTo.length ? envelope.rcptTo.map((r) => r.address) : headerAddresses(parsed.to),
      subject: parsed.subject ?? '',
      text: parsed.text ?? '',
      html: typeof parsed.html === 'string' ? parsed.html : null,
      attachments: parsed.attachments.map((a) => ({
        filename: a.filename ?? '',
        contentType: a.contentType,
        size: a.size,
        contentBase64: a.content.toString('base64'),
      })),
    };
    // Write then rename so a reader never sees half a file; the dot keeps it out of listings.
    const temporary = path.join(opts.directory, `.${id}.json.tmp`);
    await writeFile(temporary, JSON.stringify(mail, null, 2));
    await rename(temporary, path.join(opts.directory, `${id}.json`));
  }

  await new Promise<void>((resolve, reject) => {
    server.server.once('error', reject);
    server.listen(opts.port, '127.0.0.1', () => {
      server.server.off('error', reject);
      resolve();
    });
  });
  // A client disconnecting mid-message is not a reason to bring the stand-in down.
  server.on('error', (err) => console.error('mail catcher:', err.message));

  return {
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** `Name <address>` without the quotes mailparser's `text` keeps, for the development mail page. */
function displayAddress(from: AddressObject | undefined) {
  const first = from?.value[0];
  if (!first?.address) return from?.text ?? '';
  return first.name ? `${first.name} <${first.address}>` : first.address;
}

function headerAddresses(to: AddressObject | AddressObject[] | undefined) {
  return [to ?? []]
    .flat()
    .flatMap((group) => group.value)
    .map((a) => a.address)
    .filter((a): a is string => Boolean(a));
}

/** `<UTC timestamp>-<sequence>-<random>`: name order is arrival order, even within one millisecond. */
function sortableIds() {
  let lastStamp = '';
  let sequence = 0;
  return () => {
    const stamp = new Date().toISOString().replace(/[-:.]/g, '');
    sequence = stamp === lastStamp ? sequence + 1 : 0;
    lastStamp = stamp;
    return `${stamp}-${String(sequence).padStart(3, '0')}-${randomBytes(4).toString('hex')}`;
  };
}

import { TEST_PORTS, TEST_DATA_DIR } from '../helpers/test-env.js';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { startMailCatcher } from '../../docker-free-dev/mail-catcher.js';

// Its own port and folder, next to the shared test catcher (2535, .data/test-mail), so this file
// can start and stop its catcher while the global setup's is running.
const PORT = TEST_PORTS.spareSmtp;
const DIRECTORY = path.resolve(TEST_DATA_DIR, 'mail-service');
const FROM = 'Benchrelay <no-reply@benchrelay.test>';

type Mail = typeof import('../../server/lib/mail.js');
let mail: Mail;
let catcher: { close(): Promise<void> } | undefined;

async function freePort(): Promise<number> {
  const probe = net.createServer();
  await new Promise<void>((resolve) => probe.listen(0, '127.0.0.1', resolve));
  const { port } = probe.address() as net.AddressInfo;
  await new Promise((resolve) => probe.close(resolve));
  return port;
}

const smtpAt = (port: number) => ({ host: '127.0.0.1', port, secure: false, user: undefined, pass: undefined, from: FROM });

beforeAll(async () => {
  fs.rmSync(DIRECTORY, { recursive: true, force: true });
  catcher = await startMailCatcher({ port: PORT, directory: DIRECTORY });
  // server/config.ts reads the environment when first imported: point it here, then load afresh.
  vi.stubEnv('SMTP_HOST', '127.0.0.1');
  vi.stubEnv('SMTP_PORT', String(PORT));
  vi.stubEnv('MAIL_FROM', FROM);
  vi.stubEnv('MAIL_CATCHER_DIR', DIRECTORY);
  vi.stubEnv('NODE_ENV', 'test');
  vi.resetModules();
  mail = await import('../../server/lib/mail.js');
});

afterAll(async () => {
  mail?.transport.close();
  await catcher?.close();
  vi.unstubAllEnvs();
});

describe('server/lib/mail with the local mail catcher', () => {
  it('delivers a message that can be read back from the catcher folder', async () => {
    const subject = `Instrument ready for pickup ${Date.now()}`;
    const messageId = await mail.sendMail({
      to: ['director@school.test', 'Front Desk <desk@benchrelay.test>'],
      subject,
      text: 'The alto saxophone, serial AS-20417, passed its leak test and is ready.',
      html: '<p>The alto saxophone, serial <b>AS-20417</b>, passed its leak test and is ready.</p>',
    });
    expect(messageId).toMatch(/^<.+@.+>$/);

    const caught = await mail.waitForMail((m) => m.subject === subject, { timeoutMs: 5000 });
    expect(caught.to).toEqual(['director@school.test', 'desk@benchrelay.test']);
    expect(caught.from).toBe('Benchrelay <no-reply@benchrelay.test>');
    expect(caught.text.trim()).toBe('The alto saxophone, serial AS-20417, passed its leak test and is ready.');
    expect(caught.html).toContain('<b>AS-20417</b>');
    expect(Number.isNaN(Date.parse(caught.receivedAt))).toBe(false);
    expect(fs.existsSync(path.join(DIRECTORY, `${caught.id}.json`))).toBe(true);
  });

  it('records a text-only message with html null and leaves no temporary files behind', async () => {
    const subject = `Estimate awaiting approval ${Date.now()}`;
    await mail.sendMail({ to: 'player@example.test', subject, text: 'Please approve the estimate.' });
    const caught = await mail.waitForMail((m) => m.subject === subject);
    expect(caught.html).toBeNull();
    expect(caught.to).toEqual(['player@example.test']);
    expect(fs.readdirSync(DIRECTORY).filter((name) => !name.endsWith('.json') || name.startsWith('.'))).toEqual([]);
  });

  it('lists caught mail newest first and skips files that are not messages', async () => {
    const first = `Relay run first ${Date.now()}`;
    const second = `Relay run second ${Date.now()}`;
    await mail.sendMail({ to: 'a@benchrelay.test', subject: first, text: 'one' });
    await mail.sendMail({ to: 'a@benchrelay.test', subject: second, text: 'two' });
    // sorts after every timestamped name, so it would come first if it were not skipped
    fs.writeFileSync(path.join(DIRECTORY, 'zz-damaged.json'), '{"id": "half a fi');

    const subjects = (await mail.listCaughtMail(DIRECTORY)).map((m) => m.subject);
    expect(subjects.indexOf(second)).toBeGreaterThanOrEqual(0);
    expect(subjects.indexOf(second)).toBeLessThan(subjects.indexOf(first));
    expect(subjects[0]).toBe(second);
    fs.rmSync(path.join(DIRECTORY, 'zz-damaged.json'));
  });

  it('lists nothing for a folder that does not exist', async () => {
    expect(await mail.listCaughtMail(path.join(DIRECTORY, 'missing'))).toEqual([]);
  });

  it('waitForMail gives up with an error when nothing matches', async () => {
    await expect(mail.waitForMail((m) => m.subject === 'never sent', { timeoutMs: 300 })).rejects.toThrow(/No caught mail matched/);
  });

  it('checkMail is true while the SMTP server answers', async () => {
    expect(await mail.checkMail()).toBe(true);
  });

  it('checkMail is false, quickly and without throwing, when nothing listens', async () => {
    const dead = mail.createMailer(smtpAt(await freePort()));
    const started = Date.now();
    expect(await dead.checkMail()).toBe(false);
    expect(Date.now() - started).toBeLessThan(3000);
    dead.close();
  });

  it('sending fails when the SMTP server is down, and the catcher frees its port on close', async () => {
    await catcher!.close();
    catcher = undefined;
    const probe = net.createServer();
    await new Promise<void>((resolve, reject) => {
      probe.once('error', reject);
      probe.listen(PORT, '127.0.0.1', resolve);
    });
    await new Promise((resolve) => probe.close(resolve));

    await expect(mail.sendMail({ to: 'a@benchrelay.test', subject: 'lost', text: 'lost' })).rejects.toThrow();
    expect(await mail.checkMail()).toBe(false);
  });
});

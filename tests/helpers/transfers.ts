import { Op } from 'sequelize';
import {
  HistoryEvent,
  Instrument,
  Job,
  Notification,
  RelayRun,
  Shop,
  ShopSkill,
  Skill,
  Transfer,
} from '../../server/lib/models.js';
import { listCaughtMail, type CaughtMail } from '../../server/lib/mail.js';
import { appQueue } from '../../server/lib/queue.js';
import type { InstrumentFamily, JobStage, Role } from '../../shared/domain.js';
import { makeInstrumentWithJob, makeNetwork, makeUser, uniq } from './factories.js';

/**
 * A small network for transfer tests: Seattle-like origin and Portland-like destination (real city
 * coordinates), a low-saxophone skill at the destination, a relay run between them, and one person in
 * each role that a transfer involves.
 */
export async function makeTransferNetwork() {
  const network = await makeNetwork();
  const networkId = network.id;
  const origin = await Shop.create({
    networkId, name: `Origin ${uniq()}`, code: `O${uniq().slice(0, 5).toUpperCase().replace(/[^A-Z0-9]/g, '1')}`, city: 'Seattle',
    timeZone: 'America/Los_Angeles', latitude: 47.6062, longitude: -122.3321, openingDays: [1, 2, 3, 4, 5], laborRateCents: 9000,
    addressLine: '1 Test Pier',
  });
  const destination = await Shop.create({
    networkId, name: `Destination ${uniq()}`, code: `D${uniq().slice(0, 5).toUpperCase().replace(/[^A-Z0-9]/g, '1')}`, city: 'Portland',
    timeZone: 'America/Los_Angeles', latitude: 45.5152, longitude: -122.6784, openingDays: [2, 3, 4, 5, 6], laborRateCents: 8800,
  });
  const skill = await Skill.create({ networkId, code: `low_sax_${uniq().replace(/-/g, '')}`, name: 'Low saxophones' });
  await ShopSkill.create({ networkId, shopId: destination.id, skillId: skill.id, weeklyBenchHours: 40 });
  const run = await RelayRun.create({
    networkId, fromShopId: origin.id, toShopId: destination.id, weekdays: [1, 2, 3, 4, 5, 6, 7], departureTime: '07:30:00', transitHours: 3.5,
  });
  const person = (roles: Array<{ shopId: string | null; role: Role }>, label: string) =>
    makeUser(networkId, roles, { email: `${label}-${uniq()}@transfers.test`, name: `${label} ${uniq()}` });
  const people = {
    owner: await person([{ shopId: null, role: 'owner' }], 'owner'),
    manager: await person([{ shopId: origin.id, role: 'regional_manager' }, { shopId: destination.id, role: 'regional_manager' }], 'manager'),
    originDesk: await person([{ shopId: origin.id, role: 'front_desk' }], 'origin-desk'),
    originTech: await person([{ shopId: origin.id, role: 'technician' }], 'origin-tech'),
    destinationDesk: await person([{ shopId: destination.id, role: 'front_desk' }], 'destination-desk'),
    destinationTech: await person([{ shopId: destination.id, role: 'technician' }], 'destination-tech'),
    auditor: await person([{ shopId: origin.id, role: 'auditor' }], 'auditor'),
  };
  return { network, networkId, origin, destination, skill, run, people };
}

export type TransferNetwork = Awaited<ReturnType<typeof makeTransferNetwork>>;

/** A job at the origin that needs the skill, on an instrument with a serial unique to this test. */
export async function makeTransferJob(
  world: TransferNetwork,
  over: Partial<{ family: InstrumentFamily; stage: JobStage; estimatedHours: number | null }> = {},
) {
  const serial = `BX-${uniq().toUpperCase()} 7`;
  const { instrument, job } = await makeInstrumentWithJob(world.networkId, world.origin.id, world.people.originDesk.id, {
    family: over.family ?? 'baritone_saxophone',
    stage: over.stage ?? 'approved',
    serial,
    maker: 'Aldmoor',
  });
  await job.update({ requiredSkillId: world.skill.id, estimatedHours: over.estimatedHours === undefined ? 10 : over.estimatedHours });
  return { instrument, job, serial };
}

/** Polls until `check` returns a truthy value (the worker runs on its own schedule). */
export async function waitFor<T>(check: () => Promise<T | null | undefined | false>, what: string, timeoutMs = 30_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`Timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/**
 * Waits until the app queue has nothing waiting or running. Test files run one after another on one
 * queue, and earlier files leave jobs behind (steps of the authorization matrix, e-mails, thumbnails);
 * a running worker works through them first, so a test that times its own steps waits for that.
 */
export function waitForIdleQueue(timeoutMs = 110_000) {
  return waitFor(
    async () => {
      const counts = await appQueue().getJobCounts('waiting', 'active', 'prioritized', 'waiting-children');
      return Object.values(counts).every((n) => n === 0);
    },
    'the queue to be idle',
    timeoutMs,
  );
}

export function waitForState(networkId: string, transferId: string, state: string, timeoutMs?: number) {
  return waitFor(
    async () => {
      const t = await Transfer.findOne({ where: { networkId, id: transferId } });
      return t?.state === state ? t : null;
    },
    `transfer ${transferId} to be ${state}`,
    timeoutMs,
  );
}

/** The step's history event exists once the worker has committed it. */
export function waitForEvent(networkId: string, transferId: string, step: string, timeoutMs?: number) {
  return waitFor(
    () => HistoryEvent.findOne({ where: { networkId, idempotencyKey: `transfer:${transferId}:${step}` } }),
    `history event ${step} of ${transferId}`,
    timeoutMs,
  );
}

export async function transferEvents(networkId: string, transferId: string) {
  return HistoryEvent.findAll({
    where: { networkId, idempotencyKey: { [Op.like]: `transfer:${transferId}:%` } },
    order: [['occurredAt', 'ASC'], ['createdAt', 'ASC']],
  });
}

export async function notificationsFor(networkId: string, userId: string, transferId: string) {
  return Notification.findAll({ where: { networkId, userId, link: `/transfers/${transferId}` }, order: [['createdAt', 'ASC']] });
}

/** Caught mail to one address about one job, oldest first. */
export async function mailFor(email: string, jobNumber: number): Promise<CaughtMail[]> {
  const all = await listCaughtMail();
  return all.filter((m) => m.to.includes(email) && m.subject.includes(`(job ${jobNumber})`)).reverse();
}

export async function waitForMailCount(email: string, jobNumber: number, count: number, timeoutMs = 30_000) {
  return waitFor(
    async () => {
      const mails = await mailFor(email, jobNumber);
      return mails.length >= count ? mails : null;
    },
    `${count} e-mails to ${email} about job ${jobNumber}`,
    timeoutMs,
  );
}

export async function reload<T extends Job | Instrument | Transfer>(row: T): Promise<T> {
  await row.reload();
  return row;
}

/**
 * Text drawn on a PDF page, good enough to find words in a pdfkit manifest: inflates each Flate stream
 * and decodes the hex strings pdfkit writes for the standard fonts.
 */
export async function pdfText(pdf: Buffer): Promise<string> {
  const { inflateSync } = await import('node:zlib');
  const raw = pdf.toString('latin1');
  const out: string[] = [];
  const re = /stream\r?\n/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(raw))) {
    const start = m.index + m[0].length;
    const end = raw.indexOf('endstream', start);
    if (end < 0) break;
    try {
      const content = inflateSync(pdf.subarray(start, end)).toString('latin1');
      for (const hex of content.matchAll(/<([0-9a-fA-F]+)>/g)) out.push(Buffer.from(hex[1], 'hex').toString('latin1'));
      out.push('\n');
    } catch {
      // not a content stream (an image, a font): nothing to read
    }
  }
  return out.join('');
}

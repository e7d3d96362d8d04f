import { checkDatabase } from './db.js';
import { checkStorage } from './storage.js';
import { checkMail } from './mail.js';
import { checkQueue } from './queue.js';

export interface HealthReport {
  ok: boolean;
  db: 'up' | 'down';
  storage: 'up' | 'down';
  mail: 'up' | 'down';
  queue: 'up' | 'down';
}

/** Each part is really exercised: a query, a HeadBucket, an SMTP handshake, a queue count. */
export async function healthReport(): Promise<HealthReport> {
  const [db, storage, mail, queue] = await Promise.all([checkDatabase(), checkStorage(), checkMail(), checkQueue()]);
  const status = (up: boolean): 'up' | 'down' => (up ? 'up' : 'down');
  return {
    ok: db && storage && mail && queue,
    db: status(db),
    storage: status(storage),
    mail: status(mail),
    queue: status(queue),
  };
}

/**
 * The health report for anyone who asks, without an SMTP handshake and a bucket lookup per request:
 * callers within `ttlMs` of the last finished check get its answer (a part that was down stays down
 * until the next check), and callers while a check runs wait for that same check.
 */
export function cachedHealthReport(ttlMs: number, check: () => Promise<HealthReport> = healthReport) {
  let last: { at: number; report: HealthReport } | undefined;
  let running: Promise<HealthReport> | undefined;
  return function report(): Promise<HealthReport> {
    if (last && Date.now() - last.at < ttlMs) return Promise.resolve(last.report);
    running ??= check()
      .then((fresh) => {
        last = { at: Date.now(), report: fresh };
        return fresh;
      })
      .finally(() => {
        running = undefined;
      });
    return running;
  };
}

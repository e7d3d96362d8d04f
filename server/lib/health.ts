import { checkDatabase } from './db.js';
import { checkStorage } from './storage.js';
import { checkMail } from './mail.js';
import { checkQueue } from './queue.js';

/** Each part is really exercised: a query, a HeadBucket, an SMTP handshake, a queue count. */
export async function healthReport() {
  const [db, storage, mail, queue] = await Promise.all([checkDatabase(), checkStorage(), checkMail(), checkQueue()]);
  const status = (up: boolean) => (up ? 'up' : 'down');
  return {
    ok: db && storage && mail && queue,
    db: status(db),
    storage: status(storage),
    mail: status(mail),
    queue: status(queue),
  };
}

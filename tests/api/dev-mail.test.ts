import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { sendMail, waitForMail } from '../../server/lib/mail.js';
import { closeServerResources } from '../helpers/close.js';
import { uniq } from '../helpers/factories.js';

describe('development mail page API', () => {
  afterAll(closeServerResources);

  it('lists mail the local catcher received, newest first', async () => {
    const subject = `Your flute is ready (${uniq()})`;
    await sendMail({ to: 'band.director@example.test', subject, text: 'Pick it up any weekday.' });
    await waitForMail((m) => m.subject === subject, { timeoutMs: 5000 });
    const res = await request(buildApp()).get('/api/dev/mail').expect(200);
    expect(res.body.messages[0]).toMatchObject({ subject, to: ['band.director@example.test'] });
    expect(res.body.messages[0].text).toContain('Pick it up');
  });
});

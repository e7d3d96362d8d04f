import { afterAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import { listRoutes } from '../helpers/list-routes.js';
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

  it('does not exist in an app built with the production configuration, even with the catcher\'s settings', async () => {
    const production = loadConfig({ ...process.env, NODE_ENV: 'production' });
    const app = buildApp({ config: production });
    expect(listRoutes(app)).not.toContain('GET /api/dev/mail');
    const res = await request(app).get('/api/dev/mail').expect(404);
    expect(res.body.messages).toBeUndefined();
    expect(res.body.error.code).toBe('not_found');
  });

  it('does not exist while mail goes to an SMTP server that is not the local catcher', async () => {
    const app = buildApp({ config: loadConfig({ ...process.env, SMTP_HOST: 'smtp.mail.example' }) });
    await request(app).get('/api/dev/mail').expect(404);
  });
});

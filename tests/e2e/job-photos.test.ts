import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import type { Browser } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { makeInstrumentWithJob } from '../helpers/factories.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { Attachment, Shop, User } from '../../server/lib/models.js';
import { startWorker } from '../../workers/processors.js';

/** A technician at the bench, on a phone: opens a job, adds a before and an after photo, compares them. */
describe('browser: before and after photos from a phone', () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };
  let worker: ReturnType<typeof startWorker>;
  let job: { id: string; number: number };
  const technician = demoPeople[3]; // technician at Portland, front desk at Seattle

  beforeAll(async () => {
    const { networkId } = await loadDemoNetwork();
    const portland = (await Shop.findOne({ where: { networkId, code: 'PDX' } }))!;
    const mateo = (await User.findOne({ where: { networkId, email: technician.email } }))!;
    const made = await makeInstrumentWithJob(networkId, portland.id, mateo.id, { stage: 'on_bench', family: 'alto_saxophone', maker: 'Aldmoor' });
    await made.job.update({ assignedUserId: mateo.id, promisedOn: '2099-01-05' });
    job = made.job;
    app = await startAppServer();
    worker = startWorker(2);
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await worker?.close();
    await closeServerResources();
  });

  const photo = (colour: { r: number; g: number; b: number }) =>
    sharp({ create: { width: 1200, height: 900, channels: 3, background: colour } }).jpeg({ quality: 80 }).toBuffer();

  it('opens the job from my bench, attaches before and after photos (one after a dropped connection) and sees the comparison', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(technician.name));

    await page.getByRole('button', { name: 'Menu' }).tap();
    await page.getByRole('link', { name: 'My bench' }).tap();
    await page.getByRole('heading', { name: 'My bench' }).waitFor();
    await page.getByRole('link', { name: new RegExp(`Job ${job.number}\\b`) }).tap();
    await page.getByRole('heading', { level: 1, name: `Job ${job.number}` }).waitFor();

    // the camera button opens the phone's camera: an image input with capture
    const camera = page.getByLabel('Take before photo');
    expect(await camera.getAttribute('capture')).toBe('environment');
    expect(await camera.getAttribute('accept')).toBe('image/*');
    await page.getByPlaceholder(/Caption/).fill('Pads hardened, low B leaking');
    await camera.setInputFiles({ name: 'before.jpg', mimeType: 'image/jpeg', buffer: await photo({ r: 120, g: 96, b: 60 }) });
    await page.getByRole('img', { name: 'Before photo: Pads hardened, low B leaking' }).waitFor();

    // the after photo: the connection drops during the first upload, then a retry gets it through
    await page.getByText('After', { exact: true }).first().tap();
    let dropped = 0;
    await page.route(/\/networks\/.*\/photo\.jpg\?/, async (route) => {
      if (route.request().method() === 'PUT' && dropped === 0) {
        dropped++;
        return route.abort('internetdisconnected');
      }
      return route.continue();
    });
    await page.getByLabel('Take after photo').setInputFiles({ name: 'after.jpg', mimeType: 'image/jpeg', buffer: await photo({ r: 222, g: 184, b: 64 }) });
    await page.getByText('The upload did not get through').waitFor();
    await page.getByRole('button', { name: 'Retry upload' }).tap();
    await page.getByRole('img', { name: 'After photo' }).waitFor();
    expect(dropped).toBe(1);

    const comparison = page.getByRole('figure', { name: 'Before and after' });
    await comparison.waitFor();
    const before = comparison.getByRole('img', { name: /^Before:/ });
    const after = comparison.getByRole('img', { name: /^After:/ });
    await expect.poll(() => before.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(1200);
    await expect.poll(() => after.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBe(1200);
    // the slider reveals more of the after photo
    const slider = comparison.getByRole('slider', { name: 'Slide between before and after' });
    await slider.fill('20');
    expect(await after.evaluate((img: HTMLElement) => img.style.clipPath)).toBe('inset(0px 0px 0px 20%)');
    // nothing overflows the phone's width
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

    const stored = await Attachment.findAll({ where: { jobId: job.id, status: 'stored' }, order: [['createdAt', 'ASC']] });
    expect(stored.map((a) => a.tag)).toEqual(['before', 'after']);
    await context.close();
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { QueryTypes } from 'sequelize';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { sequelize } from '../../server/lib/models.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { mkdirSync } from 'node:fs';

const SHOTS = process.env.SHOTS_DIR ?? '/tmp/shots-ui';

/** The front desk at Seattle types a serial the way it is written on a school's sheet and reads its history. */
describe('browser: the shared registry at the front desk', () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };
  const desk = demoPeople[2]; // front desk at Seattle

  beforeAll(async () => {
    await loadDemoNetwork();
    app = await startAppServer();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await closeServerResources();
  });

  it('searches a serial with history at another shop and sees one timeline across the shops', async () => {
    // an instrument of the demo network with history at a shop other than Seattle (and at least two shops)
    const [pick] = await sequelize.query<{ id: string; serial: string; other_shop: string }>(
      `select i.id, i.serial, min(s.name) filter (where s.code <> 'SEA') as other_shop
         from instruments i
         join networks n on n.id = i.network_id and n.slug = 'demo'
         join history_events h on h.network_id = i.network_id and h.instrument_id = i.id
         join shops s on s.network_id = h.network_id and s.id = h.shop_id
        group by i.id, i.serial
       having count(distinct h.shop_id) >= 2 and bool_or(s.code <> 'SEA')
        order by i.serial limit 1`,
      { type: QueryTypes.SELECT },
    );
    expect(pick).toBeTruthy();
    // typed as a person would: lower case, the separators changed
    const typed = pick.serial.toLowerCase().replace(/[\s./_-]+/g, ' ').replace(/^(\w{2})/, '$1-');

    const page = await browser.newPage();
    await signInInBrowser(page, app.url, new RegExp(desk.name));
    await page.getByRole('link', { name: 'Registry' }).first().click();
    await page.getByRole('heading', { name: 'Registry' }).waitFor();
    await page.getByRole('combobox', { name: /serial number/i }).fill(typed);
    const first = page.getByRole('listbox', { name: 'Matching instruments' }).getByRole('option').first();
    await first.waitFor();
    expect(await first.innerText()).toContain(pick.serial);
    expect(await first.innerText()).toMatch(/Exact serial/);
    await page.getByRole('combobox', { name: /serial number/i }).press('Enter');

    await page.getByRole('heading', { name: 'History across all shops' }).waitFor();
    expect(page.url()).toContain(`/registry/instruments/${pick.id}`);
    const timeline = page.getByRole('list', { name: 'Timeline' });
    await timeline.waitFor();
    const text = await timeline.innerText();
    expect(text).toContain(pick.other_shop);
    expect(text).toMatch(/Checked in at/);
    // times are in the viewer's shop clock, Seattle's
    expect(await page.getByText(/Harborline Seattle’s time/).count()).toBe(1);
    expect(text).toMatch(/PST|PDT/);

    // filter: only intakes
    await page.getByRole('button', { name: 'Intakes' }).click();
    await page.waitForFunction(() => {
      const items = [...document.querySelectorAll('[aria-label="Timeline"] > li')];
      return items.length > 0 && items.every((li) => li.getAttribute('data-kind') === 'intake');
    });
    await page.close();
  });

  it('takes a new instrument in on a phone: register, new customer, open the job', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(desk.name));
    await page.getByRole('button', { name: 'Menu' }).click();
    await page.getByRole('link', { name: 'Intake' }).click();
    await page.getByRole('heading', { name: 'Which instrument?' }).waitFor();

    const serial = `NW-${Date.now() % 1_000_000}`;
    await page.getByRole('combobox', { name: /serial number/i }).fill(serial);
    await page.getByText(/No instrument in the network matches/).waitFor();
    await page.getByRole('button', { name: /as a new instrument/ }).click();
    await page.getByLabel(/^Family/).selectOption('flute');
    await page.getByLabel(/^Maker/).fill('Quellstone');
    await page.getByLabel(/^Model/).fill('Brookmint Student');
    await page.getByLabel(/^Owned by/).selectOption('customer');
    await page.getByRole('button', { name: 'Continue' }).click();

    await page.getByRole('heading', { name: 'Who brought it in?' }).waitFor();
    await page.getByRole('button', { name: 'Add a new customer' }).click();
    await page.getByLabel(/^Name/).fill('Tamsin Oduya');
    await page.getByLabel(/^Phone/).fill('+1 206 555 0199');
    await page.getByRole('button', { name: 'Continue' }).click();

    await page.getByRole('heading', { name: /Open the job at Harborline Seattle/ }).waitFor();
    await page.getByRole('button', { name: 'Open the job' }).click();
    await page.getByText('Write what the customer reports.').waitFor(); // the same rule as the server
    await page.getByLabel(/^What the customer reports/).fill('Will not play below middle C.');
    await page.getByRole('button', { name: 'Open the job' }).click();
    const done = page.getByRole('heading', { name: /Job \d+ is open at Harborline Seattle/ });
    await done.waitFor();

    await page.getByRole('link', { name: /See the instrument’s history/ }).click();
    await page.getByRole('heading', { name: 'History across all shops' }).waitFor();
    const text = await page.getByRole('list', { name: 'Timeline' }).innerText();
    expect(text).toContain('Checked in at Harborline Seattle: Will not play below middle C.');
    expect(text).toContain('Registered at Harborline Seattle');
    // the desk that served the new customer sees their phone number
    expect(await page.getByText('+1 206 555 0199').count()).toBe(1);
    await context.close();
  });
  it('warns at step 1 when maker and serial are already registered, takes that one in, and shows a server refusal at its field', async () => {
    mkdirSync(SHOTS, { recursive: true });
    // a Seattle instrument with no open job, and another instrument's asset tag
    const [known] = await sequelize.query<{ id: string; maker: string; serial: string }>(
      `select i.id, i.maker, i.serial from instruments i
         join networks n on n.id = i.network_id and n.slug = 'demo'
        where not exists (select 1 from jobs j where j.network_id = i.network_id and j.instrument_id = i.id and j.stage <> 'released')
        order by i.serial limit 1`,
      { type: QueryTypes.SELECT },
    );
    const [tagged] = await sequelize.query<{ asset_tag: string }>(
      `select i.asset_tag from instruments i join networks n on n.id = i.network_id and n.slug = 'demo'
        where i.asset_tag is not null and i.id <> :id order by i.serial limit 1`,
      { type: QueryTypes.SELECT, replacements: { id: known.id } },
    );
    for (const width of [1280, 390]) {
      const context = await browser.newContext({ viewport: { width, height: 900 } });
      const page = await context.newPage();
      await signInInBrowser(page, app.url, new RegExp(desk.name));
      page.setDefaultTimeout(30_000);
      await page.goto(`${app.url}/intake`);
      await page.getByRole('heading', { name: 'Which instrument?' }).waitFor();
      await page.getByRole('combobox', { name: /serial number/i }).fill(`${known.serial}-X`);
      await page.getByRole('button', { name: /as a new instrument/ }).click();
      // the serial of the one on record, typed with a quick Continue that must not outrun the lookup
      await page.getByLabel(/^Serial number as engraved/).fill(known.serial.toLowerCase());
      await page.getByLabel(/^Maker/).fill(known.maker.toUpperCase());
      await page.getByLabel(/^Owned by/).selectOption('rental_fleet');
      await page.getByRole('button', { name: 'Continue' }).click();
      const warning = page.getByRole('alert').filter({ hasText: 'is already in the registry' });
      await warning.waitFor();
      expect(await page.getByRole('heading', { name: 'Which instrument?' }).count()).toBe(1);
      await page.screenshot({ path: `${SHOTS}/intake-duplicate-${width}.png`, fullPage: true });
      if (width === 390) {
        expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
        await context.close();
        continue;
      }
      await warning.getByRole('button', { name: 'Use that one' }).click();
      await page.getByRole('heading', { name: 'Who brought it in?' }).waitFor();
      await page.getByText(`SN ${known.serial} · at`, { exact: false }).waitFor();

      // a new instrument whose asset tag is taken: the server refuses at the last step, the screen goes back to its field
      await page.getByRole('button', { name: 'Change' }).first().click();
      await page.getByRole('heading', { name: 'Which instrument?' }).waitFor();
      const serial = `DUP-${Date.now() % 1_000_000}`;
      await page.getByRole('combobox', { name: /serial number/i }).fill(serial);
      await page.getByRole('button', { name: /as a new instrument/ }).click();
      await page.getByLabel(/^Maker/).fill('Quellstone');
      await page.getByLabel(/^Asset tag/).fill(tagged.asset_tag);
      await page.getByLabel(/^Owned by/).selectOption('rental_fleet');
      await page.getByRole('button', { name: 'Continue' }).click();
      await page.getByRole('heading', { name: 'Who brought it in?' }).waitFor();
      await page.getByRole('radio', { name: /No customer/ }).check();
      await page.getByRole('button', { name: 'Continue' }).click();
      await page.getByLabel(/^What the customer reports/).fill('Sticky G sharp key.');
      await expect.poll(() => page.getByText('19 / 2000').count()).toBe(1); // the limit is in view before submit
      await page.getByRole('button', { name: 'Open the job' }).click();
      await page.getByRole('heading', { name: 'Which instrument?' }).waitFor();
      const tag = page.getByLabel(/^Asset tag/);
      expect(await tag.getAttribute('aria-invalid')).toBe('true');
      await page.getByText('This asset tag is already on another instrument.').waitFor();
      await page.screenshot({ path: `${SHOTS}/intake-refusal-${width}.png`, fullPage: true });
      // a stale message goes as soon as the field changes
      await tag.fill('');
      expect(await page.getByText('This asset tag is already on another instrument.').count()).toBe(0);
      await context.close();
    }
  }, 240_000);
});

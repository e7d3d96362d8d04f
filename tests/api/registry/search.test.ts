import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Instrument, Job } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/**
 * The registry's serial search, against the real app and database: forgiving about how a serial is
 * typed, ranked exact → prefix → near miss, and limited to what the person may read.
 */
describe('GET /api/instruments/search', () => {
  const app = buildApp();
  let deskCookie: string;
  let auditorCookie: string;
  let ownerCookie: string;
  let target: Instrument;
  let shopA: { id: string; name: string };
  let shopB: { id: string; name: string };
  let openJobNumber: number;

  const search = (cookie: string, q: string, extra: Record<string, string> = {}) =>
    request(app).get('/api/instruments/search').query({ q, ...extra }).set('Cookie', cookie).expect(200);

  beforeAll(async () => {
    const net = await makeNetwork();
    shopA = await makeShop(net.id, { name: 'Alder Street bench' });
    shopB = await makeShop(net.id, { name: 'Birch Road bench' });
    const owner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const desk = await makeUser(net.id, [{ shopId: shopA.id, role: 'front_desk' }]);
    const auditor = await makeUser(net.id, [{ shopId: shopB.id, role: 'auditor' }]);
    const add = (serial: string, maker: string, over: Partial<{ shop: string; family: 'alto_saxophone' | 'trumpet' | 'flute'; tag: string }> = {}) =>
      Instrument.create({
        networkId: net.id, family: over.family ?? 'alto_saxophone', maker, model: 'Fenlark Alto', serial, ownerKind: 'rental_fleet',
        currentShopId: over.shop ?? shopA.id, assetTag: over.tag ?? null,
      });
    target = await add('AB-104 233', 'Aldmoor', { tag: 'SCH-0042' });
    await add('AB1042330', 'Aldmoor'); // longer serial that starts with the target's
    await add('AB-104 234', 'Aldmoor'); // one digit away
    await add('7719204', 'Skelmire Winds', { shop: shopB.id });
    await add('7719204', 'Corvell Band Works', { family: 'trumpet', shop: shopB.id }); // same serial, other maker
    await add('XQ-AB 104 233', 'Quellstone', { family: 'flute' }); // contains the target's digits
    for (let n = 0; n < 30; n++) await add(`ZZ-${String(n).padStart(4, '0')}`, 'Tamsin Vale', { family: 'flute' });
    const job = await Job.create({
      networkId: net.id, number: 501, instrumentId: target.id, shopId: shopA.id, stage: 'on_bench', complaint: 'Leaks', openedByUserId: owner.id,
    });
    openJobNumber = job.number;

    // another network with the very same serial: never visible
    const other = await makeNetwork();
    const otherShop = await makeShop(other.id);
    await Instrument.create({ networkId: other.id, family: 'alto_saxophone', maker: 'Aldmoor', serial: 'AB104233', ownerKind: 'rental_fleet', currentShopId: otherShop.id });

    ownerCookie = await signIn(app, owner.email);
    deskCookie = await signIn(app, desk.email);
    auditorCookie = await signIn(app, auditor.email);
  });
  afterAll(closeServerResources);

  it('finds the same instrument however the serial is typed: case, spaces, dashes, dots, slashes', async () => {
    for (const typed of ['AB-104 233', 'ab104233', 'Ab 104-233', 'ab.104.233', 'AB/104/233', '  ab104 233  ', 'ＡＢ１０４２３３']) {
      const res = await search(deskCookie, typed);
      expect(res.body.results[0], typed).toMatchObject({ id: target.id, match: 'exact' });
    }
  });

  it('ranks the exact match first, then serials that start with it, then near misses', async () => {
    const res = await search(deskCookie, 'ab104233');
    const serials = res.body.results.map((r: { serial: string }) => r.serial);
    expect(serials[0]).toBe('AB-104 233');
    expect(res.body.results[1]).toMatchObject({ serial: 'AB1042330', match: 'prefix' });
    expect(res.body.results.find((r: { serial: string }) => r.serial === 'XQ-AB 104 233')).toMatchObject({ match: 'contains' });
    // the near miss: AB-104 234 is one digit away, listed after the literal matches
    const kinds = res.body.results.map((r: { match: string }) => r.match);
    expect(res.body.results.at(-1)).toMatchObject({ serial: 'AB-104 234', match: 'similar' });
    expect(kinds).toEqual(['exact', 'prefix', 'contains', 'similar']);
    // the other network's AB104233 is not there
    expect(res.body.results.filter((r: { serialNormalized: string }) => r.serialNormalized === 'AB104233')).toHaveLength(1);
  });

  it('finds the instrument from a serial with one character wrong', async () => {
    const res = await search(deskCookie, 'AB-104 283'); // the last-but-one digit mistyped
    const ids = res.body.results.map((r: { id: string }) => r.id);
    expect(ids).toContain(target.id);
    expect(res.body.results.find((r: { id: string }) => r.id === target.id).match).toBe('similar');
    const swapped = await search(deskCookie, 'AB1O4233'); // letter O for zero
    expect(swapped.body.results.map((r: { id: string }) => r.id)).toContain(target.id);
  });

  it('answers while typing: a few characters list the serials that start with them', async () => {
    const res = await search(deskCookie, 'ab-10');
    const kinds = res.body.results.map((r: { match: string }) => r.match);
    expect(kinds).toEqual(['prefix', 'prefix', 'prefix', 'contains']); // starts-with before fragments
    for (const r of res.body.results.slice(0, 3)) expect(r.serialNormalized.startsWith('AB10')).toBe(true);
    expect(res.body.results[3].serial).toBe('XQ-AB 104 233');
  });

  it('finds an asset tag exactly', async () => {
    const res = await search(deskCookie, 'sch-0042');
    expect(res.body.results[0]).toMatchObject({ id: target.id, match: 'asset_tag' });
  });

  it('gives family, maker, model, current shop and open job with each result', async () => {
    const res = await search(deskCookie, 'AB104233');
    expect(res.body.results[0]).toMatchObject({
      family: 'alto_saxophone', maker: 'Aldmoor', model: 'Fenlark Alto',
      currentShop: { id: shopA.id, name: 'Alder Street bench' },
      openJob: { number: openJobNumber, stage: 'on_bench', shopId: shopA.id, shopName: 'Alder Street bench' },
    });
    const none = await search(deskCookie, 'AB1042330');
    expect(none.body.results[0].openJob).toBeNull();
  });

  it('shows both makers of a shared serial, and filters by family', async () => {
    const both = await search(deskCookie, '7719204');
    expect(both.body.results.map((r: { maker: string }) => r.maker).sort()).toEqual(['Corvell Band Works', 'Skelmire Winds']);
    const trumpets = await search(deskCookie, '7719204', { family: 'trumpet' });
    expect(trumpets.body.results.map((r: { maker: string }) => r.maker)).toEqual(['Corvell Band Works']);
  });

  it('an auditor finds only what their shop holds', async () => {
    expect((await search(auditorCookie, 'AB104233')).body.results).toEqual([]);
    expect((await search(auditorCookie, '7719204')).body.results).toHaveLength(2);
  });

  it('lists by filter alone, in serial order', async () => {
    const res = await search(ownerCookie, '', { family: 'flute', limit: '5' });
    expect(res.body.results.map((r: { serial: string }) => r.serial)).toEqual(['XQ-AB 104 233', 'ZZ-0000', 'ZZ-0001', 'ZZ-0002', 'ZZ-0003'].sort());
  });

  it('warns about the same serial under another maker before registering', async () => {
    const res = await request(app)
      .get('/api/instruments/serial-check')
      .query({ serial: '77-19-204', maker: 'skelmire  winds' })
      .set('Cookie', deskCookie)
      .expect(200);
    expect(res.body.sameMaker).toMatchObject({ maker: 'Skelmire Winds' });
    expect(res.body.otherMakers.map((r: { maker: string }) => r.maker)).toEqual(['Corvell Band Works']);
  });

  it('exports what a search found as CSV, in columns the import reads back', async () => {
    const res = await request(app).get('/api/instruments/export.csv').query({ q: '7719204' }).set('Cookie', deskCookie).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="instruments-/);
    const lines = res.text.replace(/^\uFEFF/, '').trim().split(/\r?\n/);
    expect(lines[0]).toBe('Serial number,Maker,Model,Family,Asset tag,Status,Current shop,Open job,Job stage');
    expect(lines).toHaveLength(3);
    expect(lines.slice(1).join('\n')).toContain('7719204,Corvell Band Works,Fenlark Alto,Trumpet');
  });

  it('refuses bad input and strangers', async () => {
    await request(app).get('/api/instruments/search').query({ q: 'x', limit: '500' }).set('Cookie', deskCookie).expect(400);
    await request(app).get('/api/instruments/search').query({ q: 'AB104233' }).expect(401);
  });
});

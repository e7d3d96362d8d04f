import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { config } from '../../server/config.js';
import { Attachment, Transfer } from '../../server/lib/models.js';
import { putObject } from '../../server/lib/storage.js';
import { backup, listKeys, readObject, restore, RestoreRefused, s3Client, tableCounts } from '../../server/ops/archive.js';
import { closeServerResources } from '../helpers/close.js';
import { makeBenchWorld } from '../helpers/bench-world.js';
import { makeInstrumentWithJob, uniq } from '../helpers/factories.js';
import { TEST_DATA_DIR } from '../helpers/test-env.js';
import { buildApp } from '../../server/app.js';

/**
 * A network with jobs, a transfer and stored files is backed up into one archive and restored into a
 * fresh database and a fresh bucket: every table has the same number of rows, every object the same
 * sha256. A restore into a target that is not empty is refused unless forced.
 */
describe('backup and restore', () => {
  const app = buildApp();
  const slot = Number(process.env.TEST_SLOT ?? 0);
  const freshDb = `benchrelay_restore${slot ? `_${slot}` : ''}`;
  const freshUrl = config.databaseUrl.replace(/\/[^/]+$/, `/${freshDb}`);
  const freshBucket = `benchrelay-restore-${uniq()}`.toLowerCase().slice(0, 60);
  const archive = path.resolve(TEST_DATA_DIR, `backup-${uniq()}.tar`);
  const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex');

  beforeAll(async () => {
    execFileSync('bash', ['docker-free-dev/postgres.sh', 'reset-db', freshDb], { stdio: 'ignore' });
    const w = await makeBenchWorld(app, []);
    for (let i = 0; i < 5; i++) {
      const { instrument, job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'on_bench' });
      const bytes = Buffer.from(`%PDF-1.4\n% pad map sheet ${i} ${uniq()}\n%%EOF\n`);
      const key = `networks/${w.network.id}/jobs/${job.id}/${uniq()}/document.pdf`;
      await putObject(key, bytes, 'application/pdf');
      await Attachment.create({
        networkId: w.network.id, jobId: job.id, instrumentId: instrument.id, shopId: w.shop.id, kind: 'document', objectKey: key,
        contentType: 'application/pdf', sizeBytes: bytes.length, status: 'stored', uploadedByUserId: w.people.front_desk.id,
      });
      if (i === 0) {
        await Transfer.create({
          networkId: w.network.id, jobId: job.id, instrumentId: instrument.id, fromShopId: w.shop.id, toShopId: w.otherShop.id,
          reason: 'Needs the flute bench', requestedByUserId: w.people.owner.id,
        });
      }
    }
  });

  afterAll(async () => {
    fs.rmSync(archive, { force: true });
    await closeServerResources();
    execFileSync('bash', ['docker-free-dev/postgres.sh', 'reset-db', freshDb], { stdio: 'ignore' });
  });

  it('brings back every row and every object, checked by count and checksum', { timeout: 120_000 }, async () => {
    const source = { databaseUrl: config.databaseUrl, s3: config.s3 };
    const target = { databaseUrl: freshUrl, s3: { ...config.s3, bucket: freshBucket } };
    const before = await tableCounts(source.databaseUrl);
    const manifest = await backup(source, archive);
    expect(fs.statSync(archive).size).toBeGreaterThan(0);
    expect(manifest.database.tables).toEqual(before);
    expect(manifest.objects.length).toBeGreaterThanOrEqual(5);

    await restore(target, archive);

    // every table, same rows (the test database is quiet: no worker runs in this file)
    expect(await tableCounts(target.databaseUrl)).toEqual(before);
    // every object, same bytes
    const client = s3Client(config.s3);
    const sourceKeys = (await listKeys(client, config.s3.bucket)).sort();
    const restoredKeys = (await listKeys(client, freshBucket)).sort();
    expect(restoredKeys).toEqual(sourceKeys);
    for (const key of sourceKeys) {
      const [a, b] = await Promise.all([readObject(client, config.s3.bucket, key), readObject(client, freshBucket, key)]);
      expect(sha(b.body), key).toBe(sha(a.body));
      expect(b.contentType, key).toBe(a.contentType);
    }
    client.destroy();

    // a second restore into the now filled target is refused, and leaves it as it is
    await expect(restore(target, archive)).rejects.toThrow(RestoreRefused);
    await expect(restore(target, archive)).rejects.toThrow(/not empty/);
    expect(await tableCounts(target.databaseUrl)).toEqual(before);
    // --force replaces it
    await restore(target, archive, { force: true });
    expect(await tableCounts(target.databaseUrl)).toEqual(before);
  });

  it('refuses a damaged archive before writing anything', { timeout: 60_000 }, async () => {
    const damaged = `${archive}.damaged.tar`;
    const work = fs.mkdtempSync(path.join(path.dirname(archive), 'damaged-'));
    execFileSync('tar', ['-xf', archive, '-C', work]);
    const dump = path.join(work, 'database.dump');
    const bytes = fs.readFileSync(dump);
    bytes[bytes.length - 10] ^= 0xff;
    fs.writeFileSync(dump, bytes);
    execFileSync('tar', ['-cf', damaged, '-C', work, '.']);
    const emptyBucket = `${freshBucket}-x`.slice(0, 60);
    execFileSync('bash', ['docker-free-dev/postgres.sh', 'reset-db', freshDb], { stdio: 'ignore' });
    await expect(restore({ databaseUrl: freshUrl, s3: { ...config.s3, bucket: emptyBucket } }, damaged)).rejects.toThrow(/checksum/);
    expect(Object.keys(await tableCounts(freshUrl))).toEqual([]);
    fs.rmSync(work, { recursive: true, force: true });
    fs.rmSync(damaged, { force: true });
  });
});

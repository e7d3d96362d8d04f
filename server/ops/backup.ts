import path from 'node:path';
import { config } from '../config.js';
import { backup } from './archive.js';

/**
 * `npm run backup [-- --out FILE]`: one archive of the database at DATABASE_URL and every object of
 * the bucket (server/ops/archive.ts). Default file: .data/backups/benchrelay-<UTC time>.tar
 */
const args = process.argv.slice(2);
const outAt = args.indexOf('--out');
const stamp = new Date().toISOString().replace(/[-:]/g, '').replace(/\..*/, '').replace('T', '-');
const out = outAt >= 0 ? args[outAt + 1] : path.join('.data', 'backups', `benchrelay-${stamp}.tar`);

const started = Date.now();
const manifest = await backup({ databaseUrl: config.databaseUrl, s3: config.s3 }, out);
const rows = Object.values(manifest.database.tables).reduce((a, b) => a + b, 0);
console.log(
  `Backup written to ${out}: ${Object.keys(manifest.database.tables).length} tables (${rows} rows), ` +
    `${manifest.objects.length} objects (${manifest.objects.reduce((a, o) => a + o.bytes, 0)} bytes), in ${((Date.now() - started) / 1000).toFixed(1)} s.`,
);

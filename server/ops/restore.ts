import { config } from '../config.js';
import { restore, RestoreRefused } from './archive.js';

/**
 * `npm run restore -- FILE [--force]`: brings an archive made by `npm run backup` into the database at
 * DATABASE_URL and the bucket S3_BUCKET. Both must be empty unless --force.
 */
const args = process.argv.slice(2);
const file = args.find((a) => !a.startsWith('--'));
if (!file) {
  console.error('Usage: npm run restore -- FILE.tar [--force]');
  process.exit(2);
}
try {
  const { tables, objects } = await restore({ databaseUrl: config.databaseUrl, s3: config.s3 }, file, { force: args.includes('--force') });
  console.log(`Restored ${file}: ${tables} tables, ${objects} objects into bucket ${config.s3.bucket}.`);
} catch (err) {
  if (err instanceof RestoreRefused) {
    console.error(err.message);
    process.exit(1);
  }
  throw err;
}

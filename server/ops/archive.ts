import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import {
  CreateBucketCommand,
  GetObjectCommand,
  HeadBucketCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import pg from 'pg';
import type { Config } from '../config.js';

/**
 * One archive holds a whole Benchrelay system: the database (pg_dump, custom format, one snapshot),
 * every stored object of the bucket, and manifest.json with the sha256 of each and the row count of
 * every table at the snapshot. It is a plain tar file:
 *
 *   manifest.json   database.dump   objects/<key>
 *
 * The database is dumped first, then the objects are read: an object written meanwhile is kept too
 * (harmless), and no object a dumped row names can be missing, because stored objects are never
 * overwritten in place (every attachment and manifest has a key of its own).
 */

const run = promisify(execFile);

export interface ArchiveTarget {
  databaseUrl: string;
  s3: Config['s3'];
}

export interface Manifest {
  format: 'benchrelay-backup-1';
  createdAt: string;
  database: { file: 'database.dump'; sha256: string; bytes: number; tables: Record<string, number> };
  bucket: string;
  objects: Array<{ key: string; bytes: number; sha256: string; contentType: string | null }>;
}

const sha256 = (data: Buffer) => createHash('sha256').update(data).digest('hex');

/** PostgreSQL's own client programs (Debian's postgresql package), found the way docker-free-dev/postgres.sh finds them. */
export function pgBin(name: 'pg_dump' | 'pg_restore'): string {
  const candidates = ['/usr/lib/postgresql/15/bin', ...(fs.existsSync('/usr/lib/postgresql') ? fs.readdirSync('/usr/lib/postgresql').sort().reverse().map((v) => `/usr/lib/postgresql/${v}/bin`) : [])];
  const found = candidates.map((d) => path.join(d, name)).find((p) => fs.existsSync(p));
  if (!found) throw new Error(`${name} is not installed (Debian: apt-get install postgresql-client-15)`);
  return found;
}

export function s3Client(s3: Config['s3']) {
  return new S3Client({
    endpoint: s3.endpoint,
    region: s3.region,
    forcePathStyle: s3.forcePathStyle,
    credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
}

export async function listKeys(client: S3Client, bucket: string, max = Infinity): Promise<string[]> {
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const out = await client.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }));
    keys.push(...(out.Contents ?? []).map((o) => o.Key!).filter(Boolean));
    token = out.IsTruncated ? out.NextContinuationToken : undefined;
  } while (token && keys.length < max);
  return keys;
}

export async function readObject(client: S3Client, bucket: string, key: string) {
  const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
  return { body: Buffer.from(await out.Body!.transformToByteArray()), contentType: out.ContentType ?? null };
}

/** Row counts of every table the app owns (every schema but PostgreSQL's own). */
export async function tableCounts(databaseUrl: string): Promise<Record<string, number>> {
  const client = new pg.Client({ connectionString: databaseUrl });
  await client.connect();
  try {
    const { rows: tables } = await client.query<{ s: string; t: string }>(
      `select table_schema as s, table_name as t from information_schema.tables
        where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema') order by 1, 2`,
    );
    const counts: Record<string, number> = {};
    for (const { s, t } of tables) {
      const { rows } = await client.query<{ n: string }>(`select count(*) as n from "${s}"."${t}"`);
      counts[`${s}.${t}`] = Number(rows[0].n);
    }
    return counts;
  } finally {
    await client.end();
  }
}

/** Writes one archive of the database and the bucket to `outFile`; returns its manifest. */
export async function backup(target: ArchiveTarget, outFile: string): Promise<Manifest> {
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'benchrelay-backup-'));
  try {
    const dumpFile = path.join(work, 'database.dump');
    // one snapshot; counts read inside the same snapshot would need a second session, so they are read
    // right after and checked against the restored database (a backup of a busy system may differ by the
    // rows written in between, which the dump does not hold; the restore check compares with the dump)
    await run(pgBin('pg_dump'), ['--format=custom', '--no-owner', '--no-privileges', `--file=${dumpFile}`, `--dbname=${target.databaseUrl}`], { maxBuffer: 64 * 1024 * 1024 });
    const dump = fs.readFileSync(dumpFile);
    const tables = await tableCounts(target.databaseUrl);

    const client = s3Client(target.s3);
    const objects: Manifest['objects'] = [];
    for (const key of await listKeys(client, target.s3.bucket)) {
      const { body, contentType } = await readObject(client, target.s3.bucket, key);
      const file = path.join(work, 'objects', key);
      fs.mkdirSync(path.dirname(file), { recursive: true });
      fs.writeFileSync(file, body);
      objects.push({ key, bytes: body.length, sha256: sha256(body), contentType });
    }
    client.destroy();

    const manifest: Manifest = {
      format: 'benchrelay-backup-1',
      createdAt: new Date().toISOString(),
      database: { file: 'database.dump', sha256: sha256(dump), bytes: dump.length, tables },
      bucket: target.s3.bucket,
      objects,
    };
    fs.writeFileSync(path.join(work, 'manifest.json'), JSON.stringify(manifest, null, 2));
    fs.mkdirSync(path.dirname(path.resolve(outFile)), { recursive: true });
    await run('tar', ['-cf', path.resolve(outFile), '-C', work, '.'], { maxBuffer: 64 * 1024 * 1024 });
    return manifest;
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
}

export class RestoreRefused extends Error {}

/**
 * Brings an archive into a database and a bucket. Both must be empty (no table in the database, no
 * object in the bucket) unless `force`, which drops what the archive holds before restoring it. Every
 * checksum is verified before anything is written; row counts are compared afterwards.
 */
export async function restore(target: ArchiveTarget, archive: string, options: { force?: boolean } = {}): Promise<{ manifest: Manifest; tables: number; objects: number }> {
  const work = fs.mkdtempSync(path.join(os.tmpdir(), 'benchrelay-restore-'));
  try {
    await run('tar', ['-xf', path.resolve(archive), '-C', work]);
    const manifest = JSON.parse(fs.readFileSync(path.join(work, 'manifest.json'), 'utf8')) as Manifest;
    if (manifest.format !== 'benchrelay-backup-1') throw new RestoreRefused(`${archive} is not a Benchrelay backup.`);
    const dumpFile = path.join(work, manifest.database.file);
    if (sha256(fs.readFileSync(dumpFile)) !== manifest.database.sha256) throw new RestoreRefused('The database dump does not match its checksum; the archive is damaged.');
    for (const o of manifest.objects) {
      if (sha256(fs.readFileSync(path.join(work, 'objects', o.key))) !== o.sha256) throw new RestoreRefused(`Object ${o.key} does not match its checksum; the archive is damaged.`);
    }

    const existing = Object.keys(await tableCounts(target.databaseUrl));
    const client = s3Client(target.s3);
    let bucketExists = true;
    try {
      await client.send(new HeadBucketCommand({ Bucket: target.s3.bucket }));
    } catch {
      bucketExists = false;
    }
    const stored = bucketExists ? await listKeys(client, target.s3.bucket, 1) : [];
    if (!options.force && (existing.length || stored.length)) {
      throw new RestoreRefused(
        `The target is not empty (${existing.length} tables in the database, ${stored.length ? 'objects' : 'no objects'} in bucket ${target.s3.bucket}). Restore into an empty database and bucket, or pass --force to replace what is there.`,
      );
    }

    // the extensions (pg_trgm, pgcrypto) are the superuser's to create (docker-free-dev/postgres.sh does);
    // restore every other entry of the dump
    const restoreBin = pgBin('pg_restore');
    const { stdout: list } = await run(restoreBin, ['--list', dumpFile], { maxBuffer: 64 * 1024 * 1024 });
    const listFile = path.join(work, 'restore.list');
    fs.writeFileSync(listFile, list.split('\n').filter((line) => !/ EXTENSION /.test(line)).join('\n'));
    await run(
      restoreBin,
      ['--no-owner', '--no-privileges', '--exit-on-error', '--single-transaction', ...(options.force ? ['--clean', '--if-exists'] : []), `--use-list=${listFile}`, `--dbname=${target.databaseUrl}`, dumpFile],
      { maxBuffer: 64 * 1024 * 1024 },
    );

    if (!bucketExists) await client.send(new CreateBucketCommand({ Bucket: target.s3.bucket }));
    for (const o of manifest.objects) {
      const body = fs.readFileSync(path.join(work, 'objects', o.key));
      await client.send(new PutObjectCommand({ Bucket: target.s3.bucket, Key: o.key, Body: body, ...(o.contentType ? { ContentType: o.contentType } : {}) }));
    }
    client.destroy();

    const counts = await tableCounts(target.databaseUrl);
    const differ = Object.entries(manifest.database.tables).filter(([t, n]) => counts[t] !== n);
    // counts were read just after the dump; on a quiet system they match it exactly
    if (differ.length) console.warn(`Row counts differ from those read at backup time (rows written during the backup are not in it): ${differ.map(([t, n]) => `${t} ${n}→${counts[t]}`).join(', ')}`);
    return { manifest, tables: Object.keys(counts).length, objects: manifest.objects.length };
  } finally {
    fs.rmSync(work, { recursive: true, force: true });
  }
}

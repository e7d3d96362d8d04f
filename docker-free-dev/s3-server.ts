import { mkdir } from 'node:fs/promises';
import S3rver from 's3rver';

/**
 * Local S3-compatible storage (s3rver) for development and tests. Objects live on disk under
 * `directory`, so uploads survive a restart. The bucket gets a CORS rule because browsers upload
 * straight to storage with presigned PUT URLs.
 */

export interface S3ServerOptions {
  port: number;
  directory: string;
  bucket: string;
  corsOrigins: string[];
}

export interface RunningS3Server {
  close(): Promise<void>;
}

export async function startS3Server(opts: S3ServerOptions): Promise<RunningS3Server> {
  await mkdir(opts.directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port,
    directory: opts.directory,
    silent: true,
    // The app always uses path-style URLs; guessing buckets from Host names only misroutes.
    vhostBuckets: false,
    // Creating an existing bucket and replacing its CORS rule are both harmless, which makes
    // starting on a directory from an earlier run idempotent.
    configureBuckets: [
      { name: opts.bucket, configs: opts.corsOrigins.length ? [corsConfiguration(opts.corsOrigins)] : [] },
    ],
  });
  await server.run();

  return {
    close: async () => {
      const closing = server.close();
      // The AWS SDK keeps sockets alive; close() would otherwise wait for them to time out.
      server.httpServer?.closeAllConnections();
      await closing;
    },
  };
}

export function corsConfiguration(origins: string[]) {
  const escape = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
  return `<?xml version="1.0" encoding="UTF-8"?>
<CORSConfiguration xmlns="http://s3.amazonaws.com/doc/2006-03-01/">
  <CORSRule>
${origins.map((o) => `    <AllowedOrigin>${escape(o)}</AllowedOrigin>`).join('\n')}
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>3000</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;
}

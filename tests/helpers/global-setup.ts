import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { testEnv, TEST_PORTS, TEST_S3_DIR, TEST_DATABASE, TEST_DATA_DIR, TEST_CLIENT_DIR } from './test-env.js';

/**
 * Once per `npm test`: a fresh test database on the local PostgreSQL (started if needed), the schema,
 * and the three stand-ins on the test ports. Everything started here is stopped in the teardown.
 */
export default async function setup() {
  Object.assign(process.env, testEnv);
  const root = process.cwd();
  // a server this run starts is stopped at the end; one that was already running (npm start) is left alone
  const pgState = execFileSync('bash', ['docker-free-dev/postgres.sh', 'start'], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] }).trim();
  execFileSync('bash', ['docker-free-dev/postgres.sh', 'reset-db', TEST_DATABASE], { stdio: ['ignore', 'ignore', 'inherit'] });

  // the browser tests need the real client; build it once per run into the test's own folder
  const { build } = await import('vite');
  await build({ root, logLevel: 'error', build: { outDir: path.join(root, TEST_CLIENT_DIR), emptyOutDir: true } });

  const { migrateUp } = await import('../../server/migrate.js');
  const { sequelize } = await import('../../server/lib/db.js');
  await migrateUp();
  await sequelize.close();

  for (const dir of [TEST_S3_DIR, testEnv.MAIL_CATCHER_DIR, TEST_DATA_DIR]) fs.rmSync(path.join(root, dir), { recursive: true, force: true });
  const { startIdentityProvider } = await import('../../docker-free-dev/identity-provider.js');
  const { startS3Server } = await import('../../docker-free-dev/s3-server.js');
  const { startMailCatcher } = await import('../../docker-free-dev/mail-catcher.js');
  const { demoPeople } = await import('../../server/seed/demo-people.js');

  const idp = await startIdentityProvider({
    port: TEST_PORTS.oidc,
    issuer: testEnv.OIDC_ISSUER,
    clients: [
      {
        client_id: testEnv.OIDC_CLIENT_ID,
        client_secret: testEnv.OIDC_CLIENT_SECRET,
        redirect_uris: [`${testEnv.APP_ORIGIN}/auth/callback`],
        post_logout_redirect_uris: [`${testEnv.APP_ORIGIN}/`],
      },
    ],
    accounts: demoPeople,
  });
  const s3 = await startS3Server({
    port: TEST_PORTS.s3,
    directory: path.join(root, TEST_S3_DIR),
    bucket: testEnv.S3_BUCKET,
    corsOrigins: [testEnv.APP_ORIGIN],
  });
  const mail = await startMailCatcher({ port: TEST_PORTS.smtp, directory: path.join(root, testEnv.MAIL_CATCHER_DIR) });

  return async () => {
    await Promise.allSettled([idp.close(), s3.close(), mail.close()]);
    if (pgState.endsWith('started')) execFileSync('bash', ['docker-free-dev/postgres.sh', 'stop'], { stdio: 'ignore' });
  };
}

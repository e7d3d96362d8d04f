import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { config, type Config } from '../server/config.js';
import { demoPeople } from '../server/seed/demo-people.js';
import { startIdentityProvider } from './identity-provider.js';
import { startMailCatcher } from './mail-catcher.js';
import { startS3Server } from './s3-server.js';

/**
 * Starts the local identity provider, S3 server and mail catcher on the addresses the app is
 * configured to use, so that app and stand-ins cannot disagree about ports.
 * Run as a CLI: `tsx docker-free-dev/standins.ts` (stops on Ctrl-C or SIGTERM).
 */

const VITE_ORIGIN = 'http://localhost:5173';

function portOf(url: string) {
  const parsed = new URL(url);
  return Number(parsed.port || (parsed.protocol === 'https:' ? 443 : 80));
}

export async function startStandins(cfg: Config = config, log: (line: string) => void = console.log) {
  if (!cfg.mailCatcherDir) throw new Error('The local stand-ins are for development only (NODE_ENV=production is set, or SMTP_HOST is not this machine).');
  const running: Array<{ close(): Promise<void> }> = [];
  const closeAll = async () => {
    await Promise.allSettled(running.splice(0).reverse().map((s) => s.close()));
  };

  try {
    running.push(
      await startIdentityProvider({
        port: portOf(cfg.oidc.issuer),
        issuer: cfg.oidc.issuer,
        clients: [
          {
            client_id: cfg.oidc.clientId,
            client_secret: cfg.oidc.clientSecret,
            redirect_uris: [...new Set([cfg.oidc.redirectUri, `${VITE_ORIGIN}/auth/callback`])],
            post_logout_redirect_uris: [...new Set([`${cfg.appOrigin}/`, `${VITE_ORIGIN}/`])],
          },
        ],
        accounts: demoPeople,
      }),
    );
    log(`identity provider  ${cfg.oidc.issuer}  (${demoPeople.length} demo people)`);

    const s3Directory = path.resolve(cfg.root, '.data/s3');
    running.push(
      await startS3Server({
        port: portOf(cfg.s3.endpoint),
        directory: s3Directory,
        bucket: cfg.s3.bucket,
        corsOrigins: [...new Set([cfg.appOrigin, VITE_ORIGIN])],
      }),
    );
    log(`S3 storage         ${cfg.s3.endpoint}  (bucket ${cfg.s3.bucket}, files in ${path.relative(cfg.root, s3Directory)})`);

    running.push(await startMailCatcher({ port: cfg.smtp.port, directory: cfg.mailCatcherDir }));
    log(`mail catcher       smtp://${cfg.smtp.host}:${cfg.smtp.port}  (messages in ${path.relative(cfg.root, cfg.mailCatcherDir)})`);
  } catch (err) {
    await closeAll();
    throw err;
  }

  return { close: closeAll };
}

const invokedDirectly = process.argv[1] !== undefined && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href;

if (invokedDirectly) {
  try {
    const standins = await startStandins();
    let stopping = false;
    const stop = async () => {
      if (stopping) return;
      stopping = true;
      await standins.close();
      process.exit(0);
    };
    process.on('SIGINT', () => void stop());
    process.on('SIGTERM', () => void stop());
  } catch (err) {
    console.error('Could not start the local stand-ins:', (err as Error).message);
    process.exit(1);
  }
}

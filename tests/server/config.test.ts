import { describe, expect, it } from 'vitest';
import { DEVELOPMENT_SECRETS, loadConfig, productionConfigProblem } from '../../server/config.js';

/** What production must set before it starts, and what it never does (demo data, the caught-mail page). */
const safe = {
  NODE_ENV: 'production',
  SESSION_SECRET: 'k3v9-this-installations-own-long-random-session-secret',
  OIDC_CLIENT_SECRET: 'installation-oidc-client-secret',
  S3_ACCESS_KEY_ID: 'AKIAINSTALLATION',
  S3_SECRET_ACCESS_KEY: 'installation-s3-secret-access-key',
};

describe('productionConfigProblem', () => {
  it('lets production start with its own secrets, and says nothing outside production', () => {
    expect(productionConfigProblem(safe)).toBeNull();
    expect(productionConfigProblem({ NODE_ENV: 'development' })).toBeNull();
    expect(productionConfigProblem({ NODE_ENV: 'test' })).toBeNull();
    expect(productionConfigProblem({})).toBeNull();
  });

  for (const name of Object.keys(DEVELOPMENT_SECRETS) as Array<keyof typeof DEVELOPMENT_SECRETS>) {
    it(`refuses production with ${name} unset, empty, or a development default, in one line naming it`, () => {
      const others = Object.keys(DEVELOPMENT_SECRETS).filter((n) => n !== name);
      const unset: Record<string, string> = { ...safe };
      delete unset[name];
      for (const env of [unset, { ...safe, [name]: '' }, { ...safe, [name]: '   ' }, ...DEVELOPMENT_SECRETS[name].map((v) => ({ ...safe, [name]: v }))]) {
        const problem = productionConfigProblem(env);
        expect(problem, JSON.stringify(env)).toContain(name);
        expect(problem).not.toContain('\n');
        for (const other of others) expect(problem).not.toContain(other);
        // the line never repeats a secret's value
        if (env[name]?.trim()) expect(problem).not.toContain(env[name]);
      }
    });
  }

  it('names every variable that is wrong at once', () => {
    const problem = productionConfigProblem({ NODE_ENV: 'production' });
    for (const name of Object.keys(DEVELOPMENT_SECRETS)) expect(problem).toContain(name);
  });

  it('refuses a short session secret', () => {
    expect(productionConfigProblem({ ...safe, SESSION_SECRET: 'short-but-not-default' })).toMatch(/SESSION_SECRET is shorter than 32 characters/);
  });
});

describe('production configuration', () => {
  it('loads the demo network in production only with LOAD_DEMO=true; elsewhere unless LOAD_DEMO=false', () => {
    expect(loadConfig({ ...safe }).loadDemo).toBe(false);
    expect(loadConfig({ ...safe, LOAD_DEMO: 'yes' }).loadDemo).toBe(false);
    expect(loadConfig({ ...safe, LOAD_DEMO: 'true' }).loadDemo).toBe(true);
    expect(loadConfig({ NODE_ENV: 'development' }).loadDemo).toBe(true);
    expect(loadConfig({ NODE_ENV: 'development', LOAD_DEMO: 'false' }).loadDemo).toBe(false);
  });

  it('has the caught-mail folder only outside production and while mail goes to the local catcher', () => {
    expect(loadConfig({ NODE_ENV: 'development' }).mailCatcherDir).toMatch(/\.data\/mail$/);
    expect(loadConfig({ NODE_ENV: 'development', SMTP_HOST: 'localhost' }).mailCatcherDir).toBeDefined();
    expect(loadConfig({ NODE_ENV: 'development', SMTP_HOST: 'smtp.mail.example' }).mailCatcherDir).toBeUndefined();
    expect(loadConfig({ ...safe }).mailCatcherDir).toBeUndefined();
    expect(loadConfig({ ...safe, SMTP_HOST: '127.0.0.1', MAIL_CATCHER_DIR: '/tmp/mail' }).mailCatcherDir).toBeUndefined();
  });

  it('accepts state changes only from its own origin in production; development adds the Vite dev server', () => {
    expect(loadConfig({ ...safe, APP_ORIGIN: 'https://bench.example/' }).allowedOrigins).toEqual(['https://bench.example']);
    expect(loadConfig({ NODE_ENV: 'development', PORT: '3000' }).allowedOrigins).toEqual(
      expect.arrayContaining(['http://localhost:3000', 'http://localhost:5173']),
    );
  });
});

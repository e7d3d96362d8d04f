import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

// The layers of the design (STYLE.md, "Know your room") are checked by eslint-plugin-boundaries in
// eslint.config.js. These cases lint small files placed (in memory) inside the repository's lint scope with
// the repository's own configuration, so switching the rule off, or loosening a policy, fails here.

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({
    cwd: root,
    // The probes exist only in memory, so the type-aware parser has no program for them: parse without
    // types and run only the rules under test.
    overrideConfig: [{ files: ['**/*.{ts,tsx}'], languageOptions: { parserOptions: { projectService: false, project: null } } }],
    ruleFilter: ({ ruleId }) => ruleId.startsWith('boundaries/') || ruleId === 'no-restricted-globals',
  });
});

async function problems(filePath: string, code: string) {
  const [result] = await eslint.lintText(code, { filePath: path.join(root, filePath) });
  return result.messages.map((m) => ({ ruleId: m.ruleId, line: m.line, message: m.message }));
}

describe('layer boundaries', () => {
  it('the rule is on, as an error, for every layer', async () => {
    for (const file of ['src/features/jobs/queries.ts', 'src/app/router.tsx', 'shared/serial.ts', 'server/modules/jobs/service.ts', 'workers/processors.ts']) {
      const config = (await eslint.calculateConfigForFile(path.join(root, file))) as { rules: Record<string, unknown[]> };
      expect(config.rules['boundaries/dependencies']?.[0], file).toBe(2);
    }
  });

  it('reports a feature that imports another feature, by relative path or by the @/ alias', async () => {
    const found = await problems(
      'src/features/jobs/boundary-probe.ts',
      [
        "import { registryKeys } from '../registry/queries';",
        "import { transferKeys } from '@/features/transfers/queries';",
        'export const keys = [registryKeys, transferKeys];',
      ].join('\n'),
    );
    expect(found).toEqual([
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 1, message: expect.stringMatching(/never imports another feature/) }),
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 2, message: expect.stringMatching(/never imports another feature/) }),
    ]);
  });

  it('reports a feature that imports src/app', async () => {
    const found = await problems(
      'src/features/jobs/boundary-probe.ts',
      "import { useCurrentShop } from '@/app/current-shop';\nexport const hook = useCurrentShop;",
    );
    expect(found).toEqual([expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 1 })]);
  });

  it('lets a feature use its own files, src/lib, src/components and shared/', async () => {
    const found = await problems(
      'src/features/jobs/boundary-probe.ts',
      [
        "import { jobKeys } from './queries';",
        "import { api } from '@/lib/api-client';",
        "import { Button } from '@/components/ui/button';",
        "import { normalizeSerial } from '@shared/serial';",
        'export const used = [jobKeys, api, Button, normalizeSerial];',
      ].join('\n'),
    );
    expect(found).toEqual([]);
  });

  it('reports shared/ importing the server, the client or the workers', async () => {
    const found = await problems(
      'shared/boundary-probe.ts',
      [
        "import { config } from '../server/config.js';",
        "import { api } from '../src/lib/api-client';",
        "import { startWorker } from '../workers/processors.js';",
        "import { normalizeSerial } from './serial.js';",
        'export const used = [config, api, startWorker, normalizeSerial];',
      ].join('\n'),
    );
    expect(found).toEqual([
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 1, message: expect.stringMatching(/imports nothing from src\//) }),
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 2 }),
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 3 }),
    ]);
  });

  it("reports a server module reaching into another module's files, and allows its public entry", async () => {
    const found = await problems(
      'server/modules/padmaps/boundary-probe.ts',
      [
        "import { openJob } from '../jobs/service.js';",
        "import { Job } from '../jobs/models.js';",
        "import { currentEstimate } from '../jobs/index.js';",
        "import { sequelize } from '../../lib/db.js';",
        'export const used = [openJob, Job, currentEstimate, sequelize];',
      ].join('\n'),
    );
    expect(found).toEqual([
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 1, message: expect.stringMatching(/public entry/) }),
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 2, message: expect.stringMatching(/public entry/) }),
    ]);
  });

  it('reports browser code that imports server code or uses Node globals', async () => {
    const found = await problems(
      'src/lib/boundary-probe.ts',
      "import { config } from '../../server/config.js';\nexport const port = config.port ?? process.env.PORT;",
    );
    expect(found).toEqual([
      expect.objectContaining({ ruleId: 'boundaries/dependencies', line: 1 }),
      expect.objectContaining({ ruleId: 'no-restricted-globals', line: 2 }),
    ]);
  });
});

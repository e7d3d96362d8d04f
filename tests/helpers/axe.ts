import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';

const require = createRequire(import.meta.url);
const AXE_PATH = require.resolve('axe-core/axe.min.js');

export interface AxeViolation {
  id: string;
  impact: 'minor' | 'moderate' | 'serious' | 'critical' | null;
  help: string;
  nodes: Array<{ target: unknown[] }>;
}

/**
 * Runs axe-core (the npm package, injected into the page) and returns the serious and critical findings.
 * The app's Content-Security-Policy forbids inline scripts, so the test's browser contexts set
 * `bypassCSP` to let the injected checker run; the app's own scripts are unaffected either way.
 */
export async function seriousViolations(page: Page): Promise<AxeViolation[]> {
  await page.addScriptTag({ path: AXE_PATH });
  const result = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }).axe;
    return axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'best-practice'] } });
  });
  return result.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

export const describeViolations = (vs: AxeViolation[]) =>
  vs.map((v) => `${v.id} (${v.impact}): ${v.help} at ${JSON.stringify(v.nodes.slice(0, 3).map((n) => n.target))}`).join('\n');

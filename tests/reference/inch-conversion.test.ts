import fc from 'fast-check';
import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { formatInches, inchesToMm, MM_PER_INCH, mmToInches, parseLength } from '../../shared/padmap/units.js';

/**
 * Checks of Benchrelay's length conversion against published definitions and an independent
 * implementation. Sources are named beside each check.
 */
describe('the inch (reference checks)', () => {
  it('1 in = 25.4 mm exactly — international yard and pound agreement (1959); NIST SP 811, Appendix B', () => {
    expect(MM_PER_INCH).toBe(25.4);
    expect(parseLength('1in')).toMatchObject({ ok: true, mm: 25.4 });
  });

  it('1.200 in = 30.48 mm — arithmetic on the exact definition above (NIST SP 811)', () => {
    expect(parseLength('1.200in')).toMatchObject({ ok: true, mm: 30.48 });
    expect(parseLength('1.2"')).toMatchObject({ ok: true, mm: 30.48 });
  });

  it('1 ft = 304.8 mm and 1 mil (0.001 in) = 0.0254 mm — NIST SP 811, Appendix B', () => {
    expect(parseLength('12in')).toMatchObject({ ok: true, mm: 304.8 });
    expect(parseLength('0.001in')).toMatchObject({ ok: true, mm: 0.0254 });
  });

  it('agrees with mathjs (npm registry, 15.2.0; defines inch as 0.0254 m) to the nanometre over many caliper readings', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5_000 }), (thousandths) => {
        const inches = thousandths / 1000; // a caliper reading to 0.001 in, up to 5 in
        const ours = parseLength(`${inches}in`);
        expect(ours.ok).toBe(true);
        const theirs = unit(inches, 'inch').toNumber('mm');
        expect(Math.abs((ours as { mm: number }).mm - theirs)).toBeLessThan(1e-9);
        expect(Math.abs(inchesToMm(inches) - theirs)).toBeLessThan(1e-9);
        // and back: our display to three decimals shows the reading that was typed
        expect(formatInches(theirs)).toBe(`${inches.toFixed(3)} in`);
      }),
      { numRuns: 2_000 },
    );
  });

  it('agrees with mathjs on millimetre readings converted to inches', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 120_000 }), (microns) => {
        const mm = microns / 1000;
        const theirs = unit(mm, 'mm').toNumber('inch');
        expect(Math.abs(mmToInches(mm) - theirs)).toBeLessThan(1e-12);
      }),
      { numRuns: 2_000 },
    );
  });
});

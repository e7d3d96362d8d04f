/**
 * Lengths as a technician types them from a caliper: `30.5`, `30.5mm`, `30,5 mm`, `1.200in`, `1.2"`.
 * Everything is stored and computed in millimetres; inches are only an input and display unit.
 *
 * The inch is exactly 25.4 mm (international yard and pound agreement, 1959; NIST SP 811). A typed
 * decimal is converted with integer arithmetic on its digits, so `1.200in` becomes the double nearest
 * to 30.48 rather than whatever `1.2 * 25.4` happens to round to.
 */

export const MM_PER_INCH = 25.4;
export const LENGTH_UNITS = ['mm', 'in'] as const;
export type LengthUnit = (typeof LENGTH_UNITS)[number];

export type ParsedLength =
  | { ok: true; mm: number; unit: LengthUnit; value: number }
  | { ok: false; error: string };

const UNIT_WORDS: Record<string, LengthUnit | 'cm'> = {
  mm: 'mm', millimetre: 'mm', millimetres: 'mm', millimeter: 'mm', millimeters: 'mm',
  cm: 'cm',
  in: 'in', inch: 'in', inches: 'in', '"': 'in', "''": 'in',
  // phones turn a typed " into a curly quote; the double prime is the proper inch mark
  '\u201D': 'in', '\u201C': 'in', '\u2033': 'in', '\u2019\u2019': 'in', '\u2032\u2032': 'in',
};

const NUMBER = /^(\d+(?:[.,]\d*)?|[.,]\d+)$/;

/** Splits a decimal string into an integer of its digits and the count of digits after the point. */
function digitsOf(text: string): { digits: bigint; scale: number } {
  const normal = text.replace(',', '.');
  const [whole, fraction = ''] = normal.split('.');
  return { digits: BigInt((whole || '0') + fraction), scale: fraction.length };
}

/** Writes `digits / 10^scale` as a decimal string without floating point. */
function decimalString(digits: bigint, scale: number): string {
  const s = digits.toString().padStart(scale + 1, '0');
  return scale === 0 ? s : `${s.slice(0, s.length - scale)}.${s.slice(s.length - scale)}`;
}

/** Exact conversion of a decimal inch reading to millimetres (25.4 = 254 / 10). */
export function inchTextToMm(text: string): number {
  const { digits, scale } = digitsOf(text);
  return Number(decimalString(digits * 254n, scale + 1));
}

/** Inches to millimetres for a number already in memory; goes through its shortest decimal form. */
export function inchesToMm(inches: number): number {
  if (!Number.isFinite(inches)) return Number.NaN;
  const negative = inches < 0;
  const text = Math.abs(inches).toString();
  // exponent forms (1e-7) are far below any caliper reading; plain multiplication is fine there
  const mm = /e/i.test(text) ? Math.abs(inches) * MM_PER_INCH : inchTextToMm(text);
  return negative ? -mm : mm;
}

export function mmToInches(mm: number): number {
  return mm / MM_PER_INCH;
}

/**
 * Reads one typed length. A bare number takes `defaultUnit`. Accepts a decimal comma (many
 * calipers and keyboards use one), spaces between number and unit, and `"` for inches.
 */
export function parseLength(input: string | number, defaultUnit: LengthUnit = 'mm'): ParsedLength {
  if (typeof input === 'number') {
    if (!Number.isFinite(input) || input <= 0) return { ok: false, error: 'Enter a length greater than zero.' };
    return { ok: true, value: input, unit: defaultUnit, mm: defaultUnit === 'in' ? inchesToMm(input) : input };
  }
  const text = input.trim().toLowerCase();
  if (!text) return { ok: false, error: 'Enter a length.' };
  const match = /^([0-9.,]+)\s*([a-z"'\u201C\u201D\u2019\u2032\u2033]*)\.?$/.exec(text);
  if (!match || !NUMBER.test(match[1])) {
    return { ok: false, error: 'Type a length such as 30.5, 30.5mm or 1.200in.' };
  }
  const [, numberText, unitText] = match;
  const unit = unitText ? UNIT_WORDS[unitText] : defaultUnit;
  if (!unit) return { ok: false, error: `“${unitText}” is not a unit here; use mm or in.` };
  const value = Number(numberText.replace(',', '.'));
  if (!(value > 0)) return { ok: false, error: 'Enter a length greater than zero.' };
  if (unit === 'cm') {
    const { digits, scale } = digitsOf(numberText);
    return { ok: true, value, unit: 'mm', mm: Number(decimalString(digits * 10n, scale)) };
  }
  return { ok: true, value, unit, mm: unit === 'in' ? inchTextToMm(numberText) : value };
}

/** Rounds to a number of decimals without the 1.005 → 1.00 surprise of toFixed on binary doubles. */
export function roundTo(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  return Math.round((value + Math.sign(value) * Number.EPSILON * Math.abs(value)) * factor) / factor;
}

export function formatMm(mm: number, decimals = 2): string {
  return `${roundTo(mm, decimals).toFixed(decimals)} mm`;
}

export function formatInches(mm: number, decimals = 3): string {
  return `${roundTo(mmToInches(mm), decimals).toFixed(decimals)} in`;
}

/** Both units, millimetres first: `30.48 mm (1.200 in)`. */
export function formatBoth(mm: number): string {
  return `${formatMm(mm)} (${formatInches(mm)})`;
}

/**
 * Serial numbers and maker names arrive typed by hand, read off worn engravings, pasted from school
 * spreadsheets or scanned from labels. The registry stores a normalised form beside the original so
 * that "ab-104 233", "AB104233" and "AB.104/233" find the same instrument, while screens keep showing
 * what was engraved.
 */

// Separators people put into serials that carry no meaning: whitespace, dots, slashes, underscores and
// every dash-like character a phone keyboard or spreadsheet may substitute for a hyphen.
const SERIAL_SEPARATORS = /[\s./\\_\-\u2010-\u2015\u2212\uFE58\uFE63\uFF0D]+/g;

/** Upper-cased serial without separators; full-width characters folded to ASCII (NFKC). */
export function normalizeSerial(serial: string): string {
  return serial.normalize('NFKC').toUpperCase().replace(SERIAL_SEPARATORS, '').trim();
}

/** Lower-cased maker name with runs of whitespace collapsed to one space. */
export function normalizeMaker(maker: string): string {
  return maker.normalize('NFKC').toLowerCase().replace(/\s+/g, ' ').trim();
}

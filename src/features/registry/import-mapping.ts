import { IMPORT_FIELDS, importRowSchema, type ImportFieldKey } from '@shared/schemas/registry';
import { normalizeMaker, normalizeSerial } from '@shared/serial';

/** Which file column feeds each registry field; null when the file has none for it. */
export type ColumnMapping = Record<ImportFieldKey, string | null>;

const simplify = (header: string) =>
  header.normalize('NFKC').toLowerCase().replace(/[^a-z0-9#/ ]+/g, ' ').replace(/\s+/g, ' ').trim();

/** Guesses the mapping from the file's headers ("Serial No.", "Make", "Instrument" …); people correct it after. */
export function autoMapColumns(headers: string[]): ColumnMapping {
  const mapping = Object.fromEntries(IMPORT_FIELDS.map((f) => [f.key, null])) as ColumnMapping;
  const taken = new Set<string>();
  for (const field of IMPORT_FIELDS) {
    const aliases: readonly string[] = field.aliases;
    const hit = headers.find((h) => !taken.has(h) && aliases.includes(simplify(h)));
    if (hit) {
      mapping[field.key] = hit;
      taken.add(hit);
    }
  }
  return mapping;
}

export function missingRequired(mapping: ColumnMapping): string[] {
  return IMPORT_FIELDS.filter((f) => f.required && !mapping[f.key]).map((f) => f.label);
}

export type MappedRow = { row: number } & Partial<Record<ImportFieldKey, string>>;

/**
 * The file's rows in the registry's fields. Row numbers are the ones a spreadsheet shows (the header is
 * row 1), so an error message points at the line people see.
 */
export function applyMapping(rows: Array<Record<string, unknown>>, mapping: ColumnMapping, firstRow = 2): MappedRow[] {
  return rows.map((source, index) => {
    const out: MappedRow = { row: firstRow + index };
    for (const field of IMPORT_FIELDS) {
      const column = mapping[field.key];
      if (!column) continue;
      const value = source[column];
      if (typeof value === 'string' || typeof value === 'number' || typeof value === 'boolean') out[field.key] = String(value);
    }
    return out;
  });
}

export interface RowCheck {
  row: number;
  errors: Record<string, string>;
}

/** The same checks the server makes, before sending: field errors and repeats of a serial within the file. */
export function checkRows(rows: MappedRow[]): RowCheck[] {
  const problems: RowCheck[] = [];
  const seen = new Map<string, number>();
  for (const candidate of rows) {
    const parsed = importRowSchema.safeParse(candidate);
    if (!parsed.success) {
      const errors: Record<string, string> = {};
      for (const issue of parsed.error.issues) errors[issue.path.join('.') || '_'] ??= issue.message;
      problems.push({ row: candidate.row, errors });
      continue;
    }
    const key = `${normalizeMaker(parsed.data.maker)}\u0000${normalizeSerial(parsed.data.serial)}`;
    const first = seen.get(key);
    if (first !== undefined) problems.push({ row: candidate.row, errors: { serial: `Same serial and maker as row ${first}.` } });
    else seen.set(key, candidate.row);
  }
  return problems;
}

export function chunk<T>(items: T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

export const fieldLabel = (key: string) => IMPORT_FIELDS.find((f) => f.key === key)?.label ?? (key === '_' ? 'Row' : key);

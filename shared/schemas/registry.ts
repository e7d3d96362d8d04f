import { z } from 'zod';
import { INSTRUMENT_FAMILIES, INSTRUMENT_FAMILY_LABELS, OWNER_KINDS, type InstrumentFamily } from '../domain.js';
import { normalizeSerial } from '../serial.js';

/**
 * The registry's request shapes, shared by the client's forms and the server's routes, so a field error
 * the client shows before sending is the same one the server would answer with.
 */

export const INSTRUMENT_STATUSES = ['in_service', 'in_shop', 'in_transit', 'retired'] as const;
export type InstrumentStatus = (typeof INSTRUMENT_STATUSES)[number];
export const INSTRUMENT_STATUS_LABELS: Record<InstrumentStatus, string> = {
  in_service: 'With its owner',
  in_shop: 'In a shop',
  in_transit: 'On a relay run',
  retired: 'Retired',
};

export const CUSTOMER_KINDS = ['person', 'school', 'fleet'] as const;
export type CustomerKind = (typeof CUSTOMER_KINDS)[number];
export const CUSTOMER_KIND_LABELS: Record<CustomerKind, string> = {
  person: 'Player or parent',
  school: 'School',
  fleet: 'Rental fleet',
};
export const OWNER_KIND_LABELS: Record<(typeof OWNER_KINDS)[number], string> = {
  customer: 'A customer',
  school: 'A school',
  rental_fleet: 'Our rental fleet',
};

export const SERIAL_MAX = 64;
export const SEARCH_LIMIT_MAX = 50;

// Words people write for a family in spreadsheets and at the desk, beyond the labels themselves.
const FAMILY_ALIASES: Record<string, InstrumentFamily> = {
  alto: 'alto_saxophone', 'alto sax': 'alto_saxophone', 'eb alto sax': 'alto_saxophone',
  tenor: 'tenor_saxophone', 'tenor sax': 'tenor_saxophone',
  bari: 'baritone_saxophone', baritone: 'baritone_saxophone', 'bari sax': 'baritone_saxophone', 'baritone sax': 'baritone_saxophone',
  'bass sax': 'bass_saxophone',
  soprano: 'soprano_saxophone', 'soprano sax': 'soprano_saxophone',
  'bb clarinet': 'clarinet', 'b flat clarinet': 'clarinet', 'bass clar': 'bass_clarinet',
  horn: 'french_horn', 'f horn': 'french_horn', 'double horn': 'french_horn',
  euph: 'euphonium', baritone_horn: 'euphonium',
  cornet: 'trumpet', 'bb trumpet': 'trumpet', 'tenor trombone': 'trombone', 'bass trombone': 'trombone',
  sousaphone: 'tuba',
};

/** Reads a family from a key ("alto_saxophone"), its label ("Alto saxophone") or a common short name ("alto sax"). */
export function parseFamily(input: string): InstrumentFamily | null {
  const text = input.normalize('NFKC').trim().toLowerCase().replace(/[-_]+/g, ' ').replace(/\s+/g, ' ').replace(/♭/g, 'b');
  if (!text) return null;
  for (const family of INSTRUMENT_FAMILIES) {
    if (text === family.replace(/_/g, ' ') || text === INSTRUMENT_FAMILY_LABELS[family].toLowerCase()) return family;
  }
  return FAMILY_ALIASES[text] ?? FAMILY_ALIASES[text.replace(/ /g, '_')] ?? null;
}

/** Empty strings from forms and spreadsheet cells mean "not given". */
const optionalText = (max: number, what: string) =>
  z.preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? undefined : v === null ? undefined : v),
    z.string().trim().max(max, `${what} is too long (at most ${max} characters).`).optional(),
  );

export const serialField = z
  .string({ error: 'Enter the serial number.' })
  .trim()
  .min(1, 'Enter the serial number.')
  .max(SERIAL_MAX, `A serial number has at most ${SERIAL_MAX} characters.`)
  .refine((s) => normalizeSerial(s) !== '', 'A serial number needs at least one letter or digit.');

export const makerField = z
  .string({ error: 'Enter the maker.' })
  .trim()
  .min(1, 'Enter the maker.')
  .max(80, 'A maker name has at most 80 characters.');

export const familyField = z.preprocess(
  (v) => (typeof v === 'string' ? (parseFamily(v) ?? v) : v),
  z.enum(INSTRUMENT_FAMILIES, { error: 'Choose a family, for example alto saxophone, flute or trumpet.' }),
);

const currentYear = () => new Date().getUTCFullYear();
export const yearMadeField = z.preprocess(
  (v) => (v === '' || v === null || v === undefined ? undefined : typeof v === 'string' ? Number(v.trim()) : v),
  z
    .number({ error: 'Write the year as four digits, for example 2015.' })
    .int('Write the year as four digits, for example 2015.')
    .min(1800, 'The year made must be 1800 or later.')
    .refine((y) => y <= currentYear() + 1, 'The year made cannot be in the future.')
    .optional(),
);

export const assetTagField = z.preprocess(
  (v) => (typeof v === 'string' && v.trim() === '' ? undefined : v === null ? undefined : v),
  z
    .string()
    .trim()
    .max(40, 'An asset tag has at most 40 characters.')
    .regex(/^[A-Za-z0-9][A-Za-z0-9 ._/-]*$/, 'An asset tag uses letters, digits, spaces, dots, dashes and slashes.')
    .optional(),
);

const uuid = (message: string) => z.uuid({ error: message });

// ---------------------------------------------------------------------------------------------
// Search

export const instrumentSearchSchema = z.object({
  q: z.string().max(SERIAL_MAX * 2).optional().default(''),
  family: z.enum(INSTRUMENT_FAMILIES).optional(),
  shopId: uuid('Unknown shop.').optional(),
  ownerCustomerId: uuid('Unknown customer.').optional(),
  status: z.enum(INSTRUMENT_STATUSES).optional(),
  limit: z.coerce.number().int().min(1).max(SEARCH_LIMIT_MAX).optional().default(20),
});
export type InstrumentSearchInput = z.input<typeof instrumentSearchSchema>;
export type InstrumentSearch = z.output<typeof instrumentSearchSchema>;

/** How a search hit matched, best first. */
export const MATCH_KINDS = ['exact', 'asset_tag', 'prefix', 'contains', 'similar'] as const;
export type MatchKind = (typeof MATCH_KINDS)[number];

export const serialCheckSchema = z.object({
  serial: serialField,
  maker: z.string().trim().max(80).optional().default(''),
});

// ---------------------------------------------------------------------------------------------
// Registering, customers, intake

export const newInstrumentSchema = z.object({
  family: familyField,
  maker: makerField,
  model: optionalText(80, 'The model'),
  serial: serialField,
  yearMade: yearMadeField,
  assetTag: assetTagField,
  notes: optionalText(2000, 'The note'),
  ownerKind: z.enum(OWNER_KINDS, { error: 'Say who owns the instrument.' }),
  /** It travels in a heavy case whatever its family (a double case, a flight case): lifting cautions follow it. */
  heavyCase: z.boolean({ error: 'Say whether the case is heavy.' }).optional(),
});
export type NewInstrumentInput = z.input<typeof newInstrumentSchema>;

export const customerInputSchema = z.object({
  kind: z.enum(CUSTOMER_KINDS, { error: 'Say whether this is a person, a school or the rental fleet.' }),
  name: z.string({ error: 'Enter the name.' }).trim().min(1, 'Enter the name.').max(120, 'A name has at most 120 characters.'),
  contactName: optionalText(120, 'The contact name'),
  email: z.preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? undefined : v),
    z.email({ error: 'That does not look like an e-mail address.' }).max(200).optional(),
  ),
  phone: z.preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? undefined : v),
    z
      .string()
      .trim()
      .max(40, 'A phone number has at most 40 characters.')
      .regex(/^[+()\d][\d\s().\-/]*$/, 'Write the phone number with digits, spaces and + ( ) - only.')
      .optional(),
  ),
  address: optionalText(300, 'The address'),
  notes: optionalText(2000, 'The note'),
});
export type CustomerInput = z.input<typeof customerInputSchema>;

export const createCustomerSchema = customerInputSchema.extend({ shopId: uuid('Choose the shop.') });

export const customerSearchSchema = z.object({
  q: z.string().trim().max(120).optional().default(''),
  limit: z.coerce.number().int().min(1).max(50).optional().default(20),
});

export const jobOpeningSchema = z.object({
  complaint: z
    .string({ error: 'Write what the customer reports.' })
    .trim()
    .min(3, 'Write what the customer reports.')
    .max(2000, 'Keep the complaint under 2000 characters.'),
  conditionNotes: optionalText(4000, 'The condition notes'),
  promisedOn: z.preprocess(
    (v) => (v === '' || v === null ? undefined : v),
    z.iso.date({ error: 'Pick a promised date.' }).optional(),
  ),
});
export type JobOpeningInput = z.input<typeof jobOpeningSchema>;

export const intakeSchema = z.object({
  shopId: uuid('Choose the shop.'),
  /** Made once per intake form by the client, so a double submit or a retry opens one job. */
  requestKey: uuid('Missing request key.'),
  instrument: z.union([z.object({ id: uuid('Pick the instrument.') }), z.object({ new: newInstrumentSchema })]),
  customer: z.union([z.object({ id: uuid('Pick the customer.') }), z.object({ new: customerInputSchema }), z.null()]),
  job: jobOpeningSchema,
});
export type IntakeInput = z.input<typeof intakeSchema>;

// ---------------------------------------------------------------------------------------------
// Fleet import

/** The columns a fleet file can fill, with the header names people commonly use for them. */
export const IMPORT_FIELDS = [
  { key: 'serial', label: 'Serial number', required: true, aliases: ['serial', 'serial number', 'serial no', 'serial #', 'sn', 's/n'] },
  { key: 'maker', label: 'Maker', required: true, aliases: ['maker', 'make', 'brand', 'manufacturer'] },
  { key: 'family', label: 'Family', required: true, aliases: ['family', 'instrument', 'type', 'instrument type', 'kind'] },
  { key: 'model', label: 'Model', required: false, aliases: ['model', 'model name', 'model number'] },
  { key: 'assetTag', label: 'Asset tag', required: false, aliases: ['asset tag', 'asset', 'tag', 'asset number', 'inventory number', 'school tag'] },
  { key: 'yearMade', label: 'Year made', required: false, aliases: ['year', 'year made', 'made'] },
  { key: 'notes', label: 'Notes', required: false, aliases: ['notes', 'note', 'comments', 'remarks'] },
] as const;
export type ImportFieldKey = (typeof IMPORT_FIELDS)[number]['key'];

export const IMPORT_BATCH_MAX = 500;

export const importRowSchema = z.object({
  /** The row's number in the file as a spreadsheet shows it (the header is row 1). */
  row: z.number().int().min(1),
  serial: serialField,
  maker: makerField,
  family: familyField,
  model: optionalText(80, 'The model'),
  assetTag: assetTagField,
  yearMade: yearMadeField,
  notes: optionalText(2000, 'The note'),
});
export type ImportRow = z.input<typeof importRowSchema>;

export const importBatchSchema = z
  .object({
    shopId: uuid('Choose the shop the instruments are registered at.'),
    ownerKind: z.enum(OWNER_KINDS, { error: 'Say who owns these instruments.' }),
    ownerCustomerId: uuid('Choose the school or customer.').optional(),
    // the preview: every row checked against the registry as the import would, nothing written
    dryRun: z.boolean().optional().default(false),
    // rows are validated one by one on the server, so one bad row never rejects the batch
    rows: z
      .array(z.record(z.string(), z.unknown()))
      .min(1, 'The batch has no rows.')
      .max(IMPORT_BATCH_MAX, `Send at most ${IMPORT_BATCH_MAX} rows at a time.`),
  })
  .refine((b) => b.ownerKind === 'rental_fleet' || !!b.ownerCustomerId, {
    path: ['ownerCustomerId'],
    error: 'Choose the school or customer who owns these instruments.',
  });
export type ImportBatchInput = z.input<typeof importBatchSchema>;

/**
 * `held_elsewhere`: the instrument is known and held by a shop where the person may not update it, so the
 * row changed nothing (in a preview, `created` and `updated` say what the import would do).
 */
export type ImportRowOutcome = 'created' | 'updated' | 'unchanged' | 'held_elsewhere' | 'error';
export const HELD_ELSEWHERE_MESSAGE = 'Held by another shop — not changed.';
export interface ImportRowResult {
  row: number;
  outcome: ImportRowOutcome;
  instrumentId?: string;
  /** for `held_elsewhere`: HELD_ELSEWHERE_MESSAGE and the shop that holds it */
  message?: string;
  heldBy?: { id: string; name: string };
  /** for `updated`: the fields the row changes */
  changed?: string[];
  /** field → message; `_` for a problem with the row as a whole */
  errors?: Record<string, string>;
}

// ---------------------------------------------------------------------------------------------
// Timeline

export const TIMELINE_FILTERS = ['intake', 'job', 'transfer', 'photo', 'document', 'pad_map', 'note'] as const;
export type TimelineFilter = (typeof TIMELINE_FILTERS)[number];
export const TIMELINE_FILTER_LABELS: Record<TimelineFilter, string> = {
  intake: 'Intakes',
  job: 'Jobs and stages',
  transfer: 'Transfers',
  photo: 'Photos',
  document: 'Documents',
  pad_map: 'Pad maps',
  note: 'Notes',
};

/** Which filter a timeline entry belongs to; kinds written by later features fall under notes until named here. */
export function timelineFilterOf(kind: string): TimelineFilter {
  if (kind === 'intake' || kind === 'registered') return 'intake';
  if (kind === 'job_opened' || kind === 'stage_changed' || kind.startsWith('job_') || kind.startsWith('estimate_')) return 'job';
  if (kind.startsWith('transfer_')) return 'transfer';
  if (kind === 'photo' || kind === 'photo_added') return 'photo';
  if (kind === 'document' || kind === 'document_added') return 'document';
  if (kind === 'pad_map' || kind.startsWith('pad_map_')) return 'pad_map';
  return 'note';
}

export const timelineQuerySchema = z.object({
  kinds: z
    .string()
    .optional()
    .transform((s, ctx) => {
      if (!s) return undefined;
      const parts = s.split(',').map((p) => p.trim()).filter(Boolean);
      for (const p of parts) {
        if (!(TIMELINE_FILTERS as readonly string[]).includes(p)) {
          ctx.addIssue({ code: 'custom', message: `Unknown kind: ${p}` });
          return z.NEVER;
        }
      }
      return parts as TimelineFilter[];
    }),
});

/** The desk marks (or unmarks) an instrument that travels in a heavy case. */
export const heavyCaseSchema = z.object({ heavyCase: z.boolean({ error: 'Say whether the case is heavy.' }) });

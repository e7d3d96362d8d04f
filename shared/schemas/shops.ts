import { z } from 'zod';

/** Shops, skills, technicians' hours and relay runs: shared by the API and the Shops screen's forms. */

/** True for an IANA time zone name the runtime knows (e.g. America/Denver). */
export function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .transform((v) => (v === '' ? null : v))
    .nullable()
    .optional();

const weekdaysSchema = z
  .array(z.number().int().min(1).max(7), { error: 'Choose the days.' })
  .refine((days) => new Set(days).size === days.length, { error: 'Each day once.' })
  .transform((days) => [...days].sort((a, b) => a - b));

/** Hours in a week: 0 to 168. */
const weeklyHours = z.number({ error: 'Enter hours as a number.' }).min(0, { error: 'Hours cannot be negative.' }).max(168, { error: 'A week has 168 hours.' });

const shopFields = z.object({
  name: z.string().trim().min(1, { error: 'Enter the shop name.' }).max(120),
  code: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9]{2,8}$/, { error: '2 to 8 letters or digits, e.g. SEA.' }),
  addressLine: optionalText(200),
  city: optionalText(120),
  region: optionalText(120),
  postalCode: optionalText(20),
  country: z.string().trim().toUpperCase().regex(/^[A-Z]{2}$/, { error: 'Two-letter country code, e.g. US.' }),
  latitude: z.number({ error: 'Latitude is a number.' }).min(-90, { error: 'Between −90 and 90.' }).max(90, { error: 'Between −90 and 90.' }).nullable().optional(),
  longitude: z.number({ error: 'Longitude is a number.' }).min(-180, { error: 'Between −180 and 180.' }).max(180, { error: 'Between −180 and 180.' }).nullable().optional(),
  timeZone: z.string().trim().refine(isTimeZone, { error: 'Choose a time zone such as America/Denver.' }),
  openingDays: weekdaysSchema.refine((d) => d.length > 0, { error: 'Open at least one day.' }),
  laborRateCents: z.number({ error: 'Enter the hourly labor rate.' }).int().min(0, { error: 'The rate cannot be negative.' }).max(10_000_00),
  taxRateBasisPoints: z.number().int().min(0, { error: 'The tax rate cannot be negative.' }).max(10000, { error: 'At most 100 %.' }),
  phone: optionalText(40),
  email: z
    .string()
    .trim()
    .toLowerCase()
    .transform((v) => (v === '' ? null : v))
    .pipe(z.email({ error: 'Enter a valid e-mail address.' }).nullable())
    .nullable()
    .optional(),
  active: z.boolean(),
});

export const shopInputSchema = shopFields.extend({
  country: shopFields.shape.country.default('US'),
  taxRateBasisPoints: shopFields.shape.taxRateBasisPoints.default(0),
  active: shopFields.shape.active.default(true),
});
export type ShopInput = z.input<typeof shopInputSchema>;
export type ShopValues = z.output<typeof shopInputSchema>;

/** PATCH: any subset of the fields; nothing left out is reset to a default. */
export const shopUpdateSchema = shopFields.partial();
export type ShopUpdate = z.output<typeof shopUpdateSchema>;

export const shopSkillsSchema = z.object({
  skills: z
    .array(z.object({ skillId: z.uuid({ error: 'Choose a skill.' }), weeklyBenchHours: weeklyHours }))
    .max(100)
    .refine((s) => new Set(s.map((x) => x.skillId)).size === s.length, { error: 'Each skill once.' }),
});
export type ShopSkillsInput = z.infer<typeof shopSkillsSchema>;

export const technicianSkillsSchema = z.object({
  userId: z.uuid({ error: 'Choose a technician.' }),
  skills: z
    .array(z.object({ skillId: z.uuid({ error: 'Choose a skill.' }), weeklyHours }))
    .max(100)
    .refine((s) => new Set(s.map((x) => x.skillId)).size === s.length, { error: 'Each skill once.' }),
});
export type TechnicianSkillsInput = z.infer<typeof technicianSkillsSchema>;

export const skillInputSchema = z.object({
  code: z.string().trim().toLowerCase().regex(/^[a-z0-9_]{2,40}$/, { error: 'Lower-case letters, digits and _, e.g. low_sax.' }),
  name: z.string().trim().min(1, { error: 'Enter the skill name.' }).max(80),
});
export const skillUpdateSchema = skillInputSchema.partial();
export type SkillInput = z.infer<typeof skillInputSchema>;

const relayRunFields = {
  fromShopId: z.uuid({ error: 'Choose the shop it leaves from.' }),
  toShopId: z.uuid({ error: 'Choose the shop it goes to.' }),
  weekdays: weekdaysSchema.refine((d) => d.length > 0, { error: 'Choose at least one day.' }),
  /** Local time at the origin shop, HH:MM (24-hour). */
  departureTime: z.string().trim().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: 'Use 24-hour time, e.g. 07:30.' }),
  transitHours: z.number({ error: 'Enter the hours on the road.' }).gt(0, { error: 'More than 0 hours.' }).max(999),
  active: z.boolean().default(true),
};

export const relayRunInputSchema = z
  .object(relayRunFields)
  .refine((r) => r.fromShopId !== r.toShopId, { error: 'A run goes to another shop.', path: ['toShopId'] });
export type RelayRunInput = z.input<typeof relayRunInputSchema>;

export const relayRunUpdateSchema = z.object({
  weekdays: relayRunFields.weekdays.optional(),
  departureTime: relayRunFields.departureTime.optional(),
  transitHours: relayRunFields.transitHours.optional(),
  active: z.boolean().optional(),
});
export type RelayRunUpdate = z.infer<typeof relayRunUpdateSchema>;

export const relayRunQuerySchema = z.object({ shopId: z.uuid().optional() });

/** A shop as the Shops API answers it; the server builds it and the client reads it. */
export interface ShopSkillView {
  skillId: string;
  code: string;
  name: string;
  weeklyBenchHours: number;
}

export interface ShopView {
  id: string;
  name: string;
  code: string;
  addressLine: string | null;
  city: string | null;
  region: string | null;
  postalCode: string | null;
  country: string;
  latitude: number | null;
  longitude: number | null;
  timeZone: string;
  openingDays: number[];
  laborRateCents: number;
  taxRateBasisPoints: number;
  phone: string | null;
  email: string | null;
  active: boolean;
  skills: ShopSkillView[];
}

/** True for 'YYYY-MM-DD' naming a real calendar day (no 2027-02-30, no 2026-13-01). */
export function isCalendarDate(value: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (y < 1900 || y > 2200 || mo < 1 || mo > 12 || d < 1) return false;
  const t = new Date(Date.UTC(y, mo - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === mo - 1 && t.getUTCDate() === d;
}

const calendarDate = z
  .string({ error: 'Choose the day, e.g. 2027-07-05.' })
  .trim()
  .refine(isCalendarDate, { error: 'Choose a real calendar day as YYYY-MM-DD, e.g. 2027-07-05.' });

/** A day the owner closes the shop; a past day is allowed (turnaround reports count it too). */
export const closingDayInputSchema = z.object({
  date: calendarDate,
  reason: z
    .string({ error: 'Say why the shop is closed, e.g. Stocktake.' })
    .trim()
    .min(1, { error: 'Say why the shop is closed, e.g. Stocktake.' })
    .max(200, { error: 'At most 200 characters.' }),
});
export type ClosingDayInput = z.input<typeof closingDayInputSchema>;

/** The `:date` of DELETE /api/shops/:id/closing-days/:date. */
export const closingDayParamSchema = calendarDate;

export interface ClosingDayView {
  date: string;
  reason: string;
}

import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { QueryTypes, type CreationAttributes, type Transaction } from 'sequelize';
import { JOB_STAGES, type InstrumentFamily, type JobStage, type NotificationKind, type OwnerKind, type Role } from '../../shared/domain.js';
import {
  Customer,
  Instrument,
  Job,
  JobLineItem,
  Membership,
  Network,
  Notification,
  PadMap,
  Part,
  RelayRun,
  ServiceCatalogItem,
  Shop,
  ShopSkill,
  Skill,
  StockLevel,
  StockReservation,
  TechnicianSkill,
  TimeLog,
  Transfer,
  User,
  sequelize,
} from '../lib/models.js';
import { demoPeople } from './demo-people.js';
import { localDate } from '../../shared/time/shop-calendar.js';
import { appendHistoryMany, type HistoryEntry } from '../modules/registry/service.js';
import { computePadMap, type PadCatalog } from '../../shared/padmap/compute.js';
import { DEFAULT_PAD_RULES } from '../../shared/padmap/rules.js';
import type { Hazard } from '../../shared/safety/hazards.js';

/**
 * The demo network: an invented chain of five band-instrument repair shops with people in every
 * role, a registry of instruments, jobs in every stage, a transfer on the road and a year of
 * finished work for the reports. Every date is relative to the moment it is loaded, so the demo
 * looks current whenever a fresh database is started. Names of people, shops, schools and makers
 * are invented.
 */

export const DEMO_SLUG = 'demo';
const SEED_LOCK = 4242002; // distinct from the migration lock in server/migrate.ts

/** Small deterministic generator so the demo is the same on every machine (mulberry32). */
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const HOUR = 3_600_000;
/** The baritone saxophone on the road left this long before loading and arrives about a day later. */
const IN_FLIGHT_DEPARTED_HOURS_AGO = 6;
const DAY = 24 * HOUR;

// ---------------------------------------------------------------------------------------------
// Static content

/*
 * Invented for the demo: shops, street addresses, postal codes, phone numbers, labor rates and tax rates. Only the
 * cities, their coordinates and time zones are real. Postal codes sit in 00010–00099, a range no US ZIP code uses
 * (from memory: the lowest ZIP codes in use start at 005), so none can be mistaken for a real address. Phone numbers
 * use 555-0100 to 555-0199, the range set aside for fiction. The tax rates are round figures picked for the demo,
 * not any city's sales tax (Portland's 0 % shows an estimate without tax), and not for real invoices.
 * tests/server/seed-demo-invented.test.ts checks all of this.
 */
const SHOPS = [
  {
    code: 'SEA', name: 'Harborline Seattle', addressLine: '2217 Alder Crescent', city: 'Seattle', region: 'WA',
    postalCode: '00041', latitude: 47.6062, longitude: -122.3321, timeZone: 'America/Los_Angeles',
    openingDays: [1, 2, 3, 4, 5], laborRateCents: 9200, taxRateBasisPoints: 900, phone: '+1 206 555 0141',
  },
  {
    code: 'PDX', name: 'Harborline Portland', addressLine: '418 Quarry Lane', city: 'Portland', region: 'OR',
    postalCode: '00042', latitude: 45.5152, longitude: -122.6784, timeZone: 'America/Los_Angeles',
    openingDays: [2, 3, 4, 5, 6], laborRateCents: 8800, taxRateBasisPoints: 0, phone: '+1 503 555 0177',
  },
  {
    code: 'SAC', name: 'Harborline Sacramento', addressLine: '91 Tule Reed Way', city: 'Sacramento', region: 'CA',
    postalCode: '00043', latitude: 38.5816, longitude: -121.4944, timeZone: 'America/Los_Angeles',
    openingDays: [1, 2, 3, 4, 5], laborRateCents: 9000, taxRateBasisPoints: 750, phone: '+1 916 555 0123',
  },
  {
    code: 'DEN', name: 'Harborline Denver', addressLine: '3300 Larkbunting Street', city: 'Denver', region: 'CO',
    postalCode: '00044', latitude: 39.7392, longitude: -104.9903, timeZone: 'America/Denver',
    openingDays: [2, 3, 4, 5, 6], laborRateCents: 8500, taxRateBasisPoints: 600, phone: '+1 303 555 0162',
  },
  {
    code: 'CHI', name: 'Harborline Chicago', addressLine: '1508 West Ferrule Avenue', city: 'Chicago', region: 'IL',
    postalCode: '00045', latitude: 41.8781, longitude: -87.6298, timeZone: 'America/Chicago',
    openingDays: [1, 2, 3, 4, 5], laborRateCents: 9500, taxRateBasisPoints: 800, phone: '+1 312 555 0119',
  },
] as const;
type ShopCode = (typeof SHOPS)[number]['code'];

const SKILLS = [
  { code: 'low_sax', name: 'Low saxophones' },
  { code: 'flute', name: 'Flutes' },
  { code: 'clarinet_double_reed', name: 'Clarinets & double reeds' },
  { code: 'brass_dent', name: 'Brass dent work' },
  { code: 'woodwind', name: 'General woodwind' },
] as const;
type SkillCode = (typeof SKILLS)[number]['code'];

/** Weekly bench hours per skill; only Portland and Chicago take baritone saxophones. */
const SHOP_SKILLS: Record<ShopCode, Partial<Record<SkillCode, number>>> = {
  SEA: { woodwind: 80, flute: 40, clarinet_double_reed: 30, brass_dent: 30 },
  PDX: { low_sax: 40, woodwind: 60, clarinet_double_reed: 20 },
  SAC: { woodwind: 60, brass_dent: 40, flute: 20 },
  DEN: { woodwind: 40, brass_dent: 40, clarinet_double_reed: 40, flute: 30 },
  CHI: { low_sax: 20, woodwind: 60, flute: 40, brass_dent: 40 },
};

/** Courier trips. Seattle–Chicago, Seattle–Denver and Sacramento–Chicago have none on purpose. */
const RELAY_RUNS: Array<{ from: ShopCode; to: ShopCode; weekdays: number[]; departureTime: string; transitHours: number }> = [
  { from: 'SEA', to: 'PDX', weekdays: [2, 4], departureTime: '07:30:00', transitHours: 3.5 },
  { from: 'PDX', to: 'SEA', weekdays: [3, 5], departureTime: '08:00:00', transitHours: 3.5 },
  { from: 'PDX', to: 'SAC', weekdays: [1], departureTime: '06:00:00', transitHours: 10 },
  { from: 'SAC', to: 'PDX', weekdays: [4], departureTime: '06:00:00', transitHours: 10 },
  { from: 'SAC', to: 'DEN', weekdays: [3], departureTime: '05:00:00', transitHours: 30 },
  { from: 'DEN', to: 'CHI', weekdays: [1, 4], departureTime: '06:00:00', transitHours: 28 },
  { from: 'CHI', to: 'DEN', weekdays: [2], departureTime: '06:00:00', transitHours: 28 },
];

/** Memberships of the five demo people, in demoPeople order. */
const DEMO_ROLES: Array<Array<{ shop: ShopCode | null; role: Role }>> = [
  [{ shop: null, role: 'owner' }],
  [
    { shop: 'SEA', role: 'regional_manager' },
    { shop: 'PDX', role: 'regional_manager' },
    { shop: 'SAC', role: 'regional_manager' },
  ],
  [{ shop: 'SEA', role: 'front_desk' }],
  [
    { shop: 'PDX', role: 'technician' },
    { shop: 'SEA', role: 'front_desk' },
  ],
  [{ shop: 'DEN', role: 'auditor' }],
];
const DEMO_TECH_SKILLS: Record<number, { shop: ShopCode; skills: Partial<Record<SkillCode, number>> }> = {
  3: { shop: 'PDX', skills: { low_sax: 20, woodwind: 12 } },
};

/** Further bench staff so the job boards have assignees. */
const STAFF: Array<{ key: string; name: string; email: string; shop: ShopCode; skills: Partial<Record<SkillCode, number>> }> = [
  { key: 'odile', name: 'Odile Marchetti-Vance', email: 'odile.marchetti-vance@benchrelay.test', shop: 'SEA', skills: { flute: 20, woodwind: 15, clarinet_double_reed: 10 } },
  { key: 'desmond', name: 'Desmond Okafor-Lindqvist', email: 'desmond.okafor-lindqvist@benchrelay.test', shop: 'SEA', skills: { brass_dent: 30, woodwind: 10 } },
  { key: 'hana', name: 'Hana Thorsby', email: 'hana.thorsby@benchrelay.test', shop: 'PDX', skills: { low_sax: 20, woodwind: 10, clarinet_double_reed: 10 } },
  { key: 'lucien', name: 'Lucien Barrowcliffe', email: 'lucien.barrowcliffe@benchrelay.test', shop: 'SAC', skills: { woodwind: 25, brass_dent: 20, flute: 10 } },
  { key: 'marisol', name: 'Marisol Ekwueme', email: 'marisol.ekwueme@benchrelay.test', shop: 'DEN', skills: { clarinet_double_reed: 20, flute: 15, brass_dent: 15, woodwind: 10 } },
  { key: 'tobias', name: 'Tobias Renninger', email: 'tobias.renninger@benchrelay.test', shop: 'CHI', skills: { low_sax: 20, woodwind: 20, brass_dent: 10, flute: 10 } },
];

/*
 * The hazards each demo service carries, as an owner would tag them: a repad takes old pads out (heat, debonder,
 * solvent), glues new ones in (cement or cyanoacrylate, heat) and unhooks springs; dent work may unsolder a brace
 * and buffs the repair; cork and felt go on with contact cement or shellac over a flame.
 */
const REPAD: Hazard[] = ['pad_removal', 'adhesive', 'heat_flame', 'solvent', 'springs_sharp'];

const CATALOG = [
  { key: 'repad_alto', name: 'Repad — alto saxophone', family: 'alto_saxophone', hours: 6, skill: 'woodwind', hazards: REPAD },
  { key: 'repad_tenor', name: 'Repad — tenor saxophone', family: 'tenor_saxophone', hours: 7.5, skill: 'woodwind', hazards: REPAD },
  { key: 'repad_bari', name: 'Repad — baritone saxophone', family: 'baritone_saxophone', hours: 10, skill: 'low_sax', hazards: REPAD },
  { key: 'overhaul_bari', name: 'Overhaul — baritone saxophone', family: 'baritone_saxophone', hours: 18, skill: 'low_sax', hazards: ['pad_removal', 'adhesive', 'heat_flame', 'solvent', 'solder_lead', 'abrasive_rotary', 'springs_sharp'] },
  { key: 'play_bari', name: 'Play condition — baritone saxophone', family: 'baritone_saxophone', hours: 2.5, skill: 'low_sax', hazards: ['adhesive', 'heat_flame', 'springs_sharp'] },
  { key: 'play_woodwind', name: 'Play condition — woodwind', family: null, hours: 1.5, skill: 'woodwind', hazards: ['adhesive', 'heat_flame', 'springs_sharp'] },
  { key: 'repad_flute', name: 'Repad — flute', family: 'flute', hours: 5, skill: 'flute', hazards: REPAD },
  { key: 'repad_clarinet', name: 'Repad — clarinet', family: 'clarinet', hours: 3.5, skill: 'clarinet_double_reed', hazards: REPAD },
  { key: 'overhaul_clarinet', name: 'Overhaul — clarinet', family: 'clarinet', hours: 6, skill: 'clarinet_double_reed', hazards: ['pad_removal', 'adhesive', 'heat_flame', 'solvent', 'abrasive_rotary', 'springs_sharp'] },
  { key: 'double_reed', name: 'Adjust and seal — oboe or bassoon', family: null, hours: 2, skill: 'clarinet_double_reed', hazards: ['adhesive', 'heat_flame', 'springs_sharp'] },
  { key: 'leak_test', name: 'Leak test & adjust', family: null, hours: 1, skill: 'woodwind', hazards: ['springs_sharp'] },
  { key: 'cork_felt', name: 'Cork & felt replacement', family: null, hours: 1.5, skill: 'woodwind', hazards: ['adhesive', 'heat_flame'] },
  { key: 'dent_small', name: 'Dent removal — small brass', family: null, hours: 1.5, skill: 'brass_dent', hazards: ['solder_lead', 'abrasive_rotary'] },
  { key: 'dent_large', name: 'Dent removal — large brass', family: null, hours: 3, skill: 'brass_dent', hazards: ['solder_lead', 'abrasive_rotary'] },
  { key: 'chem_clean', name: 'Chemical clean & lubrication — brass', family: null, hours: 1.5, skill: 'brass_dent', hazards: ['solvent'] },
  { key: 'slide_align', name: 'Slide alignment — trombone', family: 'trombone', hours: 1, skill: 'brass_dent', hazards: ['solvent'] },
] as const satisfies ReadonlyArray<{ key: string; name: string; family: InstrumentFamily | null; hours: number; skill: string; hazards: readonly Hazard[] }>;
type CatalogKey = (typeof CATALOG)[number]['key'];

const OTHER_PARTS = [
  { sku: 'CORK-SHEET-1.6', name: 'Cork sheet 1.6 mm', unitPriceCents: 650, hazards: ['adhesive'] },
  { sku: 'CORK-NECK-SAX', name: 'Saxophone neck cork', unitPriceCents: 400, hazards: ['adhesive'] },
  { sku: 'FELT-ASSORT', name: 'Felt bumper assortment', unitPriceCents: 900, hazards: ['adhesive'] },
  { sku: 'SPRING-BLUE-ASSORT', name: 'Blue steel needle spring assortment', unitPriceCents: 1200, hazards: ['springs_sharp'] },
  { sku: 'PAD-CEMENT-STICK', name: 'Pad cement stick', unitPriceCents: 550, hazards: ['adhesive', 'heat_flame'] },
  { sku: 'STEM-SET-SL', name: 'Mounting stem set for self-leveling pads', unitPriceCents: 1800, hazards: ['adhesive'] },
  { sku: 'VALVE-GUIDE-TPT', name: 'Trumpet valve guide set', unitPriceCents: 1400, hazards: [] },
  { sku: 'WATERKEY-CORK', name: 'Water key cork', unitPriceCents: 150, hazards: ['adhesive'] },
] as const;

/** Pads for a repad, by family: [pad kind, diameter mm, quantity]. */
const PAD_SETS: Partial<Record<InstrumentFamily, Array<['glued' | 'self_leveling', number, number]>>> = {
  alto_saxophone: [['glued', 10, 2], ['glued', 14.5, 4], ['glued', 18, 5], ['glued', 24.5, 6], ['glued', 34, 4], ['glued', 45.5, 2]],
  tenor_saxophone: [['glued', 12, 2], ['glued', 17, 4], ['glued', 22.5, 5], ['glued', 29.5, 6], ['glued', 40, 4], ['glued', 52.5, 2]],
  baritone_saxophone: [['self_leveling', 14, 3], ['self_leveling', 20.5, 4], ['self_leveling', 27, 5], ['self_leveling', 36.5, 6], ['self_leveling', 48, 4], ['self_leveling', 57.5, 2]],
  clarinet: [['glued', 9, 5], ['glued', 10.5, 7], ['glued', 12, 5], ['glued', 15.5, 2]],
  bass_clarinet: [['glued', 12, 6], ['glued', 16, 8], ['glued', 23.5, 4]],
  flute: [['glued', 17.5, 14], ['glued', 19, 2]],
};

const PERSONS = [
  { key: 'P1', name: 'Julian Ostrowe-Park', email: 'julian.ostrowe-park@mail.test', phone: '+1 206 555 0188', shop: 'SEA' },
  { key: 'P2', name: 'Marguerite Delacorte', email: 'm.delacorte@mail.test', phone: '+1 503 555 0133', shop: 'PDX' },
  { key: 'P3', name: 'Kwame Hallberg', email: 'kwame.hallberg@mail.test', phone: '+1 916 555 0107', shop: 'SAC' },
  { key: 'P4', name: 'Saoirse Tanaka-Reid', email: 'saoirse.tr@mail.test', phone: '+1 303 555 0190', shop: 'DEN' },
  { key: 'P5', name: 'Benedikt Amari', email: 'b.amari@mail.test', phone: '+1 312 555 0156', shop: 'CHI' },
  { key: 'P6', name: 'Lorna Fitzwilliam-Osei', email: 'lorna.fo@mail.test', phone: '+1 206 555 0112', shop: 'SEA' },
] as const;
const SCHOOLS = [
  { key: 'S1', name: 'Quillon Park High School', contactName: 'Dashiell Farrow, band director', email: 'band@quillonpark.school.test', phone: '+1 206 555 0170', shop: 'SEA' },
  { key: 'S2', name: 'Marrowdale Middle School', contactName: 'Renata Brightwell, music teacher', email: 'music@marrowdale.school.test', phone: '+1 916 555 0164', shop: 'SAC' },
  { key: 'S3', name: 'Tallis Creek Unified School District', contactName: 'Imogen Saltmarsh, music coordinator', email: 'instruments@talliscreek.school.test', phone: '+1 303 555 0139', shop: 'DEN' },
] as const;
type OwnerKey = (typeof PERSONS)[number]['key'] | (typeof SCHOOLS)[number]['key'] | 'FLEET';

/**
 * Invented makers, each with its own serial style, so the registry shows why serials are normalised:
 * dashes and spaces, slashes, dots, underscores, lower case and leading zeros.
 */
const MAKERS = {
  A: { name: 'Aldmoor', serial: (n: number) => `AB-${100 + (n % 900)} ${String((n * 7919) % 1000).padStart(3, '0')}` },
  V: { name: 'Skelmire Winds', serial: (n: number) => String(7_700_000 + ((n * 104_729) % 300_000)) },
  Q: { name: 'Quellstone', serial: (n: number) => `Q ${700 + (n % 300)} ${String((n * 331) % 1000).padStart(3, '0')}` },
  H: { name: 'Harrowgate & Finch', serial: (n: number) => `HF/${20_000 + ((n * 4_099) % 80_000)}` },
  B: { name: 'Brassmere', serial: (n: number) => `BM.${10 + (n % 80)}.${String((n * 613) % 1000).padStart(3, '0')}` },
  O: { name: 'Oxlade Reedworks', serial: (n: number) => `ox ${4_000 + ((n * 97) % 5_000)}-${'abcdef'[n % 6]}` },
  T: { name: 'Tamsin Vale', serial: (n: number) => `TV_${30_000 + ((n * 2_311) % 60_000)}` },
  C: { name: 'Corvell Band Works', serial: (n: number) => String((n * 65_537) % 10_000_000).padStart(8, '0') },
} as const;
type MakerKey = keyof typeof MAKERS;

interface InstrumentSpec {
  key: string;
  family: InstrumentFamily;
  maker: MakerKey;
  model: string;
  owner: OwnerKey;
  shop: ShopCode;
  year: number;
  /** Fixed serial instead of the maker's generated one. */
  serial?: string;
  retired?: boolean;
}

// prettier-ignore
const INSTRUMENTS: InstrumentSpec[] = [
  // saxophones
  { key: 'alto1', family: 'alto_saxophone', maker: 'A', model: 'Fenlark Alto', owner: 'S1', shop: 'SEA', year: 2016, serial: 'AB-104 233' },
  { key: 'alto2', family: 'alto_saxophone', maker: 'V', model: 'Skelmire Alto', owner: 'FLEET', shop: 'SEA', year: 2019, serial: '7719204' },
  { key: 'alto3', family: 'alto_saxophone', maker: 'A', model: 'Fenlark Alto', owner: 'FLEET', shop: 'PDX', year: 2018 },
  { key: 'alto4', family: 'alto_saxophone', maker: 'V', model: 'Skelmire Alto', owner: 'P2', shop: 'PDX', year: 2011 },
  { key: 'alto5', family: 'alto_saxophone', maker: 'A', model: 'Tarnhollow Alto', owner: 'P3', shop: 'SAC', year: 2014 },
  { key: 'alto6', family: 'alto_saxophone', maker: 'V', model: 'Skelmire Alto', owner: 'S2', shop: 'SAC', year: 2017 },
  { key: 'alto7', family: 'alto_saxophone', maker: 'A', model: 'Fenlark Alto', owner: 'S3', shop: 'DEN', year: 2020 },
  { key: 'alto8', family: 'alto_saxophone', maker: 'V', model: 'Skelmire Alto', owner: 'P5', shop: 'CHI', year: 2009 },
  { key: 'alto9', family: 'alto_saxophone', maker: 'A', model: 'Fenlark Alto', owner: 'FLEET', shop: 'CHI', year: 2021 },
  { key: 'alto10', family: 'alto_saxophone', maker: 'A', model: 'Fenlark Alto', owner: 'S1', shop: 'SEA', year: 2015 },
  { key: 'tenor1', family: 'tenor_saxophone', maker: 'A', model: 'Fenlark Tenor', owner: 'S1', shop: 'SEA', year: 2013 },
  { key: 'tenor2', family: 'tenor_saxophone', maker: 'V', model: 'Skelmire Tenor', owner: 'P2', shop: 'PDX', year: 2006 },
  { key: 'tenor3', family: 'tenor_saxophone', maker: 'A', model: 'Fenlark Tenor', owner: 'S2', shop: 'PDX', year: 2012 },
  { key: 'tenor4', family: 'tenor_saxophone', maker: 'V', model: 'Skelmire Tenor', owner: 'FLEET', shop: 'CHI', year: 2018 },
  { key: 'tenor5', family: 'tenor_saxophone', maker: 'A', model: 'Fenlark Tenor', owner: 'S3', shop: 'DEN', year: 2016 },
  { key: 'tenor6', family: 'tenor_saxophone', maker: 'V', model: 'Skelmire Tenor', owner: 'P6', shop: 'SEA', year: 2002 },
  { key: 'bari1', family: 'baritone_saxophone', maker: 'A', model: 'Fenlark Baritone', owner: 'S1', shop: 'SEA', year: 2010 },
  { key: 'bari2', family: 'baritone_saxophone', maker: 'V', model: 'Skelmire Baritone', owner: 'S3', shop: 'DEN', year: 2008 },
  { key: 'bari3', family: 'baritone_saxophone', maker: 'A', model: 'Fenlark Baritone', owner: 'FLEET', shop: 'PDX', year: 2015 },
  { key: 'bari4', family: 'baritone_saxophone', maker: 'V', model: 'Skelmire Baritone', owner: 'S2', shop: 'CHI', year: 2012 },
  { key: 'bari5', family: 'baritone_saxophone', maker: 'A', model: 'Fenlark Baritone Low A', owner: 'P5', shop: 'CHI', year: 2019 },
  { key: 'sop1', family: 'soprano_saxophone', maker: 'A', model: 'Fenlark Soprano', owner: 'P5', shop: 'CHI', year: 2017 },
  // flutes and piccolos
  { key: 'flute1', family: 'flute', maker: 'Q', model: 'Brookmint Student', owner: 'S1', shop: 'SEA', year: 2018, serial: 'q 771 002' },
  { key: 'flute2', family: 'flute', maker: 'T', model: 'Ottermere Open Hole', owner: 'P1', shop: 'SEA', year: 2010 },
  { key: 'flute3', family: 'flute', maker: 'Q', model: 'Brookmint Student', owner: 'FLEET', shop: 'SAC', year: 2020 },
  { key: 'flute4', family: 'flute', maker: 'T', model: 'Ottermere Open Hole', owner: 'S3', shop: 'DEN', year: 2015 },
  { key: 'flute5', family: 'flute', maker: 'Q', model: 'Brookmint Open Hole', owner: 'P4', shop: 'DEN', year: 2012 },
  { key: 'flute6', family: 'flute', maker: 'Q', model: 'Brookmint Student', owner: 'FLEET', shop: 'CHI', year: 2022 },
  { key: 'flute7', family: 'flute', maker: 'T', model: 'Ottermere Student', owner: 'S2', shop: 'SAC', year: 2019 },
  { key: 'flute8', family: 'flute', maker: 'Q', model: 'Brookmint Student', owner: 'S1', shop: 'SEA', year: 2021 },
  { key: 'picc1', family: 'piccolo', maker: 'Q', model: 'Brookmint Piccolo', owner: 'S3', shop: 'DEN', year: 2014 },
  { key: 'picc2', family: 'piccolo', maker: 'T', model: 'Ottermere Piccolo', owner: 'P1', shop: 'SEA', year: 2016 },
  // clarinets and double reeds
  { key: 'clar1', family: 'clarinet', maker: 'H', model: 'Pellowick Student', owner: 'S1', shop: 'SEA', year: 2017 },
  { key: 'clar2', family: 'clarinet', maker: 'O', model: 'Reedling Student', owner: 'FLEET', shop: 'PDX', year: 2019 },
  { key: 'clar3', family: 'clarinet', maker: 'H', model: 'Pellowick Student', owner: 'S2', shop: 'SAC', year: 2016 },
  { key: 'clar4', family: 'clarinet', maker: 'O', model: 'Reedling Concert', owner: 'P4', shop: 'DEN', year: 2005 },
  { key: 'clar5', family: 'clarinet', maker: 'H', model: 'Pellowick Student', owner: 'S3', shop: 'DEN', year: 2018 },
  { key: 'clar6', family: 'clarinet', maker: 'O', model: 'Reedling Student', owner: 'FLEET', shop: 'CHI', year: 2020 },
  { key: 'clar7', family: 'clarinet', maker: 'H', model: 'Pellowick Concert', owner: 'P6', shop: 'SEA', year: 2011 },
  { key: 'clar8', family: 'clarinet', maker: 'O', model: 'Reedling Student', owner: 'FLEET', shop: 'SAC', year: 2013, retired: true },
  { key: 'bcl1', family: 'bass_clarinet', maker: 'H', model: 'Pellowick Bass', owner: 'S3', shop: 'DEN', year: 2009 },
  { key: 'bcl2', family: 'bass_clarinet', maker: 'O', model: 'Reedling Bass Low E', owner: 'S2', shop: 'PDX', year: 2014 },
  { key: 'oboe1', family: 'oboe', maker: 'H', model: 'Pellowick Oboe', owner: 'S2', shop: 'PDX', year: 2011 },
  { key: 'oboe2', family: 'oboe', maker: 'H', model: 'Pellowick Oboe', owner: 'P3', shop: 'SAC', year: 2018 },
  { key: 'bsn1', family: 'bassoon', maker: 'H', model: 'Pellowick Bassoon', owner: 'S3', shop: 'DEN', year: 2007 },
  // brass
  { key: 'tpt1', family: 'trumpet', maker: 'B', model: 'Gullstep Trumpet', owner: 'S1', shop: 'SEA', year: 2018 },
  { key: 'tpt2', family: 'trumpet', maker: 'C', model: 'Thistlecombe Trumpet', owner: 'P3', shop: 'SAC', year: 2015, serial: '7719204' },
  { key: 'tpt3', family: 'trumpet', maker: 'B', model: 'Gullstep Trumpet', owner: 'FLEET', shop: 'SAC', year: 2021 },
  { key: 'tpt4', family: 'trumpet', maker: 'B', model: 'Gullstep Large Bore', owner: 'P5', shop: 'CHI', year: 2012 },
  { key: 'tpt5', family: 'trumpet', maker: 'C', model: 'Thistlecombe Trumpet', owner: 'FLEET', shop: 'DEN', year: 2019 },
  { key: 'tpt6', family: 'trumpet', maker: 'B', model: 'Gullstep Trumpet', owner: 'S2', shop: 'SAC', year: 2020 },
  { key: 'tbn1', family: 'trombone', maker: 'B', model: 'Gullstep Trombone', owner: 'S1', shop: 'SEA', year: 2014 },
  { key: 'tbn2', family: 'trombone', maker: 'B', model: 'Gullstep Trombone', owner: 'FLEET', shop: 'CHI', year: 2017 },
  { key: 'tbn3', family: 'trombone', maker: 'C', model: 'Thistlecombe Trombone F', owner: 'S3', shop: 'DEN', year: 2011 },
  { key: 'tbn4', family: 'trombone', maker: 'B', model: 'Gullstep Trombone', owner: 'P1', shop: 'SEA', year: 2008 },
  { key: 'horn1', family: 'french_horn', maker: 'B', model: 'Gullstep Double Horn', owner: 'S3', shop: 'DEN', year: 2013 },
  { key: 'horn2', family: 'french_horn', maker: 'B', model: 'Gullstep Single Horn', owner: 'S2', shop: 'SAC', year: 2016 },
  { key: 'euph1', family: 'euphonium', maker: 'C', model: 'Thistlecombe Compensating', owner: 'S2', shop: 'SAC', year: 2010 },
  { key: 'tuba1', family: 'tuba', maker: 'C', model: 'Thistlecombe Grand', owner: 'S2', shop: 'SAC', year: 2004 },
  { key: 'tuba2', family: 'tuba', maker: 'C', model: 'Thistlecombe Grand', owner: 'S1', shop: 'SEA', year: 2009 },
];

interface OpenJobSpec {
  inst: string;
  shop: ShopCode;
  stage: JobStage;
  service: CatalogKey;
  openedDaysAgo: number;
  /** Days from today to the promise; negative means the promise has already passed. */
  promisedInDays: number | null;
  assignee?: string;
  /** For holds: the main stage to resume. */
  resume?: (typeof JOB_STAGES)[number];
  complaint: string;
}

// prettier-ignore
const OPEN_JOBS: OpenJobSpec[] = [
  { inst: 'alto1', shop: 'SEA', stage: 'intake', service: 'play_woodwind', openedDaysAgo: 0.2, promisedInDays: 7, complaint: 'Low notes gurgle below D; octave key sticks.' },
  { inst: 'flute1', shop: 'SEA', stage: 'assessed', service: 'repad_flute', openedDaysAgo: 2, promisedInDays: 12, complaint: 'Will not play below middle C; pads torn on foot joint.' },
  { inst: 'tpt1', shop: 'SEA', stage: 'approved', service: 'dent_small', openedDaysAgo: 4, promisedInDays: 5, assignee: 'desmond', complaint: 'Dropped in the band room; bell dented, third slide stuck.' },
  { inst: 'clar1', shop: 'SEA', stage: 'on_bench', service: 'repad_clarinet', openedDaysAgo: 6, promisedInDays: 3, assignee: 'odile', complaint: 'Squeaks on throat tones; several pads hard and cracked.' },
  { inst: 'alto10', shop: 'SEA', stage: 'quality_check', service: 'repad_alto', openedDaysAgo: 12, promisedInDays: 1, assignee: 'odile', complaint: 'Full repad requested before spring concerts.' },
  { inst: 'flute8', shop: 'SEA', stage: 'ready', service: 'cork_felt', openedDaysAgo: 5, promisedInDays: 0, assignee: 'odile', complaint: 'Head joint cork loose; clicking keys.' },
  { inst: 'tenor1', shop: 'SEA', stage: 'waiting_for_parts', resume: 'on_bench', service: 'repad_tenor', openedDaysAgo: 15, promisedInDays: 4, assignee: 'odile', complaint: 'Leaks throughout; student reports stuffy low register.' },
  { inst: 'bari1', shop: 'SEA', stage: 'assessed', service: 'overhaul_bari', openedDaysAgo: 3, promisedInDays: 21, complaint: 'Low A key bent; many pads leaking; needs full overhaul.' },
  { inst: 'tbn1', shop: 'SEA', stage: 'on_bench', service: 'slide_align', openedDaysAgo: 14, promisedInDays: -3, assignee: 'desmond', complaint: 'Slide drags in fifth and sixth position.' },
  { inst: 'bari3', shop: 'PDX', stage: 'on_bench', service: 'overhaul_bari', openedDaysAgo: 10, promisedInDays: 9, assignee: 'mateo', complaint: 'Rental return: overhaul before the next school year.' },
  { inst: 'tenor2', shop: 'PDX', stage: 'intake', service: 'play_woodwind', openedDaysAgo: 0.5, promisedInDays: 10, complaint: 'Neck tenon loose; wobbles in the receiver.' },
  { inst: 'clar2', shop: 'PDX', stage: 'approved', service: 'repad_clarinet', openedDaysAgo: 3, promisedInDays: 6, assignee: 'hana', complaint: 'Rental check-in: leaks on lower joint.' },
  { inst: 'alto3', shop: 'PDX', stage: 'ready', service: 'leak_test', openedDaysAgo: 6, promisedInDays: -1, assignee: 'hana', complaint: 'Rental check-in: general leak test.' },
  { inst: 'oboe1', shop: 'PDX', stage: 'waiting_for_parts', resume: 'approved', service: 'double_reed', openedDaysAgo: 9, promisedInDays: -2, assignee: 'hana', complaint: 'Octave vent leaks; bridge key out of regulation.' },
  { inst: 'tpt3', shop: 'SAC', stage: 'intake', service: 'chem_clean', openedDaysAgo: 1, promisedInDays: 8, complaint: 'Valves sluggish; green build-up in leadpipe.' },
  { inst: 'euph1', shop: 'SAC', stage: 'assessed', service: 'dent_large', openedDaysAgo: 4, promisedInDays: 14, complaint: 'Bow dented after a fall from a chair.' },
  { inst: 'flute3', shop: 'SAC', stage: 'on_bench', service: 'repad_flute', openedDaysAgo: 18, promisedInDays: -5, assignee: 'lucien', complaint: 'Rental return: pads worn, G sharp key sticks.' },
  { inst: 'alto6', shop: 'SAC', stage: 'quality_check', service: 'repad_alto', openedDaysAgo: 13, promisedInDays: 2, assignee: 'lucien', complaint: 'School instrument: full repad.' },
  { inst: 'tuba1', shop: 'SAC', stage: 'approved', service: 'dent_large', openedDaysAgo: 6, promisedInDays: 10, assignee: 'lucien', complaint: 'Large dent on bottom bow; fourth valve slide frozen.' },
  { inst: 'clar5', shop: 'DEN', stage: 'on_bench', service: 'overhaul_clarinet', openedDaysAgo: 8, promisedInDays: 4, assignee: 'marisol', complaint: 'Tenon cracked at the upper joint ring; pads worn.' },
  { inst: 'bsn1', shop: 'DEN', stage: 'assessed', service: 'double_reed', openedDaysAgo: 2, promisedInDays: 12, complaint: 'Whisper key does not close; wing joint leaks.' },
  { inst: 'horn1', shop: 'DEN', stage: 'ready', service: 'chem_clean', openedDaysAgo: 9, promisedInDays: 0, assignee: 'marisol', complaint: 'Rotors slow; strings frayed.' },
  { inst: 'picc1', shop: 'DEN', stage: 'intake', service: 'leak_test', openedDaysAgo: 0.3, promisedInDays: 9, complaint: 'Upper register unstable.' },
  { inst: 'bcl1', shop: 'DEN', stage: 'waiting_for_parts', resume: 'on_bench', service: 'repad_clarinet', openedDaysAgo: 16, promisedInDays: -4, assignee: 'marisol', complaint: 'Low register leaks; several large pads missing.' },
  { inst: 'flute5', shop: 'DEN', stage: 'approved', service: 'repad_flute', openedDaysAgo: 20, promisedInDays: -6, assignee: 'marisol', complaint: 'Pads seating poorly after a season of heavy use.' },
  { inst: 'bari2', shop: 'DEN', stage: 'in_transit', resume: 'approved', service: 'repad_bari', openedDaysAgo: 7, promisedInDays: 14, complaint: 'Low B and B-flat pads leak; bow guard loose.' },
  { inst: 'bari4', shop: 'CHI', stage: 'quality_check', service: 'repad_bari', openedDaysAgo: 16, promisedInDays: 1, assignee: 'tobias', complaint: 'School instrument: repad before marching season.' },
  { inst: 'alto8', shop: 'CHI', stage: 'on_bench', service: 'repad_alto', openedDaysAgo: 9, promisedInDays: 5, assignee: 'tobias', complaint: 'Vintage horn: original pads hardened.' },
  { inst: 'tbn2', shop: 'CHI', stage: 'intake', service: 'slide_align', openedDaysAgo: 0.4, promisedInDays: 6, complaint: 'Rental return: slide bent near the bottom bow.' },
  { inst: 'sop1', shop: 'CHI', stage: 'assessed', service: 'play_woodwind', openedDaysAgo: 3, promisedInDays: 8, complaint: 'Palm keys leak; neck cork compressed.' },
  { inst: 'tpt4', shop: 'CHI', stage: 'ready', service: 'dent_small', openedDaysAgo: 8, promisedInDays: -2, assignee: 'tobias', complaint: 'Leadpipe dent; water key cork missing.' },
  { inst: 'tenor4', shop: 'CHI', stage: 'approved', service: 'repad_tenor', openedDaysAgo: 5, promisedInDays: 11, assignee: 'tobias', complaint: 'Rental: multiple pads torn.' },
];

/** The service a finished visit most likely was, by family. */
const RELEASED_SERVICES: Record<InstrumentFamily, CatalogKey[]> = {
  alto_saxophone: ['repad_alto', 'play_woodwind', 'leak_test'],
  tenor_saxophone: ['repad_tenor', 'play_woodwind'],
  baritone_saxophone: ['play_bari', 'repad_bari'],
  bass_saxophone: ['play_bari'],
  soprano_saxophone: ['play_woodwind'],
  flute: ['repad_flute', 'cork_felt', 'leak_test'],
  piccolo: ['leak_test', 'cork_felt'],
  clarinet: ['repad_clarinet', 'cork_felt', 'overhaul_clarinet'],
  bass_clarinet: ['repad_clarinet', 'leak_test'],
  oboe: ['double_reed'],
  bassoon: ['double_reed'],
  trumpet: ['chem_clean', 'dent_small'],
  trombone: ['slide_align', 'chem_clean'],
  french_horn: ['chem_clean', 'dent_small'],
  euphonium: ['dent_large', 'chem_clean'],
  tuba: ['dent_large', 'chem_clean'],
  other: ['play_woodwind'],
};

const SHOP_NAME: Record<ShopCode, string> = Object.fromEntries(SHOPS.map((s) => [s.code, s.name.replace('Harborline ', '')])) as Record<ShopCode, string>;

// ---------------------------------------------------------------------------------------------

export interface DemoResult {
  created: boolean;
  networkId: string;
}

/**
 * Loads the demo network unless one with slug `demo` exists. Runs in one transaction under an
 * advisory lock, so two processes starting together load it once and a failure leaves nothing behind.
 */
export async function loadDemoNetwork(): Promise<DemoResult> {
  return sequelize.transaction(async (transaction) => {
    await sequelize.query(`select pg_advisory_xact_lock(${SEED_LOCK})`, { transaction });
    const existing = await Network.findOne({ where: { slug: DEMO_SLUG }, transaction });
    if (existing) return { created: false, networkId: existing.id };
    const networkId = await createDemoNetwork(transaction, new Date());
    return { created: true, networkId };
  });
}

async function createDemoNetwork(transaction: Transaction, now: Date): Promise<string> {
  const t = { transaction };
  const rand = prng(20_240_611);
  const pick = <T>(items: readonly T[]): T => items[Math.floor(rand() * items.length)];
  const ago = (days: number) => new Date(now.getTime() - days * DAY);

  const network = await Network.create({ name: 'Harborline Band Instrument Repair', slug: DEMO_SLUG, settings: {} }, t);
  const networkId = network.id;

  // shops, skills, capacity, relay runs
  const shopId = {} as Record<ShopCode, string>;
  const shopByCode = {} as Record<ShopCode, (typeof SHOPS)[number]>;
  await Shop.bulkCreate(
    SHOPS.map((s) => {
      shopId[s.code] = randomUUID();
      shopByCode[s.code] = s;
      return {
        ...s, openingDays: [...s.openingDays] as Shop['openingDays'], id: shopId[s.code], networkId, country: 'US',
        email: `${s.code.toLowerCase()}@harborline.benchrelay.test`,
      };
    }),
    t,
  );
  const skillId = {} as Record<SkillCode, string>;
  await Skill.bulkCreate(
    SKILLS.map((s) => {
      skillId[s.code] = randomUUID();
      return { id: skillId[s.code], networkId, code: s.code, name: s.name };
    }),
    t,
  );
  await ShopSkill.bulkCreate(
    (Object.keys(SHOP_SKILLS) as ShopCode[]).flatMap((code) =>
      Object.entries(SHOP_SKILLS[code]).map(([skill, hours]) => ({
        networkId, shopId: shopId[code], skillId: skillId[skill as SkillCode], weeklyBenchHours: hours,
      })),
    ),
    t,
  );
  const runId = new Map<string, string>();
  await RelayRun.bulkCreate(
    RELAY_RUNS.map((r) => {
      const id = randomUUID();
      runId.set(`${r.from}>${r.to}`, id);
      return {
        id, networkId, fromShopId: shopId[r.from], toShopId: shopId[r.to],
        weekdays: r.weekdays as RelayRun['weekdays'], departureTime: r.departureTime, transitHours: r.transitHours,
      };
    }),
    t,
  );

  // people
  const userId: Record<string, string> = {};
  const userName: Record<string, string> = {};
  const people = demoPeople.map((p, i) => ({ key: ['owner', 'manager', 'desk', 'mateo', 'auditor'][i] ?? `demo${i}`, ...p }));
  const users = [
    ...people.map((p) => ({ key: p.key, email: p.email, name: p.name })),
    ...STAFF.map((s) => ({ key: s.key, email: s.email, name: s.name })),
  ];
  await User.bulkCreate(
    users.map((u) => {
      userId[u.key] = randomUUID();
      userName[u.key] = u.name;
      return { id: userId[u.key], networkId, email: u.email, name: u.name };
    }),
    t,
  );
  const memberships: Array<{ user: string; shop: ShopCode | null; role: Role }> = [
    ...people.flatMap((p, i) => (DEMO_ROLES[i] ?? []).map((r) => ({ user: p.key, shop: r.shop, role: r.role }))),
    ...STAFF.map((s) => ({ user: s.key, shop: s.shop, role: 'technician' as const })),
  ];
  await Membership.bulkCreate(
    memberships.map((m) => ({ networkId, userId: userId[m.user], shopId: m.shop ? shopId[m.shop] : null, role: m.role })),
    t,
  );
  const techSkills = [
    ...Object.entries(DEMO_TECH_SKILLS).map(([i, v]) => ({ user: people[Number(i)].key, ...v })),
    ...STAFF.map((s) => ({ user: s.key, shop: s.shop, skills: s.skills })),
  ];
  await TechnicianSkill.bulkCreate(
    techSkills.flatMap((ts) =>
      Object.entries(ts.skills).map(([skill, hours]) => ({
        networkId, userId: userId[ts.user], shopId: shopId[ts.shop], skillId: skillId[skill as SkillCode], weeklyHours: hours,
      })),
    ),
    t,
  );
  /** Bench staff per shop, with their skills, for assignments. */
  const benchAt = (code: ShopCode) => techSkills.filter((ts) => ts.shop === code);
  const assigneeFor = (code: ShopCode, skill: SkillCode): string | null => {
    const staff = benchAt(code);
    const skilled = staff.filter((s) => (s.skills[skill] ?? 0) > 0);
    const chosen = skilled[0] ?? staff[0];
    return chosen ? chosen.user : null;
  };

  // service catalog
  const catalogId = {} as Record<CatalogKey, string>;
  const catalogByKey = Object.fromEntries(CATALOG.map((c) => [c.key, c])) as Record<CatalogKey, (typeof CATALOG)[number]>;
  await ServiceCatalogItem.bulkCreate(
    CATALOG.map((c) => {
      catalogId[c.key] = randomUUID();
      return {
        id: catalogId[c.key], networkId, name: c.name, family: c.family, standardHours: c.hours, skillId: skillId[c.skill],
        hazards: [...c.hazards],
      };
    }),
    t,
  );

  // parts: pads every 0.5 mm from 6 to 58 mm in both kinds, plus sundries
  const partRows: Array<CreationAttributes<Part>> = [];
  const padId = new Map<string, { id: string; price: number; name: string }>();
  for (let tenths = 60; tenths <= 580; tenths += 5) {
    const d = tenths / 10;
    // thicker pads for larger cups, as pad makers commonly offer (common practice)
    const glued = d < 10 ? 2.6 : d < 20 ? 3.2 : d < 35 ? 4 : d < 50 ? 4.5 : 5;
    const selfLeveling = d < 10 ? 2.4 : d < 20 ? 3 : d < 35 ? 3.6 : 4.2;
    for (const [kind, thickness, price, prefix] of [
      ['glued', glued, Math.round(120 + d * 9), 'G'],
      ['self_leveling', selfLeveling, Math.round(220 + d * 13), 'S'],
    ] as const) {
      const id = randomUUID();
      const label = kind === 'glued' ? 'Glued pad' : 'Self-leveling pad';
      const name = `${label} ${d.toFixed(1)} mm × ${thickness.toFixed(1)} mm`;
      padId.set(`${kind}:${d}`, { id, price, name });
      partRows.push({
        id, networkId, sku: `PAD-${prefix}-${d.toFixed(1)}`, name, kind: 'pad', padKind: kind, diameterMm: d, thicknessMm: thickness, unitPriceCents: price,
        // glued pads are seated in warmed cement; self-leveling pads have their stem glued with cyanoacrylate
        hazards: kind === 'glued' ? ['adhesive', 'heat_flame'] : ['adhesive'],
      });
    }
  }
  const otherPartId: Record<string, { id: string; price: number; name: string }> = {};
  for (const p of OTHER_PARTS) {
    const id = randomUUID();
    otherPartId[p.sku] = { id, price: p.unitPriceCents, name: p.name };
    partRows.push({ id, networkId, sku: p.sku, name: p.name, kind: 'other', unitPriceCents: p.unitPriceCents, hazards: [...p.hazards] });
  }
  await Part.bulkCreate(partRows, t);

  // customers
  const customerId: Record<string, string> = {};
  await Customer.bulkCreate(
    [
      ...PERSONS.map((p) => ({ key: p.key, kind: 'person' as const, name: p.name, contactName: null, email: p.email, phone: p.phone, shop: p.shop })),
      ...SCHOOLS.map((s) => ({ key: s.key, kind: 'school' as const, name: s.name, contactName: s.contactName, email: s.email, phone: s.phone, shop: s.shop })),
      { key: 'FLEET', kind: 'fleet' as const, name: 'Harborline Rental Fleet', contactName: 'Rental desk', email: 'rentals@harborline.benchrelay.test', phone: '+1 206 555 0100', shop: 'SEA' as ShopCode },
    ].map((c) => {
      customerId[c.key] = randomUUID();
      return {
        id: customerId[c.key], networkId, kind: c.kind, name: c.name, contactName: c.contactName, email: c.email,
        phone: c.phone, homeShopId: shopId[c.shop],
        notes: c.kind === 'fleet' ? 'The network’s own rental instruments.' : null,
      };
    }),
    t,
  );
  const ownerKindOf = (owner: OwnerKey): OwnerKind => (owner === 'FLEET' ? 'rental_fleet' : owner.startsWith('S') ? 'school' : 'customer');

  // ---- jobs: plan everything in memory first, then write in bulk ----
  interface PlannedJob {
    id: string;
    inst: InstrumentSpec;
    shop: ShopCode;
    stage: JobStage;
    resume: (typeof JOB_STAGES)[number] | null;
    service: CatalogKey;
    openedAt: Date;
    readyAt: Date | null;
    releasedAt: Date | null;
    promisedOn: string | null;
    assignee: string | null;
    complaint: string;
    /** Stage changes: [to, at, shop]. */
    path: Array<[JobStage, Date, ShopCode]>;
    openedBy: string;
  }
  const instByKey = new Map(INSTRUMENTS.map((i) => [i.key, i]));
  const planned: PlannedJob[] = [];
  const deskFor = (code: ShopCode) => (code === 'SEA' ? 'desk' : code === 'DEN' || code === 'CHI' ? 'owner' : 'manager');

  /** Main-line stage changes from intake up to `to`, spread evenly between two instants. */
  const mainPath = (to: (typeof JOB_STAGES)[number], from: Date, until: Date, shop: ShopCode) => {
    const stages = JOB_STAGES.slice(1, JOB_STAGES.indexOf(to) + 1);
    const step = (until.getTime() - from.getTime()) / (stages.length + 1);
    return stages.map((s, i) => [s, new Date(from.getTime() + step * (i + 1)), shop] as [JobStage, Date, ShopCode]);
  };

  for (const spec of OPEN_JOBS) {
    const inst = instByKey.get(spec.inst)!;
    const openedAt = ago(spec.openedDaysAgo);
    const until = new Date(now.getTime() - 2 * HOUR);
    let path: PlannedJob['path'];
    if (spec.resume) {
      path = mainPath(spec.resume, openedAt, until, spec.shop);
      path.push([spec.stage, new Date((path.at(-1)?.[1] ?? openedAt).getTime() + (until.getTime() - (path.at(-1)?.[1] ?? openedAt).getTime()) / 2), spec.shop]);
    } else {
      path = spec.stage === 'intake' ? [] : mainPath(spec.stage as (typeof JOB_STAGES)[number], openedAt, until, spec.shop);
    }
    if (spec.stage === 'in_transit') {
      // the job went on hold when the instrument left on the relay run
      path[path.length - 1][1] = new Date(now.getTime() - IN_FLIGHT_DEPARTED_HOURS_AGO * HOUR);
    }
    const readyAt = spec.stage === 'ready' ? path.at(-1)![1] : null;
    const promised = spec.promisedInDays == null ? null : localDate(new Date(now.getTime() + spec.promisedInDays * DAY), shopByCode[spec.shop].timeZone);
    const skill = catalogByKey[spec.service].skill;
    planned.push({
      id: randomUUID(), inst, shop: spec.shop, stage: spec.stage, resume: spec.resume ?? null, service: spec.service,
      openedAt, readyAt, releasedAt: null, promisedOn: promised,
      assignee: spec.assignee ?? (['intake', 'assessed', 'in_transit'].includes(spec.stage) ? null : assigneeFor(spec.shop, skill)),
      complaint: spec.complaint, path, openedBy: deskFor(spec.shop),
    });
  }

  // A year of finished visits. Visits of one instrument never overlap, and end before its open job starts.
  const openStart = new Map(OPEN_JOBS.map((j) => [j.inst, j.openedDaysAgo]));
  const shopCodes = SHOPS.map((s) => s.code);
  INSTRUMENTS.forEach((inst, i) => {
    if (i % 3 === 2) return; // some instruments have never been in
    const first = Math.max(35 + ((i * 53) % 300), (openStart.get(inst.key) ?? 0) + 40);
    const starts = [first];
    if (i % 4 === 0 && first + 150 < 362) starts.push(first + 150);
    starts.forEach((startDaysAgo, visit) => {
      // every seventh instrument was last seen at a neighbouring shop: a serial with history at two shops
      const shop = visit === 0 && i % 7 === 3 ? shopCodes[(shopCodes.indexOf(inst.shop) + 1) % shopCodes.length] : inst.shop;
      const service = pick(RELEASED_SERVICES[inst.family]);
      const hours = catalogByKey[service].hours;
      const openedAt = new Date(ago(startDaysAgo).getTime() + Math.floor(rand() * 8) * HOUR);
      const turnaroundDays = 2 + hours * (0.8 + rand() * 1.6) + rand() * 6;
      const readyAt = new Date(openedAt.getTime() + turnaroundDays * DAY);
      const releasedAt = new Date(readyAt.getTime() + (0.3 + rand() * 5) * DAY);
      const path = mainPath('ready', openedAt, readyAt, shop);
      path[path.length - 1][1] = readyAt;
      path.push(['released', releasedAt, shop]);
      const promisedLate = rand() < 0.2; // about one promise in five was missed
      const promisedAt = new Date(openedAt.getTime() + (promisedLate ? turnaroundDays * 0.7 : turnaroundDays + 1 + rand() * 3) * DAY);
      planned.push({
        id: randomUUID(), inst, shop, stage: 'released', resume: null, service, openedAt, readyAt, releasedAt,
        promisedOn: localDate(promisedAt, shopByCode[shop].timeZone),
        assignee: assigneeFor(shop, catalogByKey[service].skill),
        complaint: pick(['Annual service for the school year.', 'Student reports notes not speaking.', 'Sticky keys and leaks after summer storage.', 'Routine check before a recital.', 'Rental return inspection.']),
        path, openedBy: deskFor(shop),
      });
    });
  });

  // A transfer that finished months ago: Sacramento sent a tenor with a seam leak to Portland's bench.
  const pastTransferJob = (() => {
    const inst = instByKey.get('tenor3')!;
    const openedAt = ago(150);
    const path: PlannedJob['path'] = [
      ['assessed', new Date(openedAt.getTime() + 1 * DAY), 'SAC'],
      ['approved', new Date(openedAt.getTime() + 2 * DAY), 'SAC'],
      ['in_transit', new Date(openedAt.getTime() + 4 * DAY), 'SAC'],
      ['approved', new Date(openedAt.getTime() + 5 * DAY), 'PDX'],
      ['on_bench', new Date(openedAt.getTime() + 7 * DAY), 'PDX'],
      ['quality_check', new Date(openedAt.getTime() + 11 * DAY), 'PDX'],
      ['ready', new Date(openedAt.getTime() + 12 * DAY), 'PDX'],
      ['released', new Date(openedAt.getTime() + 14 * DAY), 'PDX'],
    ];
    const job: PlannedJob = {
      id: randomUUID(), inst, shop: 'PDX', stage: 'released', resume: null, service: 'repad_tenor', openedAt,
      readyAt: path[6][1], releasedAt: path[7][1], promisedOn: localDate(new Date(openedAt.getTime() + 16 * DAY), 'America/Los_Angeles'),
      assignee: 'hana', complaint: 'Body tube seam leak near the low C tone hole; full repad.', path, openedBy: 'manager',
    };
    planned.push(job);
    return job;
  })();

  planned.sort((a, b) => a.openedAt.getTime() - b.openedAt.getTime());
  const numberOf = new Map(planned.map((j, i) => [j.id, 1001 + i]));

  // instruments: where each one is now follows from its latest visit
  const instrumentId = new Map(INSTRUMENTS.map((i) => [i.key, randomUUID()]));
  const latestVisit = new Map<string, PlannedJob>();
  for (const j of planned) latestVisit.set(j.inst.key, j); // sorted by openedAt, so the last one wins
  const makerSerialCount: Record<string, number> = {};
  await Instrument.bulkCreate(
    INSTRUMENTS.map((inst, i) => {
      makerSerialCount[inst.maker] = (makerSerialCount[inst.maker] ?? 0) + 1;
      const last = latestVisit.get(inst.key);
      const open = last && last.stage !== 'released';
      return {
        id: instrumentId.get(inst.key)!, networkId, family: inst.family, maker: MAKERS[inst.maker].name, model: inst.model,
        serial: inst.serial ?? MAKERS[inst.maker].serial(i * 13 + makerSerialCount[inst.maker] * 101),
        ownerKind: ownerKindOf(inst.owner), ownerCustomerId: customerId[inst.owner],
        currentShopId: shopId[last ? last.shop : inst.shop],
        status: inst.retired ? 'retired' : !open ? 'in_service' : last.stage === 'in_transit' ? 'in_transit' : 'in_shop',
        assetTag: `HBR-${String(100 + i * 7).padStart(6, '0')}`,
        yearMade: inst.year,
        notes: inst.retired ? 'Retired from the rental fleet: body cracked beyond economical repair.' : null,
      };
    }),
    t,
  );

  await Job.bulkCreate(
    planned.map((j) => {
      const cat = catalogByKey[j.service];
      const approved = j.path.find(([s]) => s === 'approved');
      const customer = customerId[j.inst.owner];
      const contact = [...PERSONS, ...SCHOOLS].find((c) => c.key === j.inst.owner);
      return {
        id: j.id, networkId, number: numberOf.get(j.id)!, instrumentId: instrumentId.get(j.inst.key)!, shopId: shopId[j.shop],
        customerId: customer, stage: j.stage, stageBeforeHold: j.resume, complaint: j.complaint,
        conditionNotes: j.stage === 'intake' ? null : pick(['Light lacquer wear; no cracks.', 'Case latch broken; instrument clean.', 'Minor scratches on bell; keys straight.', 'Heavy residue in bore; otherwise sound.']),
        promisedOn: j.promisedOn, assignedUserId: j.assignee ? userId[j.assignee] : null, requiredSkillId: skillId[cat.skill],
        estimatedHours: j.stage === 'intake' ? null : cat.hours,
        estimateApprovedAt: approved ? approved[1] : null,
        estimateApprovedByName: approved ? (contact && 'contactName' in contact ? contact.contactName.split(',')[0] : (contact?.name ?? 'Rental desk')) : null,
        estimateApprovalMethod: approved ? pick(['in_person', 'phone', 'email'] as const) : null,
        openedByUserId: userId[j.openedBy], openedAt: j.openedAt, readyAt: j.readyAt, releasedAt: j.releasedAt,
      };
    }),
    t,
  );

  // line items, time logs and stock reservations
  const lineItems: Array<CreationAttributes<JobLineItem>> = [];
  const timeLogs: Array<CreationAttributes<TimeLog>> = [];
  const reservations: Array<{ job: PlannedJob; partId: string; quantity: number }> = [];
  for (const j of planned) {
    const cat = catalogByKey[j.service];
    if (j.stage === 'intake') continue; // not assessed yet: no estimate
    const rate = shopByCode[j.shop].laborRateCents;
    let position = 0;
    lineItems.push({ networkId, jobId: j.id, kind: 'labor', catalogItemId: catalogId[j.service], description: cat.name, hours: cat.hours, rateCents: rate, position: position++ });
    const isRepad = j.service.startsWith('repad') || j.service.startsWith('overhaul');
    const pads = isRepad ? (PAD_SETS[j.inst.family] ?? PAD_SETS.clarinet!) : [];
    for (const [kind, diameter, quantity] of pads) {
      const pad = padId.get(`${kind}:${diameter}`)!;
      lineItems.push({ networkId, jobId: j.id, kind: 'part', partId: pad.id, description: pad.name, quantity, unitPriceCents: pad.price, position: position++ });
      if (['approved', 'on_bench', 'waiting_for_parts'].includes(j.stage)) reservations.push({ job: j, partId: pad.id, quantity });
    }
    const sundry = j.service === 'cork_felt' ? ['CORK-SHEET-1.6', 'FELT-ASSORT'] : j.service === 'dent_small' && j.inst.family === 'trumpet' ? ['WATERKEY-CORK'] : isRepad ? ['PAD-CEMENT-STICK'] : [];
    if (j.inst.family === 'baritone_saxophone' && isRepad) sundry.push('STEM-SET-SL');
    for (const sku of sundry) {
      const part = otherPartId[sku];
      lineItems.push({ networkId, jobId: j.id, kind: 'part', partId: part.id, description: part.name, quantity: 1, unitPriceCents: part.price, position: position++ });
    }
    // bench time for work that has started
    const benchStart = j.path.find(([s]) => s === 'on_bench')?.[1];
    if (benchStart && j.assignee) {
      const done = ['quality_check', 'ready', 'released'].includes(j.stage) ? 1 : 0.4 + rand() * 0.4;
      const totalMinutes = Math.max(30, Math.round((cat.hours * 60 * done * (0.85 + rand() * 0.35)) / 15) * 15);
      const sessions = Math.min(4, Math.max(1, Math.ceil(totalMinutes / 150)));
      for (let s = 0; s < sessions; s++) {
        const at = new Date(benchStart.getTime() + s * 0.7 * DAY);
        timeLogs.push({
          networkId, jobId: j.id, userId: userId[j.assignee], minutes: Math.max(15, Math.round(totalMinutes / sessions / 5) * 5),
          workedOn: localDate(at < now ? at : now, shopByCode[j.shop].timeZone), note: s === 0 ? 'Disassembly and inspection.' : null,
        });
      }
    }
  }
  await JobLineItem.bulkCreate(lineItems, t);
  await TimeLog.bulkCreate(timeLogs, t);

  // stock at every shop; a job waiting for parts is waiting because its shop has run out
  const reservedAt = new Map<string, number>();
  for (const r of reservations) reservedAt.set(`${r.job.shop}:${r.partId}`, (reservedAt.get(`${r.job.shop}:${r.partId}`) ?? 0) + r.quantity);
  const shortages = new Set(reservations.filter((r) => r.job.stage === 'waiting_for_parts').map((r) => `${r.job.shop}:${r.partId}`));
  const stockRows: Array<CreationAttributes<StockLevel>> = [];
  for (const s of SHOPS) {
    for (const p of partRows) {
      const key = `${s.code}:${p.id}`;
      const common = p.kind === 'other' || (p.diameterMm! >= 9 && p.diameterMm! <= 30 && p.padKind === 'glued');
      const onHand = shortages.has(key) ? 0 : Math.floor(rand() * (common ? 24 : 8));
      stockRows.push({ networkId, shopId: shopId[s.code], partId: p.id!, onHand, reserved: reservedAt.get(key) ?? 0, reorderPoint: common ? 6 : 2 });
    }
  }
  await StockLevel.bulkCreate(stockRows, t);
  await StockReservation.bulkCreate(
    reservations.map((r) => ({ networkId, jobId: r.job.id, shopId: shopId[r.job.shop], partId: r.partId, quantity: r.quantity })),
    t,
  );

  // transfers
  const inFlight = planned.find((j) => j.inst.key === 'bari2')!;
  const awaiting = planned.find((j) => j.inst.key === 'bari1' && j.stage !== 'released')!;
  const inFlightDeparted = new Date(now.getTime() - IN_FLIGHT_DEPARTED_HOURS_AGO * HOUR);
  const inFlightRun = RELAY_RUNS.find((r) => r.from === 'DEN' && r.to === 'CHI')!;
  const transferRows = [
    {
      id: randomUUID(), networkId, jobId: inFlight.id, instrumentId: instrumentId.get('bari2')!, fromShopId: shopId.DEN, toShopId: shopId.CHI,
      state: 'in_transit' as const, reason: 'Baritone saxophone repad needs the low-saxophone bench; Denver has none.',
      requestedByUserId: userId.owner, approvedByUserId: userId.owner, packedByUserId: userId.marisol,
      relayRunId: runId.get('DEN>CHI')!, decisionNote: 'Approved: Chicago has low-sax hours free this week.',
      requestedAt: new Date(now.getTime() - 2 * DAY), approvedAt: new Date(now.getTime() - 1.5 * DAY),
      packedAt: new Date(now.getTime() - 20 * HOUR), departedAt: inFlightDeparted,
      expectedArrivalAt: new Date(inFlightDeparted.getTime() + inFlightRun.transitHours * HOUR),
    },
    {
      id: randomUUID(), networkId, jobId: awaiting.id, instrumentId: instrumentId.get('bari1')!, fromShopId: shopId.SEA, toShopId: shopId.PDX,
      state: 'requested' as const, reason: 'Overhaul of a baritone saxophone: Portland has the low-saxophone specialists.',
      requestedByUserId: userId.desk, requestedAt: new Date(now.getTime() - 5 * HOUR),
    },
    {
      id: randomUUID(), networkId, jobId: pastTransferJob.id, instrumentId: instrumentId.get('tenor3')!, fromShopId: shopId.SAC, toShopId: shopId.PDX,
      state: 'received' as const, reason: 'Seam leak repair and repad: sent to Portland’s bench.',
      requestedByUserId: userId.manager, approvedByUserId: userId.manager, packedByUserId: userId.lucien, receivedByUserId: userId.hana,
      relayRunId: runId.get('SAC>PDX')!, requestedAt: pastTransferJob.path[1][1], approvedAt: new Date(pastTransferJob.path[1][1].getTime() + 6 * HOUR),
      packedAt: new Date(pastTransferJob.path[2][1].getTime() - 8 * HOUR), departedAt: pastTransferJob.path[2][1],
      expectedArrivalAt: new Date(pastTransferJob.path[2][1].getTime() + 10 * HOUR), receivedAt: pastTransferJob.path[3][1],
    },
  ];
  await Transfer.bulkCreate(transferRows, t);

  // history: every visit's intake, opening and stage changes; transfer steps; a few notes
  const history: HistoryEntry[] = [];
  const label = (s: JobStage) => s.replace(/_/g, ' ');
  for (const j of planned) {
    const iid = instrumentId.get(j.inst.key)!;
    const n = numberOf.get(j.id)!;
    const openShop = j.path.length && j.path[0][2] !== j.shop ? j.path[0][2] : j.shop; // where the visit began
    history.push({ networkId, instrumentId: iid, jobId: j.id, shopId: shopId[openShop], userId: userId[j.openedBy], kind: 'intake', summary: `Checked in at ${SHOP_NAME[openShop]}: ${j.complaint}`, data: { complaint: j.complaint }, occurredAt: j.openedAt });
    history.push({ networkId, instrumentId: iid, jobId: j.id, shopId: shopId[openShop], userId: userId[j.openedBy], kind: 'job_opened', summary: `Job ${n} opened at ${SHOP_NAME[openShop]}`, data: { number: n, service: catalogByKey[j.service].name }, occurredAt: new Date(j.openedAt.getTime() + 60_000) });
    let from: JobStage = 'intake';
    for (const [to, at, shop] of j.path) {
      history.push({
        networkId, instrumentId: iid, jobId: j.id, shopId: shopId[shop], userId: j.assignee && ['on_bench', 'quality_check', 'ready'].includes(to) ? userId[j.assignee] : userId[j.openedBy],
        kind: 'stage_changed', summary: `Job ${n}: ${label(from)} → ${label(to)}`, data: { from, to }, occurredAt: at,
      });
      from = to;
    }
  }
  const transferEvents = (tr: (typeof transferRows)[number], code: (s: string) => ShopCode) => {
    const steps: Array<[string, Date | undefined, string | undefined, string]> = [
      ['transfer_requested', tr.requestedAt, tr.requestedByUserId, 'Transfer requested'],
      ['transfer_approved', tr.approvedAt, tr.approvedByUserId, 'Transfer approved'],
      ['transfer_packed', tr.packedAt, tr.packedByUserId, 'Packed for the relay run'],
      ['transfer_departed', tr.departedAt, tr.packedByUserId, 'Left on the relay run'],
      ['transfer_received', tr.receivedAt, tr.receivedByUserId, 'Received'],
    ];
    const fromName = SHOP_NAME[code(tr.fromShopId)];
    const toName = SHOP_NAME[code(tr.toShopId)];
    for (const [kind, at, by, text] of steps) {
      if (!at) continue;
      history.push({
        networkId, instrumentId: tr.instrumentId, jobId: tr.jobId, shopId: kind === 'transfer_received' ? tr.toShopId : tr.fromShopId, userId: by ?? null,
        kind, summary: `${text}: ${fromName} → ${toName}`, data: { transferId: tr.id, reason: tr.reason }, occurredAt: at,
      });
    }
  };
  const codeOf = (id: string) => (Object.keys(shopId) as ShopCode[]).find((c) => shopId[c] === id)!;
  transferRows.forEach((tr) => transferEvents(tr, codeOf));
  const noteJob = planned.find((j) => j.inst.key === 'clar1' && j.stage !== 'released')!;
  history.push({
    networkId, instrumentId: instrumentId.get('clar1')!, jobId: noteJob.id, shopId: shopId.SEA, userId: userId.odile, kind: 'note',
    summary: 'Upper joint tenon cork replaced as well; customer informed by phone.', data: {}, occurredAt: new Date(now.getTime() - 1 * DAY),
  });
  history.push({
    networkId, instrumentId: instrumentId.get('clar8')!, jobId: null, shopId: shopId.SAC, userId: userId.manager, kind: 'note',
    summary: 'Retired from the rental fleet: body cracked beyond economical repair.', data: {}, occurredAt: ago(20),
  });
  await appendHistoryMany(history, transaction);

  // Pad maps of earlier repads of Aldmoor Fenlark altos, so the network has sizes to suggest for the
  // next Fenlark Alto and the next repad of each of these serials starts from its map. The nominal cups
  // are invented; each horn varies a little around them.
  const FENLARK_ALTO_CUPS: Record<string, [cup: number, depth: number]> = {
    low_bb: [45.8, 4.4], low_b: [45.3, 4.4], low_cs: [26.6, 3.8], low_c: [42.4, 4.3], low_eb: [27.3, 3.8], d: [36.8, 4.1],
    c: [33.2, 4.0], b: [25.6, 3.7], a: [26.2, 3.7], g: [24.4, 3.6], gs: [17.8, 3.3], f: [31.3, 3.9], e: [33.6, 4.0], fs: [20.2, 3.4],
    bis_bb: [9.8, 2.8], side_bb: [14.2, 3.0], side_c: [14.7, 3.0], high_e: [14.1, 3.0], high_fs: [11.6, 2.9], palm_d: [16.3, 3.1],
    palm_eb: [15.6, 3.1], palm_f: [15.1, 3.1], front_f: [11.1, 2.9], octave_body: [7.2, 2.6], octave_neck: [8.3, 2.6],
  };
  const padCatalog: PadCatalog = { self_leveling: [], glued: [] };
  for (const p of partRows) {
    if (p.kind !== 'pad' || !p.padKind) continue;
    padCatalog[p.padKind as 'glued' | 'self_leveling'].push({ diameterMm: Number(p.diameterMm), thicknessMm: Number(p.thicknessMm), partId: p.id!, sku: p.sku, name: p.name, unitPriceCents: p.unitPriceCents });
  }
  const round2 = (n: number) => Math.round(n * 100) / 100;
  const padMapRows: Array<CreationAttributes<PadMap>> = [];
  const padMapEvents: HistoryEntry[] = [];
  for (const key of ['alto1', 'alto3', 'alto7', 'alto9', 'alto10']) {
    const visit = planned.filter((j) => j.inst.key === key && j.stage === 'released').at(-1);
    if (!visit) continue;
    const entries = Object.entries(FENLARK_ALTO_CUPS).map(([keyId, [cup, depth]]) => {
      const cupMm = round2(cup + (rand() - 0.5) * 0.3);
      const depthMm = round2(depth + (rand() - 0.5) * 0.2);
      const rimMm = round2(cupMm - 2.6 - rand() * 0.8);
      return {
        keyId, keyName: null, padKind: 'glued' as const, floor: 'flat' as const, cupDiameterMm: cupMm, cupDepthMm: depthMm, rimDiameterMm: rimMm,
        typed: { cupDiameter: String(cupMm), cupDepth: String(depthMm), rimDiameter: String(rimMm) },
      };
    });
    const result = computePadMap({ entries, catalog: padCatalog, rules: DEFAULT_PAD_RULES });
    const at = new Date(visit.path.find(([s]) => s === 'on_bench')?.[1] ?? visit.openedAt);
    const by = visit.assignee ? userId[visit.assignee] : userId.owner;
    const id = randomUUID();
    padMapRows.push({
      id, networkId, instrumentId: instrumentId.get(key)!, jobId: visit.id, shopId: shopId[visit.shop], unitSystem: 'mm',
      entries, results: result.keys as unknown as Array<Record<string, unknown>>,
      createdByUserId: by, createdAt: at, updatedAt: at,
    });
    padMapEvents.push({
      networkId, instrumentId: instrumentId.get(key)!, jobId: visit.id, shopId: shopId[visit.shop], userId: by, kind: 'pad_map_saved',
      summary: `Pad map saved at ${SHOP_NAME[visit.shop]}: ${result.counts.padsChosen} pads (0 self-leveling, ${result.counts.padsChosen} glued)`,
      data: { padMapId: id, pads: result.counts.padsChosen }, occurredAt: at,
    });
  }
  await PadMap.bulkCreate(padMapRows, t);
  await appendHistoryMany(padMapEvents, transaction);

  // a few notices so the inbox is not empty, worded as the app words them (server/modules/jobs, stock, transfers)
  const jobAt = (key: string) => planned.find((j) => j.inst.key === key && j.stage !== 'released')!;
  const jobNo = (key: string) => numberOf.get(jobAt(key).id)!;
  const notices: Array<{ user: string; kind: NotificationKind; link: string; title: string; body: string; hoursAgo: number; read?: boolean }> = [
    { user: 'desk', kind: 'job_ready', link: `/jobs/${jobAt('flute8').id}?shop=${shopId.SEA}`, title: `Job ${jobNo('flute8')} is ready to collect`, body: 'Flute Quellstone passed its final check at Harborline Seattle.', hoursAgo: 3 },
    { user: 'desk', kind: 'estimate_awaiting_approval', link: `/jobs/${jobAt('flute1').id}?shop=${shopId.SEA}`, title: `Estimate for job ${jobNo('flute1')} awaits approval`, body: 'Flute Quellstone: the estimate is with the customer; work at Harborline Seattle starts once they approve.', hoursAgo: 26 },
    { user: 'mateo', kind: 'job_ready', link: `/jobs/${jobAt('flute8').id}?shop=${shopId.SEA}`, title: `Job ${jobNo('flute8')} is ready to collect`, body: 'Flute Quellstone passed its final check at Harborline Seattle.', hoursAgo: 3 },
    { user: 'tobias', kind: 'transfer_incoming', link: `/jobs/${jobAt('bari2').id}?shop=${shopId.CHI}`, title: 'Incoming transfer from Denver', body: 'A baritone saxophone is on the relay run to Chicago.', hoursAgo: 5 },
    { user: 'owner', kind: 'transfer_incoming', link: `/jobs/${jobAt('bari2').id}?shop=${shopId.DEN}`, title: 'Transfer on the road: Denver → Chicago', body: 'Expected to arrive tomorrow.', hoursAgo: 5 },
    { user: 'owner', kind: 'invitation_accepted', link: '/people', title: 'Ingrid Oyelaran accepted your invitation', body: 'Auditor at Harborline Denver', hoursAgo: 24 * 20, read: true },
    { user: 'manager', kind: 'stock_shortage', link: `/stock?shop=${shopId.SEA}`, title: 'Harborline Seattle is short of 2 parts', body: 'A pad map reserved more pads than the shelf holds; the stock screen shows which shop can spare them.', hoursAgo: 8 },
  ];
  await Notification.bulkCreate(
    notices.map((n) => ({
      networkId, userId: userId[n.user], kind: n.kind, title: n.title, body: n.body, link: n.link,
      createdAt: new Date(now.getTime() - n.hoursAgo * HOUR), readAt: n.read ? new Date(now.getTime() - (n.hoursAgo - 1) * HOUR) : null,
      dedupeKey: `demo:${n.kind}:${n.user}:${n.link}`,
    })),
    t,
  );

  await addSummerRentalRush(transaction, now, {
    networkId, shopId, laborRate: (code) => shopByCode[code].laborRateCents, catalogId, catalogByKey, skillId,
    deskFor: (code) => userId[deskFor(code)], fleetCustomerId: customerId.FLEET,
  });

  return networkId;
}

// ---------------------------------------------------------------------------------------------
// The late-summer school-rental rush: before the school year the rental fleet comes back in waves for
// inspection, so the weekly intake chart shows a ridge from late July into early September.

interface RushContext {
  networkId: string;
  shopId: Record<ShopCode, string>;
  laborRate: (code: ShopCode) => number;
  catalogId: Record<CatalogKey, string>;
  catalogByKey: Record<CatalogKey, { name: string; hours: number; skill: SkillCode }>;
  skillId: Record<SkillCode, string>;
  deskFor: (code: ShopCode) => string;
  fleetCustomerId: string;
}

/** Rental returns per week, starting the third week of July: a ramp up and a tail off. */
const RUSH_WEEKS = [2, 4, 7, 11, 14, 12, 8, 4];
const RUSH_FAMILIES: Array<{ family: InstrumentFamily; maker: MakerKey; model: string; service: CatalogKey }> = [
  { family: 'flute', maker: 'Q', model: 'Brookmint Student', service: 'leak_test' },
  { family: 'clarinet', maker: 'O', model: 'Reedling Student', service: 'play_woodwind' },
  { family: 'alto_saxophone', maker: 'A', model: 'Fenlark Alto', service: 'play_woodwind' },
  { family: 'trumpet', maker: 'B', model: 'Gullstep Trumpet', service: 'chem_clean' },
  { family: 'trombone', maker: 'B', model: 'Gullstep Trombone', service: 'slide_align' },
];

async function addSummerRentalRush(transaction: Transaction, now: Date, ctx: RushContext): Promise<void> {
  const t = { transaction };
  const rand = prng(20_260_720);
  // the most recent rush that is over: the third Monday of July of this year, or last year's
  let year = now.getUTCFullYear();
  if (now.getTime() < Date.UTC(year, 8, 20)) year -= 1;
  const julyFirst = new Date(Date.UTC(year, 6, 1, 16));
  const firstMonday = new Date(julyFirst.getTime() + ((8 - (julyFirst.getUTCDay() || 7)) % 7) * DAY);
  const start = new Date(firstMonday.getTime() + 14 * DAY);

  const [{ max }] = await sequelize.query<{ max: number }>('select coalesce(max(number), 1000)::int as max from jobs where network_id = :networkId', {
    ...t, type: QueryTypes.SELECT, replacements: { networkId: ctx.networkId },
  });
  let number = max + 1;
  const rushShops: ShopCode[] = ['SEA', 'SEA', 'PDX', 'SAC', 'DEN', 'CHI'];
  const instruments: Array<CreationAttributes<Instrument>> = [];
  const jobs: Array<CreationAttributes<Job>> = [];
  const lines: Array<CreationAttributes<JobLineItem>> = [];
  const history: HistoryEntry[] = [];
  let n = 0;
  RUSH_WEEKS.forEach((count, week) => {
    for (let i = 0; i < count; i++, n++) {
      const kind = RUSH_FAMILIES[n % RUSH_FAMILIES.length];
      const shop = rushShops[n % rushShops.length];
      const instrumentId = randomUUID();
      const jobId = randomUUID();
      const openedAt = new Date(start.getTime() + week * 7 * DAY + Math.floor(rand() * 5) * DAY + Math.floor(rand() * 8) * HOUR);
      const readyAt = new Date(openedAt.getTime() + (0.5 + rand() * 4) * DAY);
      const releasedAt = new Date(readyAt.getTime() + (0.5 + rand() * 3) * DAY);
      const cat = ctx.catalogByKey[kind.service];
      instruments.push({
        id: instrumentId, networkId: ctx.networkId, family: kind.family, maker: MAKERS[kind.maker].name, model: kind.model,
        serial: `RR-${year}-${String(n + 1).padStart(3, '0')}`, ownerKind: 'rental_fleet', ownerCustomerId: ctx.fleetCustomerId,
        currentShopId: ctx.shopId[shop], status: 'in_service', assetTag: `HBR-R${year}-${String(n + 1).padStart(3, '0')}`,
        yearMade: 2015 + (n % 9),
      });
      jobs.push({
        id: jobId, networkId: ctx.networkId, number: number++, instrumentId, shopId: ctx.shopId[shop], customerId: ctx.fleetCustomerId,
        stage: 'released', complaint: 'Rental return: inspection before the school year.', conditionNotes: 'Normal rental wear.',
        promisedOn: localDate(new Date(openedAt.getTime() + 5 * DAY), SHOPS.find((x) => x.code === shop)!.timeZone), requiredSkillId: ctx.skillId[cat.skill],
        estimatedHours: cat.hours, estimateApprovedAt: openedAt, estimateApprovedByName: 'Rental desk', estimateApprovalMethod: 'email',
        openedByUserId: ctx.deskFor(shop), openedAt, readyAt, releasedAt,
      });
      lines.push({
        networkId: ctx.networkId, jobId, kind: 'labor', catalogItemId: ctx.catalogId[kind.service], description: cat.name,
        hours: cat.hours, rateCents: ctx.laborRate(shop), position: 0,
      });
      const by = ctx.deskFor(shop);
      history.push(
        { networkId: ctx.networkId, instrumentId, jobId, shopId: ctx.shopId[shop], userId: by, kind: 'intake', summary: 'Checked in: rental return inspection', data: {}, occurredAt: openedAt },
        { networkId: ctx.networkId, instrumentId, jobId, shopId: ctx.shopId[shop], userId: by, kind: 'stage_changed', summary: `Job ${number - 1}: intake → ready`, data: { from: 'intake', to: 'ready' }, occurredAt: readyAt },
        { networkId: ctx.networkId, instrumentId, jobId, shopId: ctx.shopId[shop], userId: by, kind: 'stage_changed', summary: `Job ${number - 1}: ready → released`, data: { from: 'ready', to: 'released' }, occurredAt: releasedAt },
      );
    }
  });
  await Instrument.bulkCreate(instruments, t);
  await Job.bulkCreate(jobs, t);
  await JobLineItem.bulkCreate(lines, t);
  await appendHistoryMany(history, transaction);
}

/** Row counts of the demo network, table by table (for the script's report and for checks). */
export async function countNetworkRows(networkId: string): Promise<Record<string, number>> {
  const tables = [
    'shops', 'skills', 'shop_skills', 'relay_runs', 'users', 'memberships', 'technician_skills', 'service_catalog',
    'parts', 'stock_levels', 'stock_reservations', 'customers', 'instruments', 'jobs', 'job_line_items', 'time_logs',
    'history_events', 'transfers', 'notifications', 'pad_maps',
  ];
  const [rows] = await sequelize.query(
    tables.map((tb) => `select '${tb}' as t, count(*)::int as n from ${tb} where network_id = :networkId`).join(' union all '),
    { replacements: { networkId } },
  );
  return Object.fromEntries((rows as Array<{ t: string; n: number }>).map((r) => [r.t, r.n]));
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  loadDemoNetwork()
    .then(async (result) => {
      console.log(result.created ? `demo network created (${result.networkId})` : `demo network already present (${result.networkId}); nothing changed`);
      console.table(await countNetworkRows(result.networkId));
      await sequelize.close();
    })
    .catch(async (err) => {
      console.error(err);
      await sequelize.close();
      process.exit(1);
    });
}

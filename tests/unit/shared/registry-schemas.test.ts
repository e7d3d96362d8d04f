import { describe, expect, it } from 'vitest';
import {
  importBatchSchema,
  importRowSchema,
  intakeSchema,
  parseFamily,
  timelineFilterOf,
} from '../../../shared/schemas/registry.js';

describe('parseFamily', () => {
  it('reads keys, labels and the short names people write in spreadsheets', () => {
    expect(parseFamily('alto_saxophone')).toBe('alto_saxophone');
    expect(parseFamily('Alto saxophone')).toBe('alto_saxophone');
    expect(parseFamily('  ALTO SAX ')).toBe('alto_saxophone');
    expect(parseFamily('Bari sax')).toBe('baritone_saxophone');
    expect(parseFamily('French-horn')).toBe('french_horn');
    expect(parseFamily('sousaphone')).toBe('tuba');
    expect(parseFamily('B♭ clarinet')).toBe('clarinet');
  });

  it('answers null for what it does not know, rather than guessing', () => {
    expect(parseFamily('kazoo')).toBeNull();
    expect(parseFamily('')).toBeNull();
  });
});

describe('importRowSchema', () => {
  it('accepts a row with spreadsheet text and turns the family and year into values', () => {
    const row = importRowSchema.parse({ row: 2, serial: ' ab-104 233 ', maker: 'Aldmoor', family: 'Alto Sax', yearMade: '2016', model: '' });
    expect(row).toMatchObject({ row: 2, serial: 'ab-104 233', maker: 'Aldmoor', family: 'alto_saxophone', yearMade: 2016 });
    expect(row.model).toBeUndefined();
  });

  it('names each field that is wrong', () => {
    const result = importRowSchema.safeParse({ row: 7, serial: ' - ', maker: '', family: 'kazoo', yearMade: 'nineteen' });
    expect(result.success).toBe(false);
    const fields = Object.fromEntries(result.error!.issues.map((i) => [i.path.join('.'), i.message]));
    expect(Object.keys(fields).sort()).toEqual(['family', 'maker', 'serial', 'yearMade']);
    expect(fields.serial).toMatch(/letter or digit/);
    expect(fields.yearMade).toMatch(/four digits/);
  });

  it('refuses a year in the future', () => {
    const next = new Date().getUTCFullYear() + 2;
    expect(importRowSchema.safeParse({ row: 2, serial: 'A1', maker: 'M', family: 'flute', yearMade: String(next) }).success).toBe(false);
  });
});

describe('importBatchSchema', () => {
  it('needs the owner unless the instruments are the rental fleet', () => {
    const shopId = '8f0e4c1e-5b2a-4c55-9a61-2f1f3b0c9d11';
    expect(importBatchSchema.safeParse({ shopId, ownerKind: 'rental_fleet', rows: [{}] }).success).toBe(true);
    const school = importBatchSchema.safeParse({ shopId, ownerKind: 'school', rows: [{}] });
    expect(school.success).toBe(false);
    expect(school.error!.issues[0].path).toEqual(['ownerCustomerId']);
  });
});

describe('intakeSchema', () => {
  it('takes either a picked or a new instrument, and an optional customer', () => {
    const base = { shopId: '8f0e4c1e-5b2a-4c55-9a61-2f1f3b0c9d11', requestKey: '5a0b6a4e-8a8e-4b8f-9a55-0c1d2e3f4a5b', job: { complaint: 'Sticky keys' } };
    expect(intakeSchema.safeParse({ ...base, instrument: { id: '0d7e6a64-2f5c-4a43-9a1c-6b1a9c1f2e3d' }, customer: null }).success).toBe(true);
    const bad = intakeSchema.safeParse({ ...base, instrument: { new: { serial: '', maker: 'X', family: 'flute', ownerKind: 'customer' } }, customer: null });
    expect(bad.success).toBe(false);
  });
});

describe('timelineFilterOf', () => {
  it('sorts the kinds of history into the filters people choose from', () => {
    expect(timelineFilterOf('intake')).toBe('intake');
    expect(timelineFilterOf('registered')).toBe('intake');
    expect(timelineFilterOf('job_opened')).toBe('job');
    expect(timelineFilterOf('stage_changed')).toBe('job');
    expect(timelineFilterOf('transfer_departed')).toBe('transfer');
    expect(timelineFilterOf('photo')).toBe('photo');
    expect(timelineFilterOf('document')).toBe('document');
    expect(timelineFilterOf('pad_map_saved')).toBe('pad_map');
    expect(timelineFilterOf('note')).toBe('note');
    expect(timelineFilterOf('something_new')).toBe('note');
  });
});

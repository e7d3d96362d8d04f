import { describe, expect, it } from 'vitest';
import { applyMapping, autoMapColumns, checkRows, chunk, missingRequired } from '../../../src/features/registry/import-mapping.js';

describe('fleet import column mapping', () => {
  it('maps the headers schools commonly use', () => {
    const mapping = autoMapColumns(['Serial No.', 'Make', 'Instrument', 'Model', 'Asset #', 'Year', 'Remarks']);
    expect(mapping).toEqual({
      serial: 'Serial No.', maker: 'Make', family: 'Instrument', model: 'Model', assetTag: null, yearMade: 'Year', notes: 'Remarks',
    });
    expect(missingRequired(mapping)).toEqual([]);
    expect(missingRequired(autoMapColumns(['Serial', 'Colour']))).toEqual(['Maker', 'Family']);
  });

  it('numbers rows as a spreadsheet does (the header is row 1) and keeps unmapped columns out', () => {
    const mapping = autoMapColumns(['Serial', 'Maker', 'Family', 'Room']);
    const rows = applyMapping([{ Serial: 'A1', Maker: 'M', Family: 'flute', Room: '12' }, { Serial: 'A2', Maker: 'M', Family: 'flute', Room: '' }], mapping);
    expect(rows).toEqual([
      { row: 2, serial: 'A1', maker: 'M', family: 'flute' },
      { row: 3, serial: 'A2', maker: 'M', family: 'flute' },
    ]);
  });

  it('finds bad rows and repeats of one serial before anything is sent', () => {
    const rows = [
      { row: 2, serial: 'AB-1', maker: 'Aldmoor', family: 'alto sax' },
      { row: 3, serial: 'ab 1', maker: 'ALDMOOR', family: 'alto sax' },
      { row: 4, serial: 'C-9', maker: '', family: 'kazoo' },
    ];
    expect(checkRows(rows)).toEqual([
      { row: 3, errors: { serial: 'Same serial and maker as row 2.' } },
      { row: 4, errors: { maker: 'Enter the maker.', family: expect.stringMatching(/Choose a family/) } },
    ]);
  });

  it('cuts a file into batches', () => {
    expect(chunk([1, 2, 3, 4, 5], 2)).toEqual([[1, 2], [3, 4], [5]]);
  });
});

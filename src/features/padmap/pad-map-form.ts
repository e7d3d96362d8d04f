import { useCallback, useMemo, useState } from 'react';
import { computeKey, summarizeKeys, type KeyResult, type PadMapResult } from '@shared/padmap/compute';
import { MEASURE_FIELDS, readEntries, type MeasureField, type PadMapRow, type StoredEntry } from '@shared/padmap/entries';
import { padKeysFor } from '@shared/padmap/keys';
import type { FloorShape, PadKind } from '@shared/padmap/rules';
import type { LengthUnit } from '@shared/padmap/units';
import type { PadMapView, PadMapWorkspace } from './types';

/** One row of the grid as typed: readings stay text until the shared reader turns them into mm. */
export interface GridRow {
  keyId: string;
  keyName: string;
  /** Added by the technician; not in the family's key list. */
  custom: boolean;
  optional: boolean;
  padKind: PadKind;
  floor: FloorShape;
  cupDiameter: string;
  cupDepth: string;
  rimDiameter: string;
}

export type StartedFrom = { kind: 'saved' | 'previous'; map: PadMapView } | { kind: 'blank' };

/** Saxophones are where self-leveling pads are common; other families start glued. */
export function defaultPadKind(family: string): PadKind {
  return family.endsWith('saxophone') ? 'self_leveling' : 'glued';
}

function typedOf(entry: StoredEntry, field: MeasureField): string {
  const typed = entry.typed?.[field];
  if (typed) return typed;
  const mm = entry[`${field}Mm`];
  return mm == null ? '' : String(mm);
}

/** The rows a screen starts with: this job's map, else the instrument's last map, else the family's keys. */
export function initialRows(ws: PadMapWorkspace): { rows: GridRow[]; unit: LengthUnit; from: StartedFrom } {
  const keys = padKeysFor(ws.instrument.family);
  const source = ws.padMap ?? ws.previous;
  const kind = defaultPadKind(ws.instrument.family);
  const byId = new Map((source?.entries ?? []).map((e) => [e.keyId, e]));
  const rows: GridRow[] = keys.map((key) => {
    const entry = byId.get(key.id);
    return {
      keyId: key.id,
      keyName: key.name,
      custom: false,
      optional: !!key.optional,
      padKind: entry?.padKind ?? kind,
      floor: entry?.floor ?? 'flat',
      cupDiameter: entry ? typedOf(entry, 'cupDiameter') : '',
      cupDepth: entry ? typedOf(entry, 'cupDepth') : '',
      rimDiameter: entry ? typedOf(entry, 'rimDiameter') : '',
    };
  });
  const known = new Set(keys.map((k) => k.id));
  for (const entry of source?.entries ?? []) {
    if (known.has(entry.keyId)) continue;
    rows.push({
      keyId: entry.keyId,
      keyName: entry.keyName ?? entry.keyId,
      custom: true,
      optional: false,
      padKind: entry.padKind,
      floor: entry.floor,
      cupDiameter: typedOf(entry, 'cupDiameter'),
      cupDepth: typedOf(entry, 'cupDepth'),
      rimDiameter: typedOf(entry, 'rimDiameter'),
    });
  }
  const from: StartedFrom = ws.padMap ? { kind: 'saved', map: ws.padMap } : ws.previous ? { kind: 'previous', map: ws.previous } : { kind: 'blank' };
  return { rows, unit: source?.unitSystem ?? 'mm', from };
}

const hasReading = (row: GridRow) => MEASURE_FIELDS.some((f) => row[f].trim() !== '');

/** Rows that go to the server: every measured row and every key the technician added. */
export function rowsToSave(rows: GridRow[]): Array<{ row: PadMapRow; index: number }> {
  return rows
    .map((row, index) => ({ row, index }))
    .filter(({ row }) => row.custom || hasReading(row))
    .map(({ row, index }) => ({
      index,
      row: {
        keyId: row.keyId,
        keyName: row.custom ? row.keyName : null,
        padKind: row.padKind,
        floor: row.floor,
        cupDiameter: row.cupDiameter,
        cupDepth: row.cupDepth,
        rimDiameter: row.rimDiameter,
      },
    }));
}

export interface Preview {
  result: PadMapResult;
  /** Reading errors by row index and field. */
  errors: Record<number, Partial<Record<MeasureField, string>>>;
}

interface RowPreview {
  errors: Partial<Record<MeasureField, string>>;
  result: KeyResult;
}

const NO_ERRORS: Partial<Record<MeasureField, string>> = Object.freeze({});

/**
 * Reads and computes one row. Results are cached by the row's content, so a keystroke recomputes one
 * key and every other row keeps the very same objects (and the grid skips re-rendering them).
 */
function previewRow(row: GridRow, unit: LengthUnit, ws: Pick<PadMapWorkspace, 'catalog' | 'rules'>): RowPreview {
  const { entries, errors } = readEntries(
    [{ keyId: row.keyId, keyName: row.custom ? row.keyName : null, padKind: row.padKind, floor: row.floor, cupDiameter: row.cupDiameter, cupDepth: row.cupDepth, rimDiameter: row.rimDiameter }],
    unit,
  );
  const rowErrors: Partial<Record<MeasureField, string>> = {};
  for (const [path, message] of Object.entries(errors)) rowErrors[path.split('.')[2] as MeasureField] = message;
  // a row with an unreadable cup is left out of the computation rather than guessed at
  const entry = rowErrors.cupDiameter ? { ...entries[0], cupDiameterMm: null } : entries[0];
  return { errors: Object.keys(rowErrors).length ? rowErrors : NO_ERRORS, result: computeKey(entry, ws.catalog, ws.rules) };
}

/** Row previews by the row's content, for one catalog and one set of pad rules. */
class RowPreviews {
  private readonly byContent = new Map<string, RowPreview>();

  constructor(private readonly ws: Pick<PadMapWorkspace, 'catalog' | 'rules'>) {}

  of(row: GridRow, unit: LengthUnit): RowPreview {
    if (this.byContent.size > 5000) this.byContent.clear();
    const key = JSON.stringify([row.keyId, row.custom ? row.keyName : null, row.padKind, row.floor, row.cupDiameter, row.cupDepth, row.rimDiameter, unit]);
    let hit = this.byContent.get(key);
    if (!hit) {
      hit = previewRow(row, unit, this.ws);
      this.byContent.set(key, hit);
    }
    return hit;
  }
}

export function usePadMapForm(ws: PadMapWorkspace) {
  const initial = useMemo(() => initialRows(ws), [ws]);
  const [rows, setRows] = useState(initial.rows);
  const [unit, setUnit] = useState<LengthUnit>(initial.unit);
  const [serviceId, setServiceId] = useState<string | null>(ws.defaultServiceId);
  const [savedSnapshot, setSavedSnapshot] = useState(() => JSON.stringify([initial.rows, initial.unit]));

  // a new cache whenever the catalog or rules change, since every result depends on them
  const previews = useMemo(() => new RowPreviews({ catalog: ws.catalog, rules: ws.rules }), [ws.catalog, ws.rules]);
  const preview: Preview = useMemo(() => {
    const perRow = rows.map((row) => previews.of(row, unit));
    const errors: Preview['errors'] = {};
    perRow.forEach((p, i) => {
      if (p.errors !== NO_ERRORS) errors[i] = p.errors;
    });
    const service = ws.services.find((s) => s.id === serviceId);
    return { result: summarizeKeys(perRow.map((p) => p.result), ws.catalog, ws.rules, service?.standardHours ?? null), errors };
  }, [rows, unit, serviceId, ws, previews]);

  const update = useCallback((index: number, patch: Partial<GridRow>) => {
    setRows((current) => current.map((row, i) => (i === index ? { ...row, ...patch } : row)));
  }, []);

  const addKey = useCallback(() => {
    setRows((current) => {
      let n = 1;
      while (current.some((r) => r.keyId === `extra-${n}`)) n += 1;
      const kind = current.at(-1)?.padKind ?? defaultPadKind(ws.instrument.family);
      return [...current, { keyId: `extra-${n}`, keyName: '', custom: true, optional: false, padKind: kind, floor: 'flat', cupDiameter: '', cupDepth: '', rimDiameter: '' }];
    });
  }, [ws.instrument.family]);

  const removeKey = useCallback((index: number) => setRows((current) => current.filter((_, i) => i !== index || !current[i].custom)), []);

  const setAllKinds = useCallback((padKind: PadKind) => setRows((current) => current.map((r) => ({ ...r, padKind }))), []);

  /** Fills empty cups with the network's medians for this model; the technician still checks each one. */
  const fillFromSuggestions = useCallback(() => {
    const keys = ws.suggestions?.keys ?? {};
    setRows((current) =>
      current.map((r) => {
        const s = keys[r.keyId];
        if (!s || hasReading(r)) return r;
        return {
          ...r,
          padKind: s.padKind ?? r.padKind,
          cupDiameter: s.cupDiameterMm == null ? '' : `${s.cupDiameterMm}mm`,
          cupDepth: s.cupDepthMm == null ? '' : `${s.cupDepthMm}mm`,
          rimDiameter: s.rimDiameterMm == null ? '' : `${s.rimDiameterMm}mm`,
        };
      }),
    );
  }, [ws.suggestions]);

  const dirty = JSON.stringify([rows, unit]) !== savedSnapshot;
  const markSaved = useCallback(() => setSavedSnapshot(JSON.stringify([rows, unit])), [rows, unit]);

  return { rows, unit, setUnit, serviceId, setServiceId, preview, update, addKey, removeKey, setAllKinds, fillFromSuggestions, dirty, markSaved, from: initial.from };
}

import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { padRulesSchema, type PadRules } from '@shared/padmap/rules';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { padRulesQueryOptions, useSavePadRules } from '../queries';

type FieldName = keyof PadRules;

const FIELDS: Array<{ name: FieldName; label: string; unit: string; why: string }> = [
  { name: 'selfLevelingMinClearanceMm', label: 'Self-leveling pads: minimum clearance per side', unit: 'mm', why: 'So the pad can tilt in its cup; it may touch lightly but must not bind. Default 0.15 mm (common practice).' },
  { name: 'gluedOffsetMm', label: 'Glued pads: offset from the cup diameter', unit: 'mm', why: 'Between −0.5 and +0.5 mm. 0 takes the largest pad not over the cup; −0.5 fits the next size down; +0.5 presses a pad in (practice differs).' },
  { name: 'minRimOverlapMm', label: 'Seal: minimum overlap of the tone-hole rim per side', unit: 'mm', why: 'Below it the map warns; a pad that does not cover the rim is an error. Default 0.5 mm: a starting value, not checked against a published source — set your own.' },
  { name: 'stemHeightsMm', label: 'Mounting-stem heights in stock', unit: 'mm, comma separated', why: 'The lowest that lifts the pad face enough is chosen; one step taller for a sunken floor. Default 0.5, 1.0, 1.5 mm (common practice).' },
  { name: 'minProtrusionMm', label: 'Pad face above the cup rim, at least', unit: 'mm', why: 'Stem + pad thickness − cup depth. Default 0.5 mm: a starting value, not checked against a published source — set your own.' },
  { name: 'maxRadialClearanceMm', label: 'Any pad: maximum clearance per side', unit: 'mm', why: 'A pad looser than this may not stay centred over the tone hole: the map warns, and says “no pad large enough” when the catalog’s largest pad is that loose. Default 1.0 mm (common practice).' },
  { name: 'selfLevelingLaborFactor', label: 'Labor factor for self-leveling pads', unit: '× hours per key', why: 'A self-leveling key takes this share of a glued key’s time. Default 0.5: a Benchrelay pricing default for you to set, not a trade figure.' },
  { name: 'repadBaseHours', label: 'Repad labor: base hours', unit: 'h', why: 'Apart, clean, together, regulate and leak-test, whatever the number of keys. Default 1.5 h: a Benchrelay pricing default for you to set.' },
  { name: 'repadHoursPerKey', label: 'Repad labor: hours per key repadded', unit: 'h', why: 'Added for each glued key that gets a new pad. Default 0.25 h: a Benchrelay pricing default for you to set.' },
];

const asText = (rules: PadRules): Record<FieldName, string> => ({
  selfLevelingMinClearanceMm: String(rules.selfLevelingMinClearanceMm),
  gluedOffsetMm: String(rules.gluedOffsetMm),
  minRimOverlapMm: String(rules.minRimOverlapMm),
  stemHeightsMm: rules.stemHeightsMm.join(', '),
  minProtrusionMm: String(rules.minProtrusionMm),
  selfLevelingLaborFactor: String(rules.selfLevelingLaborFactor),
  repadBaseHours: String(rules.repadBaseHours),
  repadHoursPerKey: String(rules.repadHoursPerKey),
  maxRadialClearanceMm: String(rules.maxRadialClearanceMm),
});

const toNumber = (text: string) => (text.trim() === '' ? Number.NaN : Number(text.trim().replace(',', '.')));

function fromText(text: Record<FieldName, string>) {
  return {
    selfLevelingMinClearanceMm: toNumber(text.selfLevelingMinClearanceMm),
    gluedOffsetMm: toNumber(text.gluedOffsetMm),
    minRimOverlapMm: toNumber(text.minRimOverlapMm),
    stemHeightsMm: text.stemHeightsMm.split(/[;,\s]+/).filter(Boolean).map(toNumber),
    minProtrusionMm: toNumber(text.minProtrusionMm),
    selfLevelingLaborFactor: toNumber(text.selfLevelingLaborFactor),
    repadBaseHours: toNumber(text.repadBaseHours),
    repadHoursPerKey: toNumber(text.repadHoursPerKey),
    maxRadialClearanceMm: toNumber(text.maxRadialClearanceMm),
  };
}

/** The owner's pad rules, checked with the same schema the server uses. */
export function PadRulesForm({ canEdit }: { canEdit: boolean }) {
  const rules = useQuery(padRulesQueryOptions());
  if (rules.isPending) return <Spinner label="Loading the pad rules…" showLabel />;
  if (rules.isError) return <ErrorState title="The pad rules could not be loaded" error={rules.error} onRetry={() => void rules.refetch()} />;
  return <RulesEditor key={JSON.stringify(rules.data.rules)} rules={rules.data.rules} defaults={rules.data.defaults} canEdit={canEdit} />;
}

function RulesEditor({ rules, defaults, canEdit }: { rules: PadRules; defaults: PadRules; canEdit: boolean }) {
  const [text, setText] = useState(() => asText(rules));
  const [errors, setErrors] = useState<Partial<Record<string, string>>>({});
  const [saved, setSaved] = useState(false);
  const save = useSavePadRules();

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setSaved(false);
    const parsed = padRulesSchema.safeParse(fromText(text));
    if (!parsed.success) {
      const fields: Record<string, string> = {};
      for (const issue of parsed.error.issues) fields[String(issue.path[0])] ??= issue.message;
      setErrors(fields);
      return;
    }
    try {
      await save.mutateAsync(parsed.data);
      setErrors({});
      setSaved(true);
    } catch (error) {
      setErrors(isApiError(error) ? { ...error.fieldErrors, _: error.message } : { _: 'The rules could not be saved.' });
    }
  };

  return (
    <Card as="section">
      <form onSubmit={(event) => void submit(event)} noValidate className="space-y-5">
        {FIELDS.map((f) => {
          const id = `rule-${f.name}`;
          return (
            <div key={f.name} className="space-y-1">
              <label htmlFor={id} className="block font-semibold text-ink-950">
                {f.label} <span className="font-normal text-ink-600">({f.unit})</span>
              </label>
              <input
                id={id}
                value={text[f.name]}
                readOnly={!canEdit}
                inputMode="decimal"
                onChange={(e) => setText((t) => ({ ...t, [f.name]: e.target.value }))}
                aria-invalid={errors[f.name] ? true : undefined}
                aria-describedby={`${id}-why${errors[f.name] ? ` ${id}-error` : ''}`}
                className="min-h-11 w-full max-w-xs rounded-lg border border-paper-300 bg-white px-3 tabular-nums"
              />
              <p id={`${id}-why`} className="text-sm text-ink-600">
                {f.why} Default: {Array.isArray(defaults[f.name]) ? (defaults[f.name] as number[]).join(', ') : String(defaults[f.name])}.
              </p>
              {errors[f.name] ? <p id={`${id}-error`} className="text-sm font-semibold text-danger-700">{errors[f.name]}</p> : null}
            </div>
          );
        })}
        {errors._ ? <p role="alert" className="font-semibold text-danger-700">{errors._}</p> : null}
        {canEdit ? (
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save pad rules'}</Button>
            <Button variant="secondary" onClick={() => setText(asText(defaults))}>Back to the defaults</Button>
            <p role="status" className="text-sm text-ink-800">{saved ? 'Saved. Every pad map screen uses them from now on.' : ''}</p>
          </div>
        ) : (
          <p className="text-sm text-ink-600">Only the owner changes the pad rules.</p>
        )}
      </form>
    </Card>
  );
}

import { PRIVATE_CUSTOMER_LABEL } from '@shared/registry';
import { useMutation, useQuery, useQueryClient, type UseQueryResult } from '@tanstack/react-query';
import { useEffect, useRef, useState, type FormEvent, type ReactNode, type RefObject } from 'react';
import { Link } from 'react-router-dom';
import { Button, ButtonLink } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { HazardCautions } from '@/components/ui/hazard-cautions';
import { Spinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { INSTRUMENT_FAMILIES, INSTRUMENT_FAMILY_LABELS, OWNER_KINDS, type InstrumentFamily, type OwnerKind } from '@shared/domain';
import {
  CUSTOMER_KINDS,
  CUSTOMER_KIND_LABELS,
  OWNER_KIND_LABELS,
  customerInputSchema,
  jobOpeningSchema,
  newInstrumentSchema,
  type CustomerInput,
  type NewInstrumentInput,
} from '@shared/schemas/registry';
import { isHeavyCase } from '@shared/safety/hazards';
import { familyLabel, stageLabel, todayIn } from '../format';
import { customerSearchQueryOptions, instrumentQueryOptions, registryKeys, registryMutations, serialCheckQueryOptions } from '../queries';
import type { CustomerView, InstrumentDetail, InstrumentHit, IntakeResult } from '../types';
import { useDebouncedValue } from '../use-debounced-value';
import { SelectField, TextAreaField, TextField, fieldsUnder, issuesToFields } from './fields';
import { InstrumentSearch } from './instrument-search';

type Step = 'instrument' | 'customer' | 'job' | 'done';
const STEPS: Array<{ key: Exclude<Step, 'done'>; label: string }> = [
  { key: 'instrument', label: 'Instrument' },
  { key: 'customer', label: 'Customer' },
  { key: 'job', label: 'Job' },
];

type InstrumentChoice = { kind: 'existing'; id: string } | { kind: 'new'; data: NewInstrumentInput };
type CustomerChoice =
  | { kind: 'none' }
  | { kind: 'existing'; customer: CustomerView }
  | { kind: 'new'; data: CustomerInput };

interface IntakeFlowProps {
  shop: { id: string; name: string; timeZone: string };
  initialInstrumentId?: string;
  canRegister: boolean;
  canAddCustomer: boolean;
  instrumentPath: (id: string) => string;
  labelPath: (id: string) => string;
  jobPath?: (id: string) => string;
}

/** What a text field shows for a draft value (the shared schemas read these fields as `unknown`). */
const fieldText = (value: unknown): string => (typeof value === 'string' || typeof value === 'number' ? String(value) : '');

const emptyInstrument = (serial = ''): NewInstrumentInput => ({
  family: 'alto_saxophone', maker: '', model: '', serial, yearMade: undefined, assetTag: '', notes: '', ownerKind: 'customer',
});
const emptyCustomer = (): CustomerInput => ({ kind: 'person', name: '', contactName: '', email: '', phone: '', address: '' });
const newKey = () => crypto.randomUUID();

/**
 * The front desk's intake: find the instrument by serial (or register it), find or add the customer,
 * open the job. Each step keeps its answers when going back; the server does it all in one transaction.
 */
export function IntakeFlow({ shop, initialInstrumentId, canRegister, canAddCustomer, instrumentPath, labelPath, jobPath }: IntakeFlowProps) {
  const queryClient = useQueryClient();
  const [step, setStep] = useState<Step>(initialInstrumentId ? 'customer' : 'instrument');
  const [query, setQuery] = useState('');
  const [instrument, setInstrument] = useState<InstrumentChoice | null>(
    initialInstrumentId ? { kind: 'existing', id: initialInstrumentId } : null,
  );
  const [customer, setCustomer] = useState<CustomerChoice | null>(null);
  const [job, setJob] = useState({ complaint: '', conditionNotes: '', promisedOn: '' });
  const [requestKey, setRequestKey] = useState(newKey);
  const [serverFields, setServerFields] = useState<Record<string, string>>({});
  /** The instrument the server said this new one duplicates (409 already_registered). */
  const [duplicateId, setDuplicateId] = useState<string | null>(null);
  const headingRef = useRef<HTMLHeadingElement>(null);

  // focus follows the step, so keyboard and screen-reader users start at the new step's heading
  // (not on the first render: there the serial box has the focus)
  const firstStep = useRef(true);
  useEffect(() => {
    if (firstStep.current) {
      firstStep.current = false;
      return;
    }
    headingRef.current?.focus();
  }, [step]);

  const existing = useQuery({
    ...instrumentQueryOptions(instrument?.kind === 'existing' ? instrument.id : 'none'),
    enabled: instrument?.kind === 'existing',
  });

  const submit = useMutation({
    mutationFn: () =>
      registryMutations.intake({
        shopId: shop.id,
        requestKey,
        instrument: instrument!.kind === 'existing' ? { id: instrument!.id } : { new: instrument!.data },
        customer: !customer || customer.kind === 'none' ? null : customer.kind === 'existing' ? { id: customer.customer.id } : { new: customer.data },
        job: { complaint: job.complaint, conditionNotes: job.conditionNotes, promisedOn: job.promisedOn || undefined },
      }),
    onSuccess: async () => {
      setServerFields({});
      setStep('done');
      await queryClient.invalidateQueries({ queryKey: registryKeys.all });
    },
    onError: (error) => {
      if (!isApiError(error)) return;
      const fields = { ...error.fieldErrors };
      if (error.code === 'already_registered') {
        // older servers named the field without its place in the request
        const message = fields['instrument.new.serial'] ?? fields.serial ?? error.message;
        delete fields.serial;
        fields['instrument.new.serial'] = message;
        setDuplicateId(typeof error.details.instrumentId === 'string' ? error.details.instrumentId : null);
      }
      setServerFields(fields);
      // back to the step whose answer the server refused, where its field shows the message
      const step = stepOfFields(Object.keys(fields));
      if (step) setStep(step);
    },
  });

  /** A field the person changes no longer carries the server's old complaint about it. */
  const clearServerField = (key: string) => {
    if (key === 'instrument.new.serial' || key === 'instrument.new.maker') setDuplicateId(null);
    setServerFields((fields) => {
      if (!(key in fields)) return fields;
      const { [key]: _gone, ...rest } = fields;
      return rest;
    });
  };

  const restart = () => {
    setStep('instrument');
    setQuery('');
    setInstrument(null);
    setCustomer(null);
    setJob({ complaint: '', conditionNotes: '', promisedOn: '' });
    setRequestKey(newKey());
    setServerFields({});
    setDuplicateId(null);
    submit.reset();
  };

  const ownerOnRecord = instrument?.kind === 'existing' ? existing.data?.owner ?? null : null;
  const openJob = instrument?.kind === 'existing' ? existing.data?.openJob ?? null : null;
  const needsOwner = instrument?.kind === 'new' && instrument.data.ownerKind !== 'rental_fleet';

  return (
    <div className="flex flex-col gap-6">
      <ol aria-label="Intake steps" className="flex gap-2 text-sm">
        {STEPS.map((s, index) => {
          const reached = step === 'done' || STEPS.findIndex((x) => x.key === step) >= index;
          return (
            <li
              key={s.key}
              aria-current={step === s.key ? 'step' : undefined}
              className={cn(
                'flex-1 rounded-lg border px-3 py-2 font-semibold',
                step === s.key ? 'border-accent-600 bg-accent-50 text-accent-800' : reached ? 'border-paper-300 bg-white text-ink-800' : 'border-paper-200 text-ink-600',
              )}
            >
              {index + 1}. {s.label}
            </li>
          );
        })}
      </ol>

      {step === 'instrument' ? (
        <Card as="section" aria-labelledby="step-heading" className="flex flex-col gap-5">
          <StepHeading id="step-heading" headingRef={headingRef}>
            Which instrument?
          </StepHeading>
          {instrument?.kind === 'new' ? (
            <NewInstrumentForm
              initial={instrument.data}
              serverErrors={fieldsUnder(serverFields, 'instrument.new')}
              duplicateId={duplicateId}
              onEdit={(key) => clearServerField(`instrument.new.${key}`)}
              instrumentPath={instrumentPath}
              onCancel={() => setInstrument(null)}
              onUseExisting={(id) => {
                setInstrument({ kind: 'existing', id });
                setServerFields({});
                setDuplicateId(null);
                submit.reset();
                setStep('customer');
              }}
              onDone={(data) => {
                setInstrument({ kind: 'new', data });
                setStep('customer');
              }}
            />
          ) : (
            <InstrumentSearch
              autoFocus
              query={query}
              onQueryChange={setQuery}
              onPick={(hit: InstrumentHit) => {
                setInstrument({ kind: 'existing', id: hit.id });
                setCustomer(null);
                setStep('customer');
              }}
              onScannedInstrument={(id) => {
                setInstrument({ kind: 'existing', id });
                setStep('customer');
              }}
              footer={({ query: q }) =>
                canRegister && q ? (
                  <div className="flex flex-col gap-2 rounded-xl border border-dashed border-paper-300 bg-paper-50 p-4 sm:flex-row sm:items-center sm:justify-between">
                    <p className="text-ink-800">Not the one? The network may not know it yet.</p>
                    <Button variant="secondary" onClick={() => setInstrument({ kind: 'new', data: emptyInstrument(query.trim()) })}>
                      Register “{query.trim()}” as a new instrument
                    </Button>
                  </div>
                ) : null
              }
            />
          )}
        </Card>
      ) : null}

      {step === 'customer' && instrument ? (
        <Card as="section" aria-labelledby="step-heading" className="flex flex-col gap-5">
          <StepHeading id="step-heading" headingRef={headingRef}>
            Who brought it in?
          </StepHeading>
          <InstrumentSummary choice={instrument} existing={existing} onChange={() => setStep('instrument')} />
          {openJob ? (
            <div role="alert" className="rounded-xl border border-danger-200 bg-danger-50 px-4 py-3">
              <p className="font-semibold text-danger-700">
                This instrument already has job {openJob.number} open at {openJob.shop?.name} ({stageLabel(openJob.stage).toLowerCase()}).
              </p>
              <p className="text-ink-800">One visit at a time: finish or release that job first, or pick another instrument.</p>
            </div>
          ) : null}
          <CustomerPicker
            value={customer}
            onChange={setCustomer}
            ownerOnRecord={ownerOnRecord}
            allowNone={!needsOwner}
            canAdd={canAddCustomer}
            serverErrors={serverFields}
            onEdit={clearServerField}
            onContinue={() => setStep('job')}
            blocked={!!openJob || (instrument.kind === 'existing' && !existing.isSuccess)}
            ownerRequiredMessage={needsOwner ? 'A new instrument needs its owner: pick or add the customer or school.' : undefined}
          />
        </Card>
      ) : null}

      {step === 'job' && instrument ? (
        <Card as="section" aria-labelledby="step-heading" className="flex flex-col gap-5">
          <StepHeading id="step-heading" headingRef={headingRef}>
            Open the job at {shop.name}
          </StepHeading>
          <InstrumentSummary choice={instrument} existing={existing} onChange={() => setStep('instrument')} />
          <p className="text-sm text-ink-800">
            Customer: <strong>{describeCustomer(customer)}</strong>{' '}
            <button type="button" className="font-semibold text-accent-700 underline" onClick={() => setStep('customer')}>
              Change
            </button>
          </p>
          <JobForm
            value={job}
            onChange={setJob}
            minDate={todayIn(shop.timeZone)}
            serverErrors={{ ...fieldsUnder(serverFields, 'job'), ...pick(serverFields, ['complaint', 'promisedOn', 'conditionNotes']) }}
            onEdit={(key) => {
              clearServerField(`job.${key}`);
              clearServerField(key);
            }}
            submitting={submit.isPending}
            onSubmit={() => submit.mutate()}
          />
          {submit.isError && !Object.keys(serverFields).length ? <ErrorState title="The job was not opened" error={submit.error} /> : null}
        </Card>
      ) : null}

      {step === 'done' && submit.data ? (
        <IntakeDone result={submit.data} shopName={shop.name} instrumentPath={instrumentPath} labelPath={labelPath} jobPath={jobPath} onAnother={restart} headingRef={headingRef} />
      ) : null}
    </div>
  );
}

/** The step whose answers a set of server field errors are about. */
function stepOfFields(keys: string[]): Exclude<Step, 'done'> | null {
  if (keys.some((k) => k.startsWith('instrument'))) return 'instrument';
  if (keys.some((k) => k === 'customer' || k.startsWith('customer.'))) return 'customer';
  if (keys.some((k) => k.startsWith('job.') || ['complaint', 'promisedOn', 'conditionNotes'].includes(k))) return 'job';
  return null;
}

const pick = (fields: Record<string, string>, keys: string[]) =>
  Object.fromEntries(Object.entries(fields).filter(([k]) => keys.includes(k)));

function describeCustomer(choice: CustomerChoice | null): string {
  if (!choice || choice.kind === 'none') return 'none (rental fleet check-in)';
  if (choice.kind === 'existing') return choice.customer.name ?? PRIVATE_CUSTOMER_LABEL;
  return `${choice.data.name} (new)`;
}

function InstrumentSummary({
  choice, existing, onChange,
}: {
  choice: InstrumentChoice;
  existing: UseQueryResult<InstrumentDetail>;
  onChange: () => void;
}) {
  let text: string;
  let heavy = false;
  if (choice.kind === 'new') {
    text = `${INSTRUMENT_FAMILY_LABELS[choice.data.family as keyof typeof INSTRUMENT_FAMILY_LABELS] ?? choice.data.family} · ${choice.data.maker} ${fieldText(choice.data.model)} · SN ${choice.data.serial} (new)`;
    heavy = isHeavyCase(choice.data.family as InstrumentFamily, choice.data.heavyCase ?? false);
  } else if (existing.isPending) {
    return <Spinner label="Loading the instrument…" showLabel />;
  } else if (existing.isError) {
    return <ErrorState title="The instrument could not be loaded" error={existing.error} onRetry={() => void existing.refetch()} />;
  } else {
    const i = existing.data.instrument;
    text = `${familyLabel(i.family)} · ${i.maker} ${i.model ?? ''} · SN ${i.serial} · at ${i.currentShop?.name ?? '—'}`;
    heavy = i.heavyCase;
  }
  return (
    <>
      <p className="rounded-lg bg-paper-100 px-3 py-2 text-sm text-ink-950">
        {text}{' '}
        <button type="button" className="font-semibold text-accent-700 underline" onClick={onChange}>
          Change
        </button>
      </p>
      {/* the desk carries it to the shelf: the lifting caution stands at intake, before anyone picks it up */}
      {heavy ? <HazardCautions hazards={['heavy_lift']} /> : null}
    </>
  );
}

function NewInstrumentForm({
  initial, serverErrors, duplicateId, onEdit, onDone, onCancel, onUseExisting, instrumentPath,
}: {
  initial: NewInstrumentInput;
  serverErrors: Record<string, string>;
  duplicateId: string | null;
  onEdit: (key: keyof NewInstrumentInput) => void;
  onDone: (data: NewInstrumentInput) => void;
  onCancel: () => void;
  onUseExisting: (id: string) => void;
  instrumentPath: (id: string) => string;
}) {
  const [draft, setDraft] = useState<NewInstrumentInput>(initial);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [checking, setChecking] = useState(false);
  const queryClient = useQueryClient();
  const set = <K extends keyof NewInstrumentInput>(key: K, value: NewInstrumentInput[K]) => {
    setDraft((d) => ({ ...d, [key]: value }));
    // what was said about the old value no longer holds
    setErrors(({ [key]: _stale, ...rest }) => rest);
    onEdit(key);
  };
  const serialNow = String(draft.serial ?? '').trim();
  const makerNow = String(draft.maker ?? '').trim();
  const serial = useDebouncedValue(serialNow, 300);
  const maker = useDebouncedValue(makerNow, 300);
  const check = useQuery(serialCheckQueryOptions(serial, maker));
  // the answer shown must be about what is in the boxes now, not what was typed a moment ago
  const current = serial === serialNow && maker === makerNow ? check.data : undefined;
  const sameMaker = current?.sameMaker ?? null;
  const shown = { ...serverErrors, ...errors };

  const onSubmit = async (event: FormEvent) => {
    event.preventDefault();
    const parsed = newInstrumentSchema.safeParse(draft);
    if (!parsed.success) {
      setErrors(issuesToFields(parsed.error.issues));
      return;
    }
    setErrors({});
    // a quick Continue must not outrun the lookup: ask now for exactly what was typed
    setChecking(true);
    try {
      const answer = await queryClient.fetchQuery(serialCheckQueryOptions(serialNow, makerNow));
      if (answer.sameMaker) {
        setErrors({ serial: 'This serial is already registered under this maker: use that one below.' });
        return;
      }
    } catch {
      // the lookup is a courtesy; the server refuses a duplicate anyway and says so at this step
    } finally {
      setChecking(false);
    }
    onDone(draft);
  };

  return (
    <form onSubmit={(event) => void onSubmit(event)} noValidate className="flex flex-col gap-4">
      <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
        <TextField label="Serial number as engraved" required value={String(draft.serial ?? '')} onChange={(e) => set('serial', e.target.value)} error={shown.serial} autoCapitalize="characters" spellCheck={false} />
        <SelectField label="Family" required value={String(draft.family)} onChange={(e) => set('family', e.target.value as NewInstrumentInput['family'])} error={shown.family}>
          {INSTRUMENT_FAMILIES.map((f) => (
            <option key={f} value={f}>{INSTRUMENT_FAMILY_LABELS[f]}</option>
          ))}
        </SelectField>
        <TextField label="Maker" required value={fieldText(draft.maker)} onChange={(e) => set('maker', e.target.value)} error={shown.maker} />
        <TextField label="Model" value={fieldText(draft.model)} onChange={(e) => set('model', e.target.value)} error={shown.model} />
        <TextField label="Year made" inputMode="numeric" value={fieldText(draft.yearMade)} onChange={(e) => set('yearMade', e.target.value as unknown as number)} error={shown.yearMade} />
        <TextField label="Asset tag" value={fieldText(draft.assetTag)} onChange={(e) => set('assetTag', e.target.value)} error={shown.assetTag} hint="Leave empty and Benchrelay makes one for the QR label." />
        <SelectField label="Owned by" required value={draft.ownerKind} onChange={(e) => set('ownerKind', e.target.value as OwnerKind)} error={shown.ownerKind}>
          {OWNER_KINDS.map((k) => (
            <option key={k} value={k}>{OWNER_KIND_LABELS[k]}</option>
          ))}
        </SelectField>
      </div>
      <label className="flex min-h-11 items-start gap-2 text-sm font-medium text-ink-800">
        <input type="checkbox" className="mt-0.5 size-5 accent-accent-600" checked={draft.heavyCase ?? false} onChange={(e) => set('heavyCase', e.target.checked)} />
        <span>
          Heavy case
          <span className="block font-normal text-ink-600">It travels in a heavy case whatever its family (a double case, a flight case). Baritone and bass saxophones, tubas and euphoniums count as heavy anyway.</span>
        </span>
      </label>
      {isHeavyCase(draft.family as InstrumentFamily, draft.heavyCase ?? false) ? <HazardCautions hazards={['heavy_lift']} /> : null}
      {sameMaker ? (
        <div role="alert" className="rounded-xl border border-danger-200 bg-danger-50 px-4 py-3 text-sm">
          <p className="font-semibold text-danger-700">
            {sameMaker.maker} {sameMaker.serial} is already in the registry
            {sameMaker.model ? ` (${sameMaker.model}, ${familyLabel(sameMaker.family).toLowerCase()})` : ` (${familyLabel(sameMaker.family).toLowerCase()})`}, at {sameMaker.currentShop.name}.
          </p>
          <p className="text-ink-800">One serial under one maker is one instrument: take that one in rather than registering it twice.</p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => onUseExisting(sameMaker.id)}>Use that one</Button>
            <Link className="self-center font-semibold text-accent-700 underline" to={instrumentPath(sameMaker.id)}>See its history</Link>
          </div>
        </div>
      ) : duplicateId && serverErrors.serial ? (
        <div role="alert" className="rounded-xl border border-danger-200 bg-danger-50 px-4 py-3 text-sm">
          <p className="font-semibold text-danger-700">{serverErrors.serial}</p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => onUseExisting(duplicateId)}>Use that one</Button>
            <Link className="self-center font-semibold text-accent-700 underline" to={instrumentPath(duplicateId)}>See its history</Link>
          </div>
        </div>
      ) : null}
      {current && current.otherMakers.length ? (
        <div role="note" className="rounded-xl border border-paper-300 bg-paper-50 px-4 py-3 text-sm text-ink-950">
          <p className="font-semibold">This serial is also registered under another maker:</p>
          <ul className="list-disc pl-5">
            {current.otherMakers.map((o) => (
              <li key={o.id}>
                {o.maker} {o.model ?? ''} ({familyLabel(o.family).toLowerCase()}), at {o.currentShop.name}
              </li>
            ))}
          </ul>
          <p className="mt-1">Check the maker engraved on the instrument. Different makers can share a serial.</p>
        </div>
      ) : null}
      <div className="flex flex-col-reverse gap-3 sm:flex-row sm:justify-end">
        <Button variant="quiet" onClick={onCancel}>Back to search</Button>
        <Button type="submit" disabled={!!sameMaker || checking}>{checking ? 'Checking the registry…' : 'Continue'}</Button>
      </div>
    </form>
  );
}

function CustomerPicker({
  value, onChange, ownerOnRecord, allowNone, canAdd, onContinue, blocked, serverErrors, onEdit, ownerRequiredMessage,
}: {
  value: CustomerChoice | null;
  onChange: (choice: CustomerChoice) => void;
  ownerOnRecord: CustomerView | null;
  allowNone: boolean;
  canAdd: boolean;
  onContinue: () => void;
  blocked: boolean;
  serverErrors: Record<string, string>;
  onEdit: (key: string) => void;
  ownerRequiredMessage?: string;
}) {
  const [q, setQ] = useState('');
  const [adding, setAdding] = useState(value?.kind === 'new');
  const [draft, setDraft] = useState<CustomerInput>(value?.kind === 'new' ? value.data : emptyCustomer());
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [missing, setMissing] = useState<string | null>(null);
  const debounced = useDebouncedValue(q.trim(), 200);
  const search = useQuery({ ...customerSearchQueryOptions(debounced), enabled: debounced.length >= 2 });
  const shown = { ...fieldsUnder(serverErrors, 'customer.new'), ...errors };
  const selectedId = value?.kind === 'existing' ? value.customer.id : null;

  const next = () => {
    if (adding) {
      const parsed = customerInputSchema.safeParse(draft);
      if (!parsed.success) {
        setErrors(issuesToFields(parsed.error.issues));
        return;
      }
      setErrors({});
      onChange({ kind: 'new', data: draft });
      onContinue();
      return;
    }
    if (!value || (value.kind === 'none' && !allowNone)) {
      setMissing(ownerRequiredMessage ?? 'Pick a customer, add one, or choose “No customer”.');
      return;
    }
    onContinue();
  };

  const edit = <K extends keyof CustomerInput>(key: K, value: CustomerInput[K]) => {
    setDraft((d) => ({ ...d, [key]: value }));
    setErrors(({ [key]: _stale, ...rest }) => rest);
    onEdit(`customer.new.${key}`);
    onEdit('customer');
  };

  const choose = (choice: CustomerChoice) => {
    onEdit('customer');
    setMissing(null);
    setAdding(false);
    onChange(choice);
  };

  return (
    <div className="flex flex-col gap-4">
      {/* Only a customer of the person's own shops may be named (the server refuses anyone else): naming a
          stranger would make this shop one that serves them and open their contact details to it. */}
      {ownerOnRecord && ownerOnRecord.contactVisible ? (
        <ChoiceRow
          checked={selectedId === ownerOnRecord.id && !adding}
          onSelect={() => choose({ kind: 'existing', customer: ownerOnRecord })}
          title={`The owner on record: ${ownerOnRecord.name ?? 'Private customer'}`}
          detail={ownerOnRecord.contact?.phone ?? ownerOnRecord.contact?.email ?? ''}
        />
      ) : null}
      {ownerOnRecord && !ownerOnRecord.contactVisible ? (
        <p className="rounded-xl border border-paper-200 bg-paper-50 px-4 py-3 text-sm text-ink-800">
          The owner on record ({ownerOnRecord.name ?? 'a private customer'}) is a customer of another shop; their details stay with
          the shops that served them. Find the person among your shops’ customers, add them here, or continue without a customer.
        </p>
      ) : null}
      {allowNone ? (
        <ChoiceRow
          checked={value?.kind === 'none' && !adding}
          onSelect={() => choose({ kind: 'none' })}
          title="No customer"
          detail="A rental fleet check-in, with nobody to call."
        />
      ) : null}

      <TextField label="Find a customer of your shops" type="search" value={q} onChange={(e) => setQ(e.target.value)} hint="Name, e-mail or phone." />
      {search.isFetching && !search.data ? <Spinner label="Searching customers…" /> : null}
      {search.isError ? <ErrorState title="Customers could not be searched" error={search.error} /> : null}
      {debounced.length >= 2 && search.data ? (
        search.data.length ? (
          <div role="radiogroup" aria-label="Customers found" className="flex flex-col gap-2">
            {search.data.map((c) => (
              <ChoiceRow
                key={c.id}
                checked={selectedId === c.id && !adding}
                onSelect={() => choose({ kind: 'existing', customer: c })}
                title={c.name ?? 'Private customer'}
                detail={[CUSTOMER_KIND_LABELS[c.kind], c.contact?.phone, c.contact?.email].filter(Boolean).join(' · ')}
              />
            ))}
          </div>
        ) : (
          <p className="text-ink-600">No customer of your shops matches “{debounced}”.</p>
        )
      ) : null}

      {canAdd ? (
        adding ? (
          <fieldset className="flex flex-col gap-4 rounded-xl border border-paper-300 p-4">
            <legend className="px-1 font-semibold text-ink-950">New customer</legend>
            <div className="grid grid-cols-1 gap-4 sm:grid-cols-2">
              <SelectField label="Kind" required value={draft.kind} onChange={(e) => edit('kind', e.target.value as CustomerInput['kind'])} error={shown.kind}>
                {CUSTOMER_KINDS.map((k) => (
                  <option key={k} value={k}>{CUSTOMER_KIND_LABELS[k]}</option>
                ))}
              </SelectField>
              <TextField label="Name" required value={draft.name} onChange={(e) => edit('name', e.target.value)} error={shown.name} autoComplete="off" />
              {draft.kind !== 'person' ? (
                <TextField label="Contact person" value={fieldText(draft.contactName)} onChange={(e) => edit('contactName', e.target.value)} error={shown.contactName} />
              ) : null}
              <TextField label="Phone" type="tel" value={fieldText(draft.phone)} onChange={(e) => edit('phone', e.target.value)} error={shown.phone} />
              <TextField label="E-mail" type="email" value={fieldText(draft.email)} onChange={(e) => edit('email', e.target.value)} error={shown.email} />
            </div>
            <Button variant="quiet" className="self-start" onClick={() => setAdding(false)}>Cancel the new customer</Button>
          </fieldset>
        ) : (
          <Button variant="secondary" className="self-start" onClick={() => { setAdding(true); setMissing(null); }}>
            Add a new customer
          </Button>
        )
      ) : null}

      {missing || serverErrors.customer ? (
        <p role="alert" className="font-semibold text-danger-700">{missing ?? serverErrors.customer}</p>
      ) : null}
      <div className="flex justify-end">
        <Button onClick={next} disabled={blocked}>Continue</Button>
      </div>
    </div>
  );
}

function ChoiceRow({ checked, onSelect, title, detail }: { checked: boolean; onSelect: () => void; title: string; detail?: string }) {
  return (
    <label className={cn('flex min-h-11 cursor-pointer items-start gap-3 rounded-xl border px-4 py-3', checked ? 'border-accent-600 bg-accent-50' : 'border-paper-300 bg-white hover:border-ink-400')}>
      <input type="radio" name="intake-customer" className="mt-1 size-4 accent-accent-600" checked={checked} onChange={onSelect} />
      <span className="flex flex-col">
        <span className="font-semibold text-ink-950">{title}</span>
        {detail ? <span className="text-sm text-ink-600">{detail}</span> : null}
      </span>
    </label>
  );
}

type JobDraft = { complaint: string; conditionNotes: string; promisedOn: string };

function JobForm({
  value, onChange, minDate, serverErrors, onEdit, submitting, onSubmit,
}: {
  value: JobDraft;
  onChange: (v: JobDraft) => void;
  minDate: string;
  serverErrors: Record<string, string>;
  onEdit: (key: keyof JobDraft) => void;
  submitting: boolean;
  onSubmit: () => void;
}) {
  const [errors, setErrors] = useState<Record<string, string>>({});
  const shown = { ...serverErrors, ...errors };
  const set = (key: keyof JobDraft, text: string) => {
    onChange({ ...value, [key]: text });
    setErrors(({ [key]: _stale, ...rest }) => rest);
    onEdit(key);
  };
  const submit = (event: FormEvent) => {
    event.preventDefault();
    const parsed = jobOpeningSchema.safeParse(value);
    const found = parsed.success ? {} : issuesToFields(parsed.error.issues);
    if (value.promisedOn && value.promisedOn < minDate) found.promisedOn = 'The promised date cannot be in the past.';
    setErrors(found);
    if (Object.keys(found).length === 0) onSubmit();
  };
  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4">
      <TextAreaField label="What the customer reports" required value={value.complaint} onChange={(e) => set('complaint', e.target.value)} error={shown.complaint} maxLength={2000} placeholder="e.g. Low notes gurgle below D; octave key sticks." />
      <TextAreaField label="Condition at intake" value={value.conditionNotes} onChange={(e) => set('conditionNotes', e.target.value)} error={shown.conditionNotes} maxLength={4000} hint="Dents, scratches, case, accessories: what the customer would want on record." />
      <TextField label="Promised date" type="date" min={minDate} value={value.promisedOn} onChange={(e) => set('promisedOn', e.target.value)} error={shown.promisedOn} className="sm:max-w-xs" />
      <div className="flex justify-end">
        <Button type="submit" size="lg" disabled={submitting}>
          {submitting ? 'Opening the job…' : 'Open the job'}
        </Button>
      </div>
    </form>
  );
}

function IntakeDone({
  result, shopName, instrumentPath, labelPath, jobPath, onAnother, headingRef,
}: {
  result: IntakeResult;
  shopName: string;
  instrumentPath: (id: string) => string;
  labelPath: (id: string) => string;
  jobPath?: (id: string) => string;
  onAnother: () => void;
  headingRef: RefObject<HTMLHeadingElement | null>;
}) {
  return (
    <Card as="section" aria-labelledby="done-heading" className="flex flex-col gap-4">
      <StepHeading id="done-heading" headingRef={headingRef}>
        Job {result.job.number} is open at {shopName}
      </StepHeading>
      <p className="text-ink-800">
        {result.instrument.maker} · SN {result.instrument.serial}
        {result.instrument.assetTag ? ` · tag ${result.instrument.assetTag}` : ''}
      </p>
      {result.cautions.length ? <HazardCautions cautions={result.cautions} intro="Before it goes to the shelf" /> : null}
      {result.warnings.map((w) => (
        <p key={w} role="note" className="rounded-lg bg-paper-100 px-3 py-2 text-sm text-ink-950">{w}</p>
      ))}
      <div className="flex flex-col gap-3 sm:flex-row sm:flex-wrap">
        {jobPath ? <ButtonLink to={jobPath(result.job.id)}>Open job {result.job.number}</ButtonLink> : null}
        <ButtonLink to={instrumentPath(result.instrument.id)} variant="secondary">See the instrument’s history</ButtonLink>
        <ButtonLink to={labelPath(result.instrument.id)} variant="secondary">Print its QR label</ButtonLink>
        <Button variant="secondary" onClick={onAnother}>Take in another</Button>
      </div>
    </Card>
  );
}

/** A step's heading; it takes focus when the step opens. */
function StepHeading({ id, headingRef, children }: { id: string; headingRef: RefObject<HTMLHeadingElement | null>; children: ReactNode }) {
  return (
    <h2 id={id} ref={headingRef} tabIndex={-1} className="text-lg font-semibold text-ink-950 outline-none">
      {children}
    </h2>
  );
}

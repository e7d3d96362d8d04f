import { useId, useState, type FormEvent, type ReactNode } from 'react';
import { subject } from '@casl/ability';
import type { TransferState } from '@shared/domain';
import { PACK_TEXT_MAX, reasonSchema, receiveTransferSchema } from '@shared/transfers';
import { Button } from '@/components/ui/button';
import { isApiError, type FieldErrors } from '@/lib/api-client';
import { useAppAbility } from '@/lib/ability';
import { formatInShop, PENDING_LABEL } from '../format';
import { useTransferAction } from '../queries';
import type { TransferAction, TransferDetail } from '../types';
import { HazardCautions } from '@/components/ui/hazard-cautions';

/**
 * The next steps of a transfer that this person may take. The server decides for real; the ability only
 * hides buttons that would be refused. While a step is queued the buttons wait for the worker.
 */
export function TransferActions({ transfer, currentUserId }: { transfer: TransferDetail; currentUserId: string }) {
  const ability = useAppAbility();
  const row = subject('Transfer', { fromShopId: transfer.fromShop.id, toShopId: transfer.toShop.id });
  const can = {
    approve: ability.can('approve', row),
    pack: ability.can('pack', subject('Transfer', { fromShopId: transfer.fromShop.id })),
    receive: ability.can('receive', subject('Transfer', { toShopId: transfer.toShop.id })),
    cancel:
      ability.can('update', row) ||
      (transfer.requestedBy?.id === currentUserId && ability.can('request', subject('Transfer', { fromShopId: transfer.fromShop.id }))),
  };
  const next = new Set<TransferState>(transfer.nextStates);

  if (transfer.pendingStep) {
    return (
      <div role="status" className="flex items-center gap-3 rounded-2xl border border-accent-200 bg-accent-50 p-4 text-accent-800">
        <svg className="size-5 animate-spin" viewBox="0 0 24 24" fill="none" aria-hidden="true">
          <circle cx="12" cy="12" r="9.5" stroke="currentColor" strokeOpacity="0.25" strokeWidth="3" />
          <path d="M21.5 12A9.5 9.5 0 0 0 12 2.5" stroke="currentColor" strokeWidth="3" strokeLinecap="round" />
        </svg>
        <span className="font-medium">{PENDING_LABEL[transfer.pendingStep]}</span>
      </div>
    );
  }

  const panels: ReactNode[] = [];
  if (next.has('approved') && can.approve) panels.push(<DecidePanel key="decide" transfer={transfer} />);
  if (next.has('packed') && can.pack) panels.push(<PackPanel key="pack" transfer={transfer} />);
  if (next.has('in_transit') && can.pack) panels.push(<HandOverPanel key="hand-over" transfer={transfer} />);
  if (next.has('received') && can.receive) panels.push(<ReceivePanel key="receive" transfer={transfer} />);
  if (next.has('cancelled') && can.cancel) panels.push(<ReasonPanel key="cancel" transfer={transfer} action="cancel" label="Cancel transfer" />);
  if (!panels.length) return null;
  return <div className="flex flex-col gap-4">{panels}</div>;
}

function useAction(transfer: TransferDetail) {
  const mutation = useTransferAction(transfer.id);
  const [fieldErrors, setFieldErrors] = useState<FieldErrors>({});
  const run = async (action: TransferAction, body?: Record<string, unknown>) => {
    setFieldErrors({});
    try {
      await mutation.mutateAsync({ action, body });
    } catch (err) {
      if (isApiError(err)) setFieldErrors(err.fieldErrors);
    }
  };
  const message =
    mutation.isError && isApiError(mutation.error) ? mutation.error.message : mutation.isError ? 'That did not go through. Try again.' : null;
  return { run, pending: mutation.isPending, fieldErrors, setFieldErrors, message };
}

function Panel({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="rounded-2xl border border-paper-200 bg-white p-4 sm:p-5" aria-label={title}>
      <h3 className="text-base font-semibold text-ink-950">{title}</h3>
      <div className="mt-3">{children}</div>
    </section>
  );
}

function FieldError({ id, message }: { id: string; message?: string }) {
  return message ? (
    <p id={id} className="text-sm font-medium text-danger-700">
      {message}
    </p>
  ) : null;
}

function ErrorLine({ message }: { message: string | null }) {
  return message ? (
    <p role="alert" className="mt-2 text-sm font-medium text-danger-700">
      {message}
    </p>
  ) : null;
}

function DecidePanel({ transfer }: { transfer: TransferDetail }) {
  const { run, pending, fieldErrors, setFieldErrors, message } = useAction(transfer);
  const [note, setNote] = useState('');
  const id = useId();
  const reject = () => {
    const parsed = reasonSchema.safeParse({ reason: note });
    if (!parsed.success) return setFieldErrors({ reason: parsed.error.issues[0].message });
    void run('reject', parsed.data);
  };
  return (
    <Panel title="Decide">
      <p className="text-sm text-ink-600">
        Approve to let {transfer.fromShop.name} pack it for {transfer.toShop.name}. A rejection needs a reason.
      </p>
      <div className="mt-3 flex flex-col gap-1">
        <label htmlFor={id} className="text-sm font-medium text-ink-800">
          Note or reason
        </label>
        <textarea
          id={id}
          rows={2}
          value={note}
          onChange={(e) => setNote(e.target.value)}
          aria-invalid={!!fieldErrors.reason}
          aria-describedby={fieldErrors.reason ? `${id}-error` : undefined}
          className="rounded-lg border border-paper-300 bg-white px-3 py-2 text-ink-950"
        />
        <FieldError id={`${id}-error`} message={fieldErrors.reason ?? fieldErrors.note} />
      </div>
      <div className="mt-3 flex flex-wrap gap-3">
        <Button onClick={() => void run('approve', note.trim() ? { note } : {})} disabled={pending}>
          Approve transfer
        </Button>
        <Button variant="secondary" onClick={reject} disabled={pending}>
          Reject
        </Button>
      </div>
      <ErrorLine message={message} />
    </Panel>
  );
}

function RunSelect({ transfer, value, onChange, error }: { transfer: TransferDetail; value: string; onChange: (v: string) => void; error?: string }) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-medium text-ink-800">
        Relay run
      </label>
      <select
        id={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 text-sm text-ink-950"
        aria-invalid={!!error}
      >
        {transfer.runOptions.length ? <option value="">The next run that gets there first</option> : null}
        {transfer.runOptions.map((r) => (
          <option key={r.id} value={r.id}>
            {r.label}
            {r.nextDepartureAt ? ` · next ${formatInShop(r.nextDepartureAt, transfer.fromShop.timeZone)}` : ''}
          </option>
        ))}
        <option value="none">No relay run: an ad-hoc courier</option>
      </select>
      <FieldError id={`${id}-error`} message={error} />
    </div>
  );
}

const runBody = (value: string) => (value === 'none' ? { relayRunId: null } : value ? { relayRunId: value } : {});

function PackPanel({ transfer }: { transfer: TransferDetail }) {
  const { run, pending, fieldErrors, setFieldErrors, message } = useAction(transfer);
  const [runId, setRunId] = useState(transfer.runOptions.length ? '' : 'none');
  const [acknowledged, setAcknowledged] = useState(false);
  const [cases, setCases] = useState('1');
  const [contents, setContents] = useState('');
  const [condition, setCondition] = useState('');
  const id = useId();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (transfer.heavyCase && !acknowledged) {
      return setFieldErrors({ liftingAcknowledged: 'Confirm you have read the lifting caution: two people or a cart.' });
    }
    const caseCount = /^\s*\d+\s*$/.test(cases) ? Number(cases) : NaN;
    if (!Number.isInteger(caseCount)) return setFieldErrors({ caseCount: 'Enter a number of cases.' });
    void run('pack', {
      ...runBody(runId),
      liftingAcknowledged: acknowledged,
      caseCount,
      ...(contents.trim() ? { contents } : {}),
      ...(condition.trim() ? { departureCondition: condition } : {}),
    });
  };
  const textField = (key: 'contents' | 'departureCondition', label: string, hint: string, value: string, set: (v: string) => void) => (
    <div className="flex flex-col gap-1">
      <label htmlFor={`${id}-${key}`} className="text-sm font-medium text-ink-800">
        {label}
      </label>
      <textarea
        id={`${id}-${key}`}
        rows={2}
        value={value}
        maxLength={PACK_TEXT_MAX}
        onChange={(e) => set(e.target.value)}
        aria-invalid={!!fieldErrors[key]}
        aria-describedby={`${id}-${key}-hint${fieldErrors[key] ? ` ${id}-${key}-error` : ''}`}
        className="rounded-lg border border-paper-300 bg-white px-3 py-2 text-ink-950"
      />
      <p id={`${id}-${key}-hint`} className="text-xs text-ink-600">
        {hint} {value.length}/{PACK_TEXT_MAX}
      </p>
      <FieldError id={`${id}-${key}-error`} message={fieldErrors[key]} />
    </div>
  );
  return (
    <Panel title="Pack for the relay run">
      <form onSubmit={submit} noValidate className="flex flex-col gap-3">
        {transfer.heavyCase ? (
          <>
            <HazardCautions hazards={['heavy_lift']} />
            <label className="flex items-start gap-2 text-sm font-medium text-ink-800">
              <input
                type="checkbox"
                className="mt-0.5 size-5 accent-accent-600"
                checked={acknowledged}
                onChange={(e) => setAcknowledged(e.target.checked)}
                aria-describedby={fieldErrors.liftingAcknowledged ? `${id}-lift` : undefined}
              />
              I have read the lifting caution; two people or a cart will move this case.
            </label>
            <FieldError id={`${id}-lift`} message={fieldErrors.liftingAcknowledged} />
          </>
        ) : null}
        <RunSelect transfer={transfer} value={runId} onChange={setRunId} error={fieldErrors.relayRunId} />
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-cases`} className="text-sm font-medium text-ink-800">
            Number of cases
          </label>
          <input
            id={`${id}-cases`}
            inputMode="numeric"
            value={cases}
            onChange={(e) => setCases(e.target.value)}
            aria-invalid={!!fieldErrors.caseCount}
            aria-describedby={fieldErrors.caseCount ? `${id}-cases-error` : undefined}
            className="min-h-11 w-24 rounded-lg border border-paper-300 bg-white px-3 text-ink-950"
          />
          <FieldError id={`${id}-cases-error`} message={fieldErrors.caseCount} />
        </div>
        {textField('contents', 'Contents and accessories', 'What travels with it: neck, mouthpiece, strap, spare parts.', contents, setContents)}
        {textField('departureCondition', 'Condition on departure', 'Dents, bent keys, leaks found before it leaves.', condition, setCondition)}
        <p className="text-xs text-ink-600">These print on the manifest, with lines to sign at the hand-over and on receipt.</p>
        <div>
          <Button type="submit" disabled={pending}>
            Mark as packed
          </Button>
        </div>
        <ErrorLine message={message} />
      </form>
    </Panel>
  );
}

function HandOverPanel({ transfer }: { transfer: TransferDetail }) {
  const { run, pending, fieldErrors, message } = useAction(transfer);
  const [runId, setRunId] = useState(transfer.relayRun?.id ?? (transfer.runOptions.length ? '' : 'none'));
  return (
    <Panel title="Hand over">
      <p className="mb-3 text-sm text-ink-600">
        When the relay run or the courier has it: the job goes on hold as in transit. On a relay run it leaves at the run’s next departure, and{' '}
        {transfer.toShop.name} is told the run’s date and when to expect it.
      </p>
      <form
        onSubmit={(e) => {
          e.preventDefault();
          void run('hand-over', runBody(runId));
        }}
        className="flex flex-col gap-3"
      >
        <RunSelect transfer={transfer} value={runId} onChange={setRunId} error={fieldErrors.relayRunId} />
        <div>
          <Button type="submit" disabled={pending}>
            Handed over to the courier
          </Button>
        </div>
        <ErrorLine message={message} />
      </form>
    </Panel>
  );
}

function ReceivePanel({ transfer }: { transfer: TransferDetail }) {
  const { run, pending, fieldErrors, setFieldErrors, message } = useAction(transfer);
  const [serial, setSerial] = useState('');
  const [method, setMethod] = useState<'typed' | 'scan'>('typed');
  const id = useId();
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = receiveTransferSchema.safeParse({ serial, method });
    if (!parsed.success) return setFieldErrors({ serial: parsed.error.issues[0].message });
    void run('receive', parsed.data);
  };
  return (
    <Panel title="Receive">
      <form onSubmit={submit} noValidate className="flex flex-col gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={id} className="text-sm font-medium text-ink-800">
            Serial number on the instrument
          </label>
          <input
            id={id}
            value={serial}
            onChange={(e) => {
              setSerial(e.target.value);
              setMethod('typed');
            }}
            // a barcode scanner types the label and presses Enter; a paste is most likely a scan too
            onPaste={() => setMethod('scan')}
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            inputMode="text"
            aria-invalid={!!fieldErrors.serial}
            aria-describedby={`${id}-help${fieldErrors.serial ? ` ${id}-error` : ''}`}
            className="min-h-11 rounded-lg border border-paper-300 bg-white px-3 font-mono text-ink-950"
          />
          <p id={`${id}-help`} className="text-sm text-ink-600">
            Scan the label or read the engraving and type it; spaces, dashes and case do not matter. A different serial is refused.
          </p>
          <FieldError id={`${id}-error`} message={fieldErrors.serial} />
        </div>
        <div>
          <Button type="submit" disabled={pending}>
            Confirm receipt
          </Button>
        </div>
        <ErrorLine message={fieldErrors.serial ? null : message} />
      </form>
    </Panel>
  );
}

function ReasonPanel({ transfer, action, label }: { transfer: TransferDetail; action: 'cancel'; label: string }) {
  const { run, pending, fieldErrors, setFieldErrors, message } = useAction(transfer);
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const id = useId();
  if (!open) {
    return (
      <div>
        <Button variant="quiet" onClick={() => setOpen(true)}>
          {label}…
        </Button>
      </div>
    );
  }
  return (
    <Panel title={label}>
      <form
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          const parsed = reasonSchema.safeParse({ reason });
          if (!parsed.success) return setFieldErrors({ reason: parsed.error.issues[0].message });
          void run(action, parsed.data);
        }}
        className="flex flex-col gap-3"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor={id} className="text-sm font-medium text-ink-800">
            Reason
          </label>
          <textarea
            id={id}
            rows={2}
            value={reason}
            onChange={(e) => setReason(e.target.value)}
            aria-invalid={!!fieldErrors.reason}
            className="rounded-lg border border-paper-300 bg-white px-3 py-2 text-ink-950"
          />
          <FieldError id={`${id}-error`} message={fieldErrors.reason} />
        </div>
        <div className="flex gap-3">
          <Button type="submit" variant="secondary" disabled={pending}>
            {label}
          </Button>
          <Button variant="quiet" onClick={() => setOpen(false)}>
            Keep it
          </Button>
        </div>
        <ErrorLine message={message} />
      </form>
    </Panel>
  );
}

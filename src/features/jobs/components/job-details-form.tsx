import { useState, type FormEvent } from 'react';
import { addOpeningDays, formatCalendarDate } from '@shared/jobs/promised-date';
import type { JobDetail } from '@shared/jobs/dto';
import { INTAKE_ACCESSORIES, INTAKE_ACCESSORY_LABELS, type IntakeAccessory } from '@shared/jobs/schemas';
import { Button } from '@/components/ui/button';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { isApiError } from '@/lib/api-client';
import { jobApi, useJobMutation } from '../queries';

const WEEKDAYS = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

/** Assignment, skill, promise date (counted in the shop's opening days) and notes. */
export function JobDetailsForm({ detail }: { detail: JobDetail }) {
  const { job, shop, options } = detail;
  const [assignee, setAssignee] = useState(job.assignee?.id ?? '');
  const [skill, setSkill] = useState(job.requiredSkill?.id ?? '');
  const [promiseMode, setPromiseMode] = useState<'days' | 'date'>('days');
  const [days, setDays] = useState('');
  const [date, setDate] = useState(job.promisedOn ?? '');
  const [complaint, setComplaint] = useState(job.complaint);
  const [notes, setNotes] = useState(job.conditionNotes ?? '');
  const [accessories, setAccessories] = useState<IntakeAccessory[]>(job.accessories);
  const [accessoriesOther, setAccessoriesOther] = useState(job.accessoriesOther ?? '');
  const toggle = (a: IntakeAccessory) => setAccessories((now) => (now.includes(a) ? now.filter((x) => x !== a) : [...now, a]));
  const save = useJobMutation(job.id, (body: object) => jobApi.update(job.id, body));
  const errors = isApiError(save.error) ? save.error.fieldErrors : {};
  const disabled = !detail.can.update;

  const dayCount = /^\d{1,3}$/.test(days) ? Number(days) : null;
  // the same shared rule the server applies, so the preview is the date that will be saved
  let preview: string | null = null;
  let calendarProblem: string | null = null;
  try {
    preview = dayCount !== null ? addOpeningDays(new Date(), dayCount, shop) : null;
  } catch (err) {
    calendarProblem = err instanceof Error ? err.message : 'The shop’s calendar cannot be read.';
  }

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const body: Record<string, unknown> = {
      assignedUserId: assignee || null,
      requiredSkillId: skill || null,
      complaint,
      conditionNotes: notes || null,
      accessories,
      accessoriesOther: accessoriesOther.trim() || null,
    };
    if (promiseMode === 'days' && dayCount !== null) body.promiseInOpeningDays = dayCount;
    if (promiseMode === 'date' && date !== (job.promisedOn ?? '')) body.promisedOn = date || null;
    save.mutate(body, { onSuccess: () => setDays('') });
  };

  return (
    <form onSubmit={submit} className="flex flex-col gap-4" aria-label="Job details">
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Technician" error={errors.assignedUserId}>
          <select className={controlClasses} value={assignee} onChange={(e) => setAssignee(e.target.value)} disabled={disabled}>
            <option value="">Unassigned</option>
            {options.technicians.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Required skill" error={errors.requiredSkillId}>
          <select className={controlClasses} value={skill} onChange={(e) => setSkill(e.target.value)} disabled={disabled}>
            <option value="">None</option>
            {options.skills.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </Field>
      </div>

      <fieldset className="flex flex-col gap-3" disabled={disabled}>
        <legend className="text-sm font-semibold text-ink-800">
          Promise{job.promisedOn ? `: ${formatCalendarDate(job.promisedOn)}` : ': none yet'}
        </legend>
        <div className="flex gap-2">
          {(['days', 'date'] as const).map((mode) => (
            <label key={mode} className="flex min-h-11 items-center gap-2 rounded-lg border border-paper-300 px-3 text-sm has-[:checked]:border-accent-600 has-[:checked]:bg-accent-50">
              <input type="radio" name="promise-mode" checked={promiseMode === mode} onChange={() => setPromiseMode(mode)} className="accent-accent-600" />
              {mode === 'days' ? 'In opening days' : 'On a date'}
            </label>
          ))}
        </div>
        {promiseMode === 'days' ? (
          <Field
            label="Opening days from today"
            error={errors.promiseInOpeningDays ?? calendarProblem ?? undefined}
            hint={
              preview
                ? `Promise: ${formatCalendarDate(preview)}`
                : `Counts only the days ${shop.name} opens (${shop.openingDays.map((d) => WEEKDAYS[d - 1]).join(', ')}), skipping public holidays and the shop’s closing days.`
            }
          >
            <input inputMode="numeric" className={controlClasses} value={days} onChange={(e) => setDays(e.target.value)} placeholder="e.g. 5" />
          </Field>
        ) : (
          <Field label="Promise date" error={errors.promisedOn}>
            <input type="date" className={controlClasses} value={date} onChange={(e) => setDate(e.target.value)} />
          </Field>
        )}
      </fieldset>

      <Field label="Complaint" error={errors.complaint}>
        <textarea className={controlClasses} rows={2} value={complaint} onChange={(e) => setComplaint(e.target.value)} disabled={disabled} maxLength={4000} />
      </Field>
      <Field label="Condition and notes" error={errors.conditionNotes}>
        <textarea className={controlClasses} rows={3} value={notes} onChange={(e) => setNotes(e.target.value)} disabled={disabled} maxLength={4000} />
      </Field>
      <fieldset className="flex flex-col gap-2">
        <legend className="text-sm font-semibold text-ink-800">Came with the instrument</legend>
        <div className="flex flex-wrap gap-2">
          {INTAKE_ACCESSORIES.map((a) => (
            <label key={a} className="flex min-h-11 items-center gap-2 rounded-lg border border-paper-300 px-3 has-[:checked]:border-accent-600 has-[:checked]:bg-accent-50">
              <input type="checkbox" checked={accessories.includes(a)} onChange={() => toggle(a)} disabled={disabled} className="size-5 accent-accent-600" />
              {INTAKE_ACCESSORY_LABELS[a]}
            </label>
          ))}
        </div>
        {errors.accessories ? <p className="text-sm text-danger-700">{errors.accessories}</p> : null}
      </fieldset>
      <Field label="Anything else that came with it" error={errors.accessoriesOther}>
        <input className={controlClasses} value={accessoriesOther} onChange={(e) => setAccessoriesOther(e.target.value)} disabled={disabled} maxLength={500} />
      </Field>
      <FormError message={save.error && !Object.keys(errors).length ? (isApiError(save.error) ? save.error.message : 'Not saved. Try again.') : null} />
      {detail.can.update ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="submit" disabled={save.isPending}>
            {save.isPending ? 'Saving…' : 'Save details'}
          </Button>
          <a
            href={`/api/jobs/${job.id}/claim-ticket.pdf`}
            target="_blank"
            rel="noopener"
            className="font-medium text-accent-700 underline underline-offset-2"
          >
            Print claim ticket
          </a>
        </div>
      ) : null}
    </form>
  );
}

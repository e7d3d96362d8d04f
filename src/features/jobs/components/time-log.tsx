import { useState, type FormEvent } from 'react';
import type { JobDetail } from '@shared/jobs/dto';
import { Button } from '@/components/ui/button';
import { controlClasses, Field, FormError } from '@/components/ui/form-controls';
import { isApiError } from '@/lib/api-client';
import { jobApi, useJobMutation } from '../queries';
import { formatMinutes } from '../format';

/** Time at the bench, per technician, with a quick form for one's own entries. */
export function TimeLog({ detail }: { detail: JobDetail }) {
  const jobId = detail.job.id;
  const [minutes, setMinutes] = useState('');
  const [workedOn, setWorkedOn] = useState('');
  const [note, setNote] = useState('');
  const add = useJobMutation(jobId, (body: object) => jobApi.logTime(jobId, body));
  const remove = useJobMutation(jobId, (logId: string) => jobApi.removeTime(jobId, logId));
  const [typed, setTyped] = useState<string | null>(null);
  const errors: Record<string, string | undefined> = { ...(isApiError(add.error) ? add.error.fieldErrors : {}), ...(typed ? { minutes: typed } : {}) };

  const submit = (event: FormEvent) => {
    event.preventDefault();
    // the browser's own "match the requested format" says nothing useful: check here, in words
    if (!/^\s*\d+\s*$/.test(minutes)) {
      setTyped(/^\s*\d*[.,]\d*\s*$/.test(minutes) && /\d/.test(minutes) ? 'Whole minutes, please.' : 'Enter a number of minutes.');
      return;
    }
    setTyped(null);
    add.mutate(
      { minutes: Number(minutes), ...(workedOn ? { workedOn } : {}), ...(note.trim() ? { note } : {}) },
      {
        onSuccess: () => {
          setMinutes('');
          setNote('');
        },
      },
    );
  };

  return (
    <div className="flex flex-col gap-4">
      {detail.timeByTechnician.length ? (
        <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1 text-sm" aria-label="Time per technician">
          {detail.timeByTechnician.map((t) => (
            <div key={t.user.id} className="contents">
              <dt className="text-ink-800">{t.user.name}</dt>
              <dd className="text-right font-semibold tabular-nums">{formatMinutes(t.minutes)}</dd>
            </div>
          ))}
        </dl>
      ) : (
        <p className="text-ink-600">No time logged yet.</p>
      )}
      {detail.timeLogs.length ? (
        <ul className="divide-y divide-paper-200 text-sm" aria-label="Time entries">
          {detail.timeLogs.map((l) => (
            <li key={l.id} className="flex items-center justify-between gap-3 py-2">
              <span>
                <span className="font-semibold">{formatMinutes(l.minutes)}</span> · {l.user.name} · {l.workedOn}
                {l.note ? <span className="text-ink-600"> — {l.note}</span> : null}
              </span>
              {l.mine ? (
                <Button variant="quiet" onClick={() => remove.mutate(l.id)} disabled={remove.isPending}>
                  Remove<span className="sr-only"> this entry</span>
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      {detail.can.logTime ? (
        <form onSubmit={submit} noValidate className="grid gap-3 sm:grid-cols-[8rem_10rem_1fr_auto] sm:items-end" aria-label="Log time">
          <Field label="Minutes" error={errors.minutes}>
            <input inputMode="numeric" className={controlClasses} value={minutes} onChange={(e) => { setMinutes(e.target.value); setTyped(null); }} required />
          </Field>
          <Field label="Day" error={errors.workedOn}>
            <input type="date" className={controlClasses} value={workedOn} onChange={(e) => setWorkedOn(e.target.value)} />
          </Field>
          <Field label="Note" error={errors.note}>
            <input className={controlClasses} value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} />
          </Field>
          <Button type="submit" disabled={add.isPending || !minutes}>
            Log time
          </Button>
        </form>
      ) : null}
      <FormError message={(add.error && !Object.keys(errors).length) || remove.error ? 'Not saved. Try again.' : null} />
    </div>
  );
}

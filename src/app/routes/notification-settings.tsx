import { useId, useState, type FormEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { NOTIFICATION_KIND_LABELS, type NotificationKind } from '@shared/domain';
import { Button } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { FormError } from '@/components/ui/form-controls';
import { PageHeader } from '@/components/ui/page-header';
import { PageSpinner } from '@/components/ui/spinner';
import { preferencesQueryOptions, useSavePreferences } from '@/features/notifications/queries';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { useCurrentShop, withShop } from '../current-shop';

/** Per kind of notice: also by e-mail, or the inbox only. The inbox always gets every notice. */
export function NotificationSettingsRoute() {
  useDocumentTitle('E-mail settings');
  const { currentShop } = useCurrentShop();
  const prefs = useQuery(preferencesQueryOptions());
  const save = useSavePreferences();
  // only the person's own changes: unchanged kinds show what the server holds, and a refetch keeps the edits
  const [choices, setChoices] = useState<Partial<Record<NotificationKind, boolean>>>({});
  const [saved, setSaved] = useState(false);
  const formId = useId();

  const changed = !!prefs.data && prefs.data.preferences.some((p) => choices[p.kind] !== undefined && choices[p.kind] !== p.email);

  const onSubmit = (event: FormEvent) => {
    event.preventDefault();
    if (!prefs.data) return;
    setSaved(false);
    save.mutate(
      prefs.data.preferences.map((p) => ({ kind: p.kind, email: choices[p.kind] ?? p.email })),
      { onSuccess: () => setSaved(true) },
    );
  };

  return (
    <>
      <PageHeader
        title="E-mail settings"
        description="Every notice lands in your inbox. Choose which kinds also reach you by e-mail."
        actions={
          <Link className="inline-flex min-h-11 items-center text-sm font-semibold text-accent-700 underline underline-offset-4" to={withShop('/inbox', currentShop?.id)}>
            Back to the inbox
          </Link>
        }
      />
      {prefs.isPending ? (
        <PageSpinner label="Loading your settings…" />
      ) : prefs.isError ? (
        <ErrorState title="Your settings could not be loaded" error={prefs.error} onRetry={() => void prefs.refetch()} retrying={prefs.isFetching} />
      ) : (
        <form onSubmit={onSubmit} className="flex max-w-2xl flex-col gap-5" aria-describedby={`${formId}-to`}>
          <p id={`${formId}-to`} className="text-ink-800">
            E-mails go to <strong className="break-all">{prefs.data.email}</strong>.
          </p>
          <fieldset className="flex flex-col gap-2 rounded-xl border border-paper-200 bg-white p-4">
            <legend className="px-1 text-sm font-semibold text-ink-800">Also send by e-mail</legend>
            {prefs.data.preferences.map((p) => {
              const id = `${formId}-${p.kind}`;
              return (
                <div key={p.kind} className="flex items-start gap-3 rounded-lg px-1 py-2">
                  <input
                    id={id}
                    type="checkbox"
                    className="mt-0.5 size-6 shrink-0 accent-accent-600"
                    checked={choices[p.kind] ?? p.email}
                    onChange={(e) => {
                      setSaved(false);
                      setChoices((c) => ({ ...c, [p.kind]: e.target.checked }));
                    }}
                    aria-describedby={`${id}-hint`}
                  />
                  <label htmlFor={id} className="flex flex-col">
                    <span className="font-semibold text-ink-950">{NOTIFICATION_KIND_LABELS[p.kind].label}</span>
                    <span id={`${id}-hint`} className="text-sm text-ink-600">
                      {NOTIFICATION_KIND_LABELS[p.kind].description}
                      {p.chosen ? '' : ` (${p.defaultEmail ? 'e-mailed' : 'inbox only'} unless you choose otherwise)`}
                    </span>
                  </label>
                </div>
              );
            })}
          </fieldset>
          <FormError message={save.error ? (isApiError(save.error) ? save.error.message : 'Your settings were not saved. Try again.') : null} />
          <div className="flex flex-wrap items-center gap-4">
            <Button type="submit" disabled={save.isPending || !changed}>
              {save.isPending ? 'Saving…' : 'Save settings'}
            </Button>
            <p role="status" aria-live="polite" className="text-sm font-medium text-accent-800">
              {saved && !changed ? 'Saved.' : ''}
            </p>
          </div>
        </form>
      )}
    </>
  );
}

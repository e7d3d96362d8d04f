import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { FormMessage } from '@/components/ui/form-field';
import { errorMessage } from '@/lib/form-errors';
import { formatDateTime } from '../format';
import { useSetActive } from '../queries';
import type { Person } from '../types';

/** Deactivate (sign-in refused, sessions ended at once) or reactivate, with one confirming step. */
export function PersonStatus({ person, isSelf }: { person: Person; isSelf: boolean }) {
  const setActive = useSetActive(person.id);
  const [confirming, setConfirming] = useState(false);
  const [error, setError] = useState<string | null>(null);

  return (
    <Card as="section" aria-labelledby="status-heading" className="flex flex-col gap-4">
      <CardTitle id="status-heading">Access</CardTitle>
      <p className="text-ink-800">
        {person.active
          ? `${person.name} can sign in${person.lastSignInAt ? `; last signed in ${formatDateTime(person.lastSignInAt)}` : ' (not signed in yet)'}.`
          : `Deactivated${person.deactivatedAt ? ` on ${formatDateTime(person.deactivatedAt)}` : ''}: ${person.name} cannot sign in.`}
      </p>
      {error ? <FormMessage tone="error">{error}</FormMessage> : null}
      {person.active ? (
        isSelf ? (
          <p className="text-sm text-ink-600">You cannot deactivate yourself; another owner can.</p>
        ) : confirming ? (
          <div className="flex flex-col gap-3 rounded-xl border border-danger-200 bg-danger-50 p-4">
            <p className="text-ink-950">
              Deactivate {person.name}? Every session they have ends at once; their roles stay for when they come back.
            </p>
            <div className="flex flex-wrap gap-2">
              <Button
                className="bg-danger-700 hover:bg-danger-700"
                disabled={setActive.isPending}
                onClick={() => setActive.mutate(false, { onSuccess: () => setConfirming(false), onError: (e) => setError(errorMessage(e)) })}
              >
                {setActive.isPending ? 'Deactivating…' : `Deactivate ${person.name}`}
              </Button>
              <Button variant="secondary" onClick={() => setConfirming(false)}>
                Keep access
              </Button>
            </div>
          </div>
        ) : (
          <div>
            <Button variant="secondary" onClick={() => { setError(null); setConfirming(true); }}>
              Deactivate…
            </Button>
          </div>
        )
      ) : (
        <div>
          <Button disabled={setActive.isPending} onClick={() => setActive.mutate(true, { onError: (e) => setError(errorMessage(e)) })}>
            {setActive.isPending ? 'Reactivating…' : 'Reactivate'}
          </Button>
        </div>
      )}
    </Card>
  );
}

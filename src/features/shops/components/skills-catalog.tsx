import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { skillInputSchema } from '@shared/schemas/shops';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { ErrorState } from '@/components/ui/error-state';
import { Field, FormMessage, TextInput } from '@/components/ui/form-field';
import { Spinner } from '@/components/ui/spinner';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useCreateSkill } from '../mutations';
import { skillsQueryOptions } from '../queries';

/** The network's skills (what a job can require and a technician can bring to the bench). */
export function SkillsCatalog() {
  const skills = useQuery(skillsQueryOptions());
  const create = useCreateSkill();
  const [name, setName] = useState('');
  const [code, setCode] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);

  function submit(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    const suggested = code || name.toLowerCase().replace(/[^a-z0-9]+/g, '_').replace(/^_|_$/g, '');
    const parsed = skillInputSchema.safeParse({ name, code: suggested });
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: (r) => {
        setMessage({ tone: 'success', text: `Added ${r.skill.name}.` });
        setName('');
        setCode('');
      },
      onError: (e) => {
        setErrors(serverFieldErrors(e));
        setMessage({ tone: 'error', text: errorMessage(e) });
      },
    });
  }

  return (
    <Card as="section" aria-labelledby="skills-heading" className="flex flex-col gap-4">
      <CardTitle id="skills-heading">Skills</CardTitle>
      {skills.isPending ? (
        <Spinner label="Loading skills…" showLabel />
      ) : skills.isError ? (
        <ErrorState title="Skills could not be loaded" error={skills.error} onRetry={() => void skills.refetch()} />
      ) : skills.data.length === 0 ? (
        <p className="text-ink-600">No skills yet.</p>
      ) : (
        <ul className="flex flex-wrap gap-2">
          {skills.data.map((s) => (
            <li key={s.id} className="rounded-full border border-paper-300 bg-paper-50 px-3 py-1 text-sm text-ink-800">
              {s.name} <span className="text-ink-600">({s.code})</span>
            </li>
          ))}
        </ul>
      )}
      <form onSubmit={submit} noValidate className="grid grid-cols-1 items-end gap-3 border-t border-paper-200 pt-4 sm:grid-cols-[2fr_1fr_auto]">
        <Field label="New skill" error={errors.name}>
          <TextInput value={name} onChange={(e) => setName(e.target.value)} placeholder="e.g. Vintage flutes" />
        </Field>
        <Field label="Code" hint="Optional" error={errors.code}>
          <TextInput value={code} onChange={(e) => setCode(e.target.value)} placeholder="vintage_flutes" />
        </Field>
        <Button type="submit" disabled={create.isPending}>
          Add skill
        </Button>
      </form>
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
    </Card>
  );
}

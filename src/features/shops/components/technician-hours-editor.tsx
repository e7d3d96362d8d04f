import { useState, type FormEvent } from 'react';
import { technicianSkillsSchema } from '@shared/schemas/shops';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { FormMessage, TextInput } from '@/components/ui/form-field';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, zodFieldErrors } from '@/lib/form-errors';
import { useSetTechnicianSkills } from '../mutations';
import type { ShopDetail, Skill } from '../queries';

type Technician = ShopDetail['technicians'][number];

function TechnicianRow({ shopId, technician, skills }: { shopId: string; technician: Technician; skills: Skill[] }) {
  const save = useSetTechnicianSkills(shopId);
  const [hours, setHours] = useState<Record<string, string>>(() =>
    Object.fromEntries(technician.skills.map((s) => [s.skillId, String(s.weeklyHours)])),
  );
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const chosen = skills.filter((s) => (hours[s.id] ?? '').trim() !== '');

  function submit(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    const parsed = technicianSkillsSchema.safeParse({
      userId: technician.userId,
      skills: chosen.map((s) => ({ skillId: s.id, weeklyHours: Number(hours[s.id]) })),
    });
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    save.mutate(parsed.data, {
      onSuccess: () => setMessage({ tone: 'success', text: `Saved ${technician.name}’s hours.` }),
      onError: (e) => setMessage({ tone: 'error', text: errorMessage(e) }),
    });
  }

  return (
    <li className="py-4">
      <form onSubmit={submit} noValidate aria-label={`Skills of ${technician.name}`} className="flex flex-col gap-3">
        <p className="font-semibold text-ink-950">
          {technician.name}
          {!technician.active ? <span className="ml-2 text-sm font-normal text-ink-600">(deactivated)</span> : null}
        </p>
        <div className="grid grid-cols-1 gap-2 sm:grid-cols-2">
          {skills.map((skill) => {
            const index = chosen.findIndex((s) => s.id === skill.id);
            const error = index >= 0 ? errors[`skills.${index}.weeklyHours`] : undefined;
            const id = `tech-${technician.userId}-${skill.id}`;
            return (
              <div key={skill.id} className="grid grid-cols-[1fr_6rem] items-center gap-2">
                <label htmlFor={id} className="text-sm text-ink-800">
                  {skill.name} (h/week)
                </label>
                <TextInput id={id} inputMode="decimal" placeholder="—" value={hours[skill.id] ?? ''} aria-invalid={error ? true : undefined}
                  onChange={(e) => setHours({ ...hours, [skill.id]: e.target.value })} />
                {error ? <p className="col-span-2 text-sm font-medium text-danger-700">{error}</p> : null}
              </div>
            );
          })}
        </div>
        {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
        <div>
          <Button type="submit" variant="secondary" disabled={save.isPending}>
            {save.isPending ? 'Saving…' : `Save ${technician.name}’s hours`}
          </Button>
        </div>
      </form>
    </li>
  );
}

/** Each technician's skills at this shop and the hours a week they give them. */
export function TechnicianHoursEditor({ shop, skills }: { shop: ShopDetail; skills: Skill[] }) {
  return (
    <Card as="section" aria-labelledby="tech-heading">
      <CardTitle id="tech-heading">Technicians</CardTitle>
      {shop.technicians.length === 0 ? (
        <p className="mt-3 text-ink-600">Nobody holds the technician role here yet. Give the role on the People page.</p>
      ) : skills.length === 0 ? (
        <p className="mt-3 text-ink-600">Add the network’s skills first.</p>
      ) : (
        <ul className="mt-2 flex flex-col divide-y divide-paper-200">
          {shop.technicians.map((t) => (
            <TechnicianRow key={t.userId} shopId={shop.id} technician={t} skills={skills} />
          ))}
        </ul>
      )}
    </Card>
  );
}

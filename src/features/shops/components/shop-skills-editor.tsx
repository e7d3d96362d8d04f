import { useState, type FormEvent } from 'react';
import { shopSkillsSchema } from '@shared/schemas/shops';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { FormMessage, TextInput } from '@/components/ui/form-field';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useSetShopSkills } from '../mutations';
import type { ShopDetail, Skill } from '../queries';

/**
 * Which skills a shop offers and the bench hours a week it gives each: routing ranks shops by this
 * capacity. An empty hours box means the shop does not offer the skill.
 */
export function ShopSkillsEditor({ shop, skills }: { shop: ShopDetail; skills: Skill[] }) {
  const save = useSetShopSkills(shop.id);
  const [hours, setHours] = useState<Record<string, string>>(() =>
    Object.fromEntries(shop.skills.map((s) => [s.skillId, String(s.weeklyBenchHours)])),
  );
  const [errors, setErrors] = useState<FieldErrors>({});
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const offered = skills.filter((s) => (hours[s.id] ?? '').trim() !== '');

  function submit(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    const input = { skills: offered.map((s) => ({ skillId: s.id, weeklyBenchHours: Number(hours[s.id]) })) };
    const parsed = shopSkillsSchema.safeParse(input);
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    save.mutate(parsed.data, {
      onSuccess: () => setMessage({ tone: 'success', text: 'Skills saved.' }),
      onError: (e) => {
        setErrors(serverFieldErrors(e));
        setMessage({ tone: 'error', text: errorMessage(e) });
      },
    });
  }

  return (
    <Card as="section" aria-labelledby="shop-skills-heading">
      <CardTitle id="shop-skills-heading">Skills and bench hours</CardTitle>
      <p className="mt-1 text-sm text-ink-600">Hours a week this shop gives each skill. Leave empty for a skill it does not offer.</p>
      {skills.length === 0 ? (
        <p className="mt-4 text-ink-600">The network has no skills yet; add them on the Shops page.</p>
      ) : (
        <form onSubmit={submit} noValidate className="mt-4 flex flex-col gap-4">
          <ul className="flex flex-col divide-y divide-paper-200">
            {skills.map((skill) => {
              const index = offered.findIndex((s) => s.id === skill.id);
              const error = index >= 0 ? errors[`skills.${index}.weeklyBenchHours`] : undefined;
              return (
                <li key={skill.id} className="grid grid-cols-[1fr_8rem] items-center gap-3 py-2">
                  <label htmlFor={`bench-${skill.id}`} className="text-ink-950">
                    {skill.name}
                  </label>
                  <TextInput
                    id={`bench-${skill.id}`}
                    inputMode="decimal"
                    placeholder="—"
                    value={hours[skill.id] ?? ''}
                    aria-invalid={error ? true : undefined}
                    onChange={(e) => setHours({ ...hours, [skill.id]: e.target.value })}
                  />
                  {error ? <p className="col-span-2 text-sm font-medium text-danger-700">{error}</p> : null}
                </li>
              );
            })}
          </ul>
          {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
          <div>
            <Button type="submit" disabled={save.isPending}>
              {save.isPending ? 'Saving…' : 'Save skills'}
            </Button>
          </div>
        </form>
      )}
    </Card>
  );
}

import { useState, type FormEvent } from 'react';
import { ROLE_LABELS } from '@shared/domain';
import { roleAssignmentSchema, SHOP_ROLES } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Card, CardTitle } from '@/components/ui/card';
import { Field, FormMessage, SelectInput } from '@/components/ui/form-field';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useAssignRole, useChangeRole, useRemoveRole } from '../queries';
import type { Person } from '../types';

type ShopRole = (typeof SHOP_ROLES)[number];
const NETWORK = 'network';

/** A person's role at each shop: change it, remove it, or give one at another shop. */
export function PersonRoles({ person, shops }: { person: Person; shops: Array<{ id: string; name: string }> }) {
  const change = useChangeRole();
  const remove = useRemoveRole();
  const assign = useAssignRole(person.id);
  const [message, setMessage] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const [shopId, setShopId] = useState('');
  const [role, setRole] = useState<ShopRole>('technician');
  const [errors, setErrors] = useState<FieldErrors>({});

  const held = new Set(person.memberships.map((m) => m.shopId ?? NETWORK));
  const freeShops = shops.filter((s) => !held.has(s.id));
  const fail = (error: unknown) => setMessage({ tone: 'error', text: errorMessage(error) });

  function give(event: FormEvent) {
    event.preventDefault();
    setMessage(null);
    const input = shopId === NETWORK ? { shopId: null, role: 'owner' } : { shopId: shopId || undefined, role };
    const parsed = roleAssignmentSchema.safeParse(input);
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    assign.mutate(parsed.data, {
      onSuccess: () => {
        const where = shopId === NETWORK ? 'the whole network' : shops.find((s) => s.id === shopId)?.name;
        setMessage({ tone: 'success', text: `${person.name} is now ${ROLE_LABELS[parsed.data.role]} at ${where}.` });
        setShopId('');
      },
      onError: (error) => {
        setErrors(serverFieldErrors(error));
        fail(error);
      },
    });
  }

  return (
    <Card as="section" aria-labelledby="roles-heading" className="flex flex-col gap-5">
      <CardTitle id="roles-heading">Roles</CardTitle>
      {message ? <FormMessage tone={message.tone}>{message.text}</FormMessage> : null}
      {person.memberships.length === 0 ? (
        <p className="text-ink-600">No role yet: {person.name} cannot see any shop.</p>
      ) : (
        <ul className="flex flex-col divide-y divide-paper-200">
          {person.memberships.map((m) => {
            const where = m.shopName ?? 'Whole network';
            return (
              <li key={m.id} className="grid grid-cols-1 items-end gap-3 py-3 sm:grid-cols-[1fr_1fr_auto]">
                <p className="font-semibold text-ink-950 sm:self-center">{where}</p>
                {m.role === 'owner' ? (
                  <p className="text-ink-800 sm:self-center">Owner</p>
                ) : (
                  <Field label={<span className="sr-only sm:not-sr-only">Role at {where}</span>}>
                    <SelectInput
                      value={m.role}
                      disabled={change.isPending}
                      aria-label={`Role at ${where}`}
                      onChange={(e) => {
                        // read now: the controlled select shows the stored role again until the refetch lands
                        const next = e.target.value as ShopRole;
                        change.mutate(
                          { membershipId: m.id, role: next },
                          {
                            onSuccess: () => setMessage({ tone: 'success', text: `Role at ${where} changed to ${ROLE_LABELS[next]}.` }),
                            onError: fail,
                          },
                        );
                      }}
                    >
                      {SHOP_ROLES.map((r) => (
                        <option key={r} value={r}>
                          {ROLE_LABELS[r]}
                        </option>
                      ))}
                    </SelectInput>
                  </Field>
                )}
                <Button
                  variant="quiet"
                  disabled={remove.isPending}
                  onClick={() =>
                    remove.mutate(m.id, {
                      onSuccess: () => setMessage({ tone: 'success', text: `Removed the ${ROLE_LABELS[m.role]} role at ${where}.` }),
                      onError: fail,
                    })
                  }
                >
                  Remove<span className="sr-only"> the role at {where}</span>
                </Button>
              </li>
            );
          })}
        </ul>
      )}

      <form onSubmit={give} noValidate className="grid grid-cols-1 items-end gap-3 border-t border-paper-200 pt-5 sm:grid-cols-[1fr_1fr_auto]">
        <Field label="Give a role at" error={errors.shopId}>
          <SelectInput value={shopId} onChange={(e) => setShopId(e.target.value)}>
            <option value="">Choose a shop</option>
            {freeShops.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
            {!held.has(NETWORK) ? <option value={NETWORK}>Whole network (owner)</option> : null}
          </SelectInput>
        </Field>
        <Field label="Role" error={errors.role}>
          <SelectInput value={shopId === NETWORK ? 'owner' : role} disabled={shopId === NETWORK} onChange={(e) => setRole(e.target.value as ShopRole)}>
            {shopId === NETWORK ? <option value="owner">Owner</option> : null}
            {SHOP_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </SelectInput>
        </Field>
        <Button type="submit" disabled={assign.isPending}>
          {assign.isPending ? 'Saving…' : 'Give role'}
        </Button>
      </form>
    </Card>
  );
}

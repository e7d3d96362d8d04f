import { useState, type FormEvent } from 'react';
import { ROLE_LABELS } from '@shared/domain';
import { invitationCreateSchema, SHOP_ROLES, type RoleAssignment } from '@shared/schemas/people';
import { Button } from '@/components/ui/button';
import { Field, FormMessage, SelectInput, TextInput } from '@/components/ui/form-field';
import type { FieldErrors } from '@/lib/api-client';
import { errorMessage, serverFieldErrors, zodFieldErrors } from '@/lib/form-errors';
import { useInvite } from '../queries';

interface ShopOption {
  id: string;
  name: string;
}

type ShopRole = (typeof SHOP_ROLES)[number];
interface Row {
  key: number;
  shopId: string;
  role: ShopRole;
}

let rowKey = 0;

/** Invite by e-mail with a role per shop (and, if wanted, the network-wide owner role). */
export function InviteForm({ shops, onInvited }: { shops: ShopOption[]; onInvited?: (email: string) => void }) {
  const [email, setEmail] = useState('');
  const [rows, setRows] = useState<Row[]>(() => [{ key: rowKey++, shopId: shops[0]?.id ?? '', role: 'technician' }]);
  const [owner, setOwner] = useState(false);
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState<{ tone: 'success' | 'error'; text: string } | null>(null);
  const invite = useInvite();

  const roles = (): RoleAssignment[] => [
    ...(owner ? [{ shopId: null, role: 'owner' as const }] : []),
    ...rows.filter((r) => r.shopId).map((r) => ({ shopId: r.shopId, role: r.role })),
  ];
  // field errors name roles by their position in the list sent, which starts with the owner role when ticked
  const rowError = (index: number, field: 'shopId' | 'role') => errors[`roles.${index + (owner ? 1 : 0)}.${field}`];

  function submit(event: FormEvent) {
    event.preventDefault();
    setDone(null);
    const parsed = invitationCreateSchema.safeParse({ email, roles: roles() });
    if (!parsed.success) {
      setErrors(zodFieldErrors(parsed.error));
      return;
    }
    setErrors({});
    invite.mutate(parsed.data, {
      onSuccess: (result) => {
        setDone(
          result.mailed
            ? { tone: 'success', text: `Invitation sent to ${parsed.data.email}. The link works for 7 days.` }
            : { tone: 'error', text: `The invitation is saved, but the e-mail to ${parsed.data.email} could not be sent. Try “Send again”.` },
        );
        setEmail('');
        onInvited?.(parsed.data.email);
      },
      onError: (error) => {
        setErrors(serverFieldErrors(error));
        setDone({ tone: 'error', text: errorMessage(error) });
      },
    });
  }

  const usedShops = new Set(rows.map((r) => r.shopId));

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-5">
      <Field label="E-mail address" error={errors.email} hint="They sign in with this address to accept.">
        <TextInput type="email" autoComplete="off" value={email} onChange={(e) => setEmail(e.target.value)} required />
      </Field>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-sm font-semibold text-ink-950">Roles per shop</legend>
        {rows.map((row, index) => (
          <div key={row.key} className="grid grid-cols-1 items-end gap-3 rounded-xl border border-paper-200 p-3 sm:grid-cols-[1fr_1fr_auto]">
            <Field label={`Shop ${index + 1}`} error={rowError(index, 'shopId')}>
              <SelectInput value={row.shopId} onChange={(e) => setRows(rows.map((r) => (r.key === row.key ? { ...r, shopId: e.target.value } : r)))}>
                <option value="">Choose a shop</option>
                {shops.map((shop) => (
                  <option key={shop.id} value={shop.id} disabled={shop.id !== row.shopId && usedShops.has(shop.id)}>
                    {shop.name}
                  </option>
                ))}
              </SelectInput>
            </Field>
            <Field label={`Role at shop ${index + 1}`} error={rowError(index, 'role')}>
              <SelectInput value={row.role} onChange={(e) => setRows(rows.map((r) => (r.key === row.key ? { ...r, role: e.target.value as ShopRole } : r)))}>
                {SHOP_ROLES.map((role) => (
                  <option key={role} value={role}>
                    {ROLE_LABELS[role]}
                  </option>
                ))}
              </SelectInput>
            </Field>
            <Button variant="quiet" onClick={() => setRows(rows.filter((r) => r.key !== row.key))} disabled={rows.length === 1 && !owner}>
              Remove<span className="sr-only"> shop {index + 1}</span>
            </Button>
          </div>
        ))}
        <div>
          <Button
            variant="secondary"
            onClick={() => setRows([...rows, { key: rowKey++, shopId: shops.find((s) => !usedShops.has(s.id))?.id ?? '', role: 'technician' }])}
            disabled={rows.length >= shops.length}
          >
            Add another shop
          </Button>
        </div>
        <label className="flex min-h-11 items-center gap-3 text-sm text-ink-800">
          <input type="checkbox" className="size-5 accent-accent-600" checked={owner} onChange={(e) => setOwner(e.target.checked)} />
          Also make them an owner of the whole network (shops, people, prices, every report)
        </label>
        {errors.roles ? <p className="text-sm font-medium text-danger-700">{errors.roles}</p> : null}
      </fieldset>

      {done ? <FormMessage tone={done.tone}>{done.text}</FormMessage> : null}
      <div>
        <Button type="submit" disabled={invite.isPending}>
          {invite.isPending ? 'Sending…' : 'Send invitation'}
        </Button>
      </div>
    </form>
  );
}

import { Card, CardTitle } from '@/components/ui/card';
import { roleLabels, type Membership, type Role } from '../types';

const roleDuties: Record<Role, string> = {
  owner: 'Opens shops, invites people and gives each a role per shop, sets the service catalog, prices and pad rules.',
  regional_manager: 'Balances work across a set of shops, approves transfers, watches overdue jobs and turnaround.',
  front_desk: 'Registers instruments by serial number, opens jobs and estimates, tells customers when work is ready.',
  technician: 'Works the bench: takes jobs, records pad maps, logs time and parts, signs off leak tests.',
  auditor: 'Reads what their shops hold and changes nothing.',
};

/** What each role is for, and which roles the signed-in person holds where. */
export function RoleOverview({ memberships }: { memberships: Membership[] }) {
  return (
    <div className="grid grid-cols-1 gap-6 lg:grid-cols-[2fr_3fr]">
      <Card as="section" aria-labelledby="your-roles">
        <CardTitle id="your-roles">Your roles</CardTitle>
        {memberships.length === 0 ? (
          <p className="mt-3 text-ink-600">You hold no role yet.</p>
        ) : (
          <ul className="mt-4 flex flex-col divide-y divide-paper-200">
            {memberships.map((membership, index) => (
              <li key={`${membership.shopId ?? 'network'}-${membership.role}-${index}`} className="flex justify-between gap-4 py-3">
                <span className="text-ink-800">{membership.shopName ?? 'Every shop'}</span>
                <span className="font-semibold text-ink-950">{roleLabels[membership.role]}</span>
              </li>
            ))}
          </ul>
        )}
      </Card>
      <Card as="section" aria-labelledby="roles-guide">
        <CardTitle id="roles-guide">Roles in a shop</CardTitle>
        <p className="mt-2 text-ink-600">
          Roles are given per shop: the same person can be a technician at one shop and front desk at another.
        </p>
        <dl className="mt-4 flex flex-col gap-4">
          {(Object.keys(roleDuties) as Role[]).map((role) => (
            <div key={role}>
              <dt className="font-semibold text-ink-950">{roleLabels[role]}</dt>
              <dd className="text-ink-800">{roleDuties[role]}</dd>
            </div>
          ))}
        </dl>
      </Card>
    </div>
  );
}

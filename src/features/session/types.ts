import type { AppRawRule } from '@/lib/ability';

export type Role = 'owner' | 'regional_manager' | 'front_desk' | 'technician' | 'auditor';

export interface SessionShop {
  id: string;
  name: string;
  city: string;
  timeZone: string;
}

export interface Membership {
  shopId: string | null;
  shopName: string | null;
  role: Role;
}

/** The body of `GET /api/me`. */
export interface Me {
  user: { id: string; email: string; name: string };
  network: { id: string; name: string };
  memberships: Membership[];
  /** The shops this person may act in; an owner gets every shop of the network. */
  shops: SessionShop[];
  rules: AppRawRule[];
}

export const roleLabels: Record<Role, string> = {
  owner: 'Owner',
  regional_manager: 'Regional manager',
  front_desk: 'Front desk',
  technician: 'Technician',
  auditor: 'Auditor',
};

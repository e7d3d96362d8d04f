import type { ReactNode } from 'react';
import { useAppAbility } from '@/lib/ability';
import { NotFoundRoute } from './not-found';

interface RequireAbilityProps {
  action: string;
  subject: string;
  children: ReactNode;
}

/**
 * Hides a screen from people whose rules do not allow it. It answers like a missing page rather than
 * "forbidden" so the client does not advertise screens; the server enforces the rules either way.
 */
export function RequireAbility({ action, subject, children }: RequireAbilityProps) {
  const ability = useAppAbility();
  if (!ability.can(action, subject)) return <NotFoundRoute />;
  return <>{children}</>;
}

import { createContext, useContext, type ReactNode } from 'react';
import type { Me } from '@/features/session/types';

const SessionContext = createContext<Me | null>(null);

export function SessionProvider({ me, children }: { me: Me; children: ReactNode }) {
  return <SessionContext.Provider value={me}>{children}</SessionContext.Provider>;
}

/** The signed-in person, their network and shops. Only usable below the session gate. */
export function useSession(): Me {
  const me = useContext(SessionContext);
  if (!me) throw new Error('useSession must be used below the session gate');
  return me;
}

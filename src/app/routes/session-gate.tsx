import { useQuery } from '@tanstack/react-query';
import { useMemo } from 'react';
import { Outlet, useLocation } from 'react-router-dom';
import { ErrorState } from '@/components/ui/error-state';
import { PageSpinner } from '@/components/ui/spinner';
import { NoAccessPanel } from '@/features/session/components/no-access-panel';
import { SignInPanel } from '@/features/session/components/sign-in-panel';
import { meQueryOptions } from '@/features/session/queries';
import { AbilityContext, buildAbility } from '@/lib/ability';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { CurrentShopProvider } from '../current-shop';
import { PublicLayout } from '../layout/public-layout';
import { SessionProvider } from '../session-context';

/**
 * Everything below needs a signed-in member. `/api/me` decides which screen a visitor gets:
 * 401 the sign-in screen (coming back to this address afterwards), 403 `no_access` the no-access
 * screen, 200 the app with the person's ability and shops.
 */
export function SessionGate() {
  const me = useQuery(meQueryOptions());
  const location = useLocation();
  const ability = useMemo(() => buildAbility(me.data?.rules ?? []), [me.data]);

  if (me.isPending) {
    return (
      <PublicLayout>
        <PageSpinner label="Checking who is signed in…" />
      </PublicLayout>
    );
  }

  if (me.isError) {
    const error = me.error;
    if (isApiError(error) && error.status === 401) {
      return <SignInScreen returnTo={location.pathname + location.search} />;
    }
    if (isApiError(error) && error.status === 403 && error.code === 'no_access') {
      return <NoAccessScreen email={typeof error.details.email === 'string' ? error.details.email : undefined} />;
    }
    return (
      <PublicLayout>
        <ErrorState
          title="Benchrelay could not start"
          error={error}
          onRetry={() => void me.refetch()}
          retrying={me.isFetching}
        />
      </PublicLayout>
    );
  }

  return (
    <SessionProvider me={me.data}>
      <AbilityContext ability={ability}>
        <CurrentShopProvider shops={me.data.shops} ownShopIds={me.data.memberships.map((m) => m.shopId).filter((id): id is string => !!id)}>
          <Outlet />
        </CurrentShopProvider>
      </AbilityContext>
    </SessionProvider>
  );
}

export function SignInScreen({ returnTo, problem }: { returnTo?: string; problem?: string | null }) {
  useDocumentTitle('Sign in');
  return (
    <PublicLayout>
      <SignInPanel returnTo={returnTo} problem={problem} />
    </PublicLayout>
  );
}

export function NoAccessScreen({ email }: { email?: string }) {
  useDocumentTitle('No access yet');
  return (
    <PublicLayout>
      <NoAccessPanel email={email} />
    </PublicLayout>
  );
}

import { useQuery } from '@tanstack/react-query';
import { Navigate, useSearchParams } from 'react-router-dom';
import { PageSpinner } from '@/components/ui/spinner';
import { meQueryOptions, safeReturnTo } from '@/features/session/queries';
import { isApiError } from '@/lib/api-client';
import { PublicLayout } from '../layout/public-layout';
import { SignInScreen } from './session-gate';

/**
 * `/sign-in`: where sign-out lands, and where a sign-in the server refused lands with `?error=…`
 * (shown in plain words). Someone who is already signed in is sent on instead.
 */
export function SignInRoute() {
  const [searchParams] = useSearchParams();
  const returnTo = safeReturnTo(searchParams.get('returnTo'));
  const problem = searchParams.get('error');
  const me = useQuery(meQueryOptions());

  if (me.isPending) {
    return (
      <PublicLayout>
        <PageSpinner />
      </PublicLayout>
    );
  }

  const signedIn = me.isSuccess || (isApiError(me.error) && me.error.code === 'no_access');
  if (signedIn) return <Navigate to={returnTo ?? '/'} replace />;

  return <SignInScreen returnTo={returnTo} problem={problem} />;
}

import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import { ButtonAnchor, ButtonLink } from '@/components/ui/button';
import { ErrorState } from '@/components/ui/error-state';
import { PageSpinner } from '@/components/ui/spinner';
import { InvitationSummary } from '@/features/people/components/invitation-summary';
import { invitationStatusLabels } from '@/features/people/format';
import { invitationPreviewQueryOptions, useAcceptInvitation } from '@/features/people/queries';
import { SignOutButton } from '@/features/session/components/sign-out-button';
import { meQueryOptions, signInHref } from '@/features/session/queries';
import { isApiError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/use-document-title';
import { PublicLayout } from '../layout/public-layout';

const acceptPath = (token: string) => `/invitations/${token}/accept`;

/**
 * `/invitations/:token`, the page an invitation e-mail links to. Public: the person has no role yet.
 * It says what the invitation offers and sends them through sign-in, which comes back to accept it.
 */
export function InvitationRoute() {
  const { token = '' } = useParams();
  useDocumentTitle('Invitation');
  const preview = useQuery(invitationPreviewQueryOptions(token));

  return (
    <PublicLayout>
      {preview.isPending ? (
        <PageSpinner label="Opening the invitation…" />
      ) : preview.isError ? (
        <ErrorState
          title="This invitation cannot be opened"
          error={preview.error}
          onRetry={isApiError(preview.error) && preview.error.status === 404 ? undefined : () => void preview.refetch()}
        />
      ) : (
        <div className="flex flex-col gap-6">
          <InvitationSummary invitation={preview.data} />
          {preview.data.status === 'pending' ? (
            <ButtonAnchor href={signInHref(acceptPath(token))} size="lg">
              Sign in to accept
            </ButtonAnchor>
          ) : (
            <div role="alert" className="rounded-xl border border-danger-200 bg-danger-50 p-4 text-ink-950">
              <p className="font-semibold">{invitationStatusLabels[preview.data.status]}</p>
              <p>
                {preview.data.status === 'accepted'
                  ? 'This invitation was already used. Sign in to reach your shops.'
                  : 'This link no longer works. Ask the network’s owner for a new invitation.'}
              </p>
              {preview.data.status === 'accepted' ? (
                <ButtonAnchor href={signInHref('/')} variant="secondary" className="mt-3">
                  Sign in
                </ButtonAnchor>
              ) : null}
            </div>
          )}
        </div>
      )}
    </PublicLayout>
  );
}

/**
 * `/invitations/:token/accept`, where sign-in returns to. Accepts once (a ref guards against the
 * effect running twice), then opens the app as the new member.
 */
export function AcceptInvitationRoute() {
  const { token = '' } = useParams();
  useDocumentTitle('Accepting the invitation');
  const accept = useAcceptInvitation();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const sent = useRef(false);

  useEffect(() => {
    if (sent.current) return;
    sent.current = true;
    accept.mutate(token, {
      onSuccess: () => {
        void queryClient.invalidateQueries({ queryKey: meQueryOptions().queryKey });
        void navigate('/', { replace: true });
      },
    });
  }, [accept, navigate, queryClient, token]);

  if (!accept.isError) {
    return (
      <PublicLayout>
        <PageSpinner label="Accepting the invitation…" />
      </PublicLayout>
    );
  }

  const error = accept.error;
  const code = isApiError(error) ? error.code : '';
  return (
    <PublicLayout>
      <div className="flex flex-col gap-5">
        <h1 className="text-2xl font-bold tracking-tight text-ink-950 sm:text-3xl">The invitation was not accepted</h1>
        <p role="alert" className="text-lg leading-relaxed text-ink-800">
          {isApiError(error) ? error.message : 'Benchrelay could not be reached. Check the connection and try again.'}
        </p>
        {code === 'unauthenticated' ? (
          <ButtonAnchor href={signInHref(acceptPath(token))} size="lg">
            Sign in to accept
          </ButtonAnchor>
        ) : code === 'invitation_wrong_email' || code === 'identity_mismatch' ? (
          <SignOutButton variant="primary" />
        ) : (
          <ButtonLink to="/" variant="secondary">
            Go to Benchrelay
          </ButtonLink>
        )}
      </div>
    </PublicLayout>
  );
}

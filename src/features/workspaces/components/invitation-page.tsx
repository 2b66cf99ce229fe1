import { useQuery } from '@tanstack/react-query';
import { useNavigate, useParams } from 'react-router-dom';
import { Button, ButtonLink } from '@/components/ui/button';
import { NameMark } from '@/components/ui/name-mark';
import { Spinner } from '@/components/ui/spinner';
import { ErrorState, InlineError } from '@/components/ui/states';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { meQueryOptions } from '@/lib/me';
import { useAcceptInvitation } from '../api/accept-invitation';
import { useInvitation } from '../api/get-invitation';

/**
 * `/invite/:token` — what the invitation is for; "Sign in to accept" when signed out, "Accept"
 * when signed in. Accepting opens the workspace.
 */
export function InvitationPage() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const invitation = useInvitation(token);
  const me = useQuery({ ...meQueryOptions(), retry: false });
  const accept = useAcceptInvitation(token);
  const signedIn = me.isSuccess;
  const signedOut = me.isError && isApiError(me.error, 401);
  const here = `/invite/${encodeURIComponent(token)}`;

  return (
    <main className="flex min-h-screen items-center justify-center bg-paper px-4">
      <div className="w-full max-w-md rounded-xl border border-rule bg-card p-8 shadow-sm">
        <NameMark />
        <h1 className="mt-8 text-xl font-semibold">Invitation to a workspace</h1>
        {invitation.isPending ? (
          <Spinner className="mt-4" label="Reading the invitation" />
        ) : invitation.isError ? (
          <ErrorState className="mt-4" title="This link can’t be used" message={invitation.error.message} />
        ) : (
          <div className="mt-3 flex flex-col gap-4 text-sm">
            <p>
              <strong>{invitation.data.invitedBy}</strong> invited <strong>{invitation.data.email}</strong> to{' '}
              <strong>{invitation.data.workspace.name}</strong> as <strong>{invitation.data.role}</strong>.
            </p>
            {invitation.data.status === 'pending' ? (
              <>
                <p className="text-ink-soft">The link works once and expires {formatDateTime(invitation.data.expiresAt)}.</p>
                {signedIn && (
                  <>
                    <p className="text-ink-soft">
                      You’re signed in as {me.data.user.email}. Accept with the account of {invitation.data.email}.
                    </p>
                    <Button
                      busy={accept.isPending}
                      onClick={() =>
                        accept.mutate(undefined, { onSuccess: (joined) => navigate(`/w/${encodeURIComponent(joined.workspace.slug)}`) })
                      }
                    >
                      Accept and open the workspace
                    </Button>
                    {accept.error && <InlineError>{accept.error.message}</InlineError>}
                  </>
                )}
                {signedOut && <ButtonLink to={`/sign-in?next=${encodeURIComponent(here)}`}>Sign in to accept</ButtonLink>}
                {me.isPending && <Spinner label="Checking your session" />}
                {me.isError && !signedOut && <InlineError>{me.error.message}</InlineError>}
              </>
            ) : (
              <p role="status" className="rounded-md bg-paper-deep px-3 py-2">
                {invitation.data.status === 'accepted'
                  ? 'This invitation has been accepted already.'
                  : invitation.data.status === 'expired'
                    ? 'This invitation has expired. Ask the owner for a new one.'
                    : 'This invitation was withdrawn. Ask the owner for a new one.'}
              </p>
            )}
            {(invitation.data.status !== 'pending' || signedIn) && (
              <ButtonLink to="/" variant="secondary">
                Go to my workspaces
              </ButtonLink>
            )}
          </div>
        )}
      </div>
    </main>
  );
}

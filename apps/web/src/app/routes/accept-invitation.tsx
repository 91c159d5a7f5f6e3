// Public page behind an invitation link (/invitations/:token): the invited user sets a password and
// is signed in. An unknown, withdrawn, used or expired link says so and points to sign-in.
import { Link, useNavigate, useParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { AuthLayout } from '../../components/layouts/auth-layout.tsx';
import { Alert } from '../../components/ui/alert.tsx';
import { PageLoading } from '../../components/ui/page-loading.tsx';
import { paths } from '../../config/paths.ts';
import { invitationKeys } from '../../features/invitations/api/invitation.ts';
import { AcceptInvitationForm } from '../../features/invitations/components/accept-invitation-form.tsx';
import { isApiError } from '../../lib/api-client.ts';
import { homePathForRole } from '../../lib/authorization.ts';
import { getSession } from '../../lib/session.ts';

function problemTitle(error: unknown): string {
  if (isApiError(error) && error.code === 'not_found') return 'This invitation link is not valid';
  if (isApiError(error) && error.code === 'gone') return 'This invitation can no longer be used';
  return 'The invitation could not be read';
}

function problemText(error: unknown): string {
  if (isApiError(error) && error.code === 'not_found') {
    return 'Check that the whole link was copied. If the invitation was withdrawn, ask your lab supervisor or the network coordinator for a new one.';
  }
  if (isApiError(error)) return error.message;
  return 'Something unexpected went wrong. Try the link again in a moment.';
}

export default function AcceptInvitationRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  const invitation = useQuery({ ...invitationKeys.detail(token), retry: false });

  return (
    <AuthLayout title="Accept your invitation">
      <div className="rounded-xl border border-slate-200 bg-white px-6 py-8 shadow-sm sm:px-8">
        <h1 className="text-2xl font-semibold text-plumb-950">Welcome to Plumbline</h1>
        {invitation.isError ? (
          <div className="mb-6" />
        ) : (
          <p className="mt-2 mb-6 text-sm leading-relaxed text-slate-600">
            You have been invited to your lab&rsquo;s Plumbline account. Choose a password to finish setting
            it up.
          </p>
        )}
        {invitation.isPending ? (
          <PageLoading />
        ) : invitation.isError ? (
          <div className="space-y-5">
            <Alert tone="error" title={problemTitle(invitation.error)}>
              {problemText(invitation.error)}
            </Alert>
            <p className="text-sm">
              <Link
                to={paths.auth.signIn.getHref()}
                className="font-medium text-plumb-700 underline underline-offset-4 hover:text-plumb-900"
              >
                Go to sign-in
              </Link>
            </p>
          </div>
        ) : (
          <AcceptInvitationForm
            token={token}
            invitation={invitation.data}
            onSignedIn={() => {
              const session = getSession();
              navigate(session ? homePathForRole(session.user.role) : paths.auth.signIn.getHref(), {
                replace: true,
              });
            }}
          />
        )}
      </div>
    </AuthLayout>
  );
}

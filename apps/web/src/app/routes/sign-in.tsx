import { Navigate, useSearchParams } from 'react-router-dom';
import { AuthLayout } from '../../components/layouts/auth-layout.tsx';
import { Alert } from '../../components/ui/alert.tsx';
import { isSafeReturnPath } from '../../config/paths.ts';
import { SignInForm } from '../../features/auth/components/sign-in-form.tsx';
import { useSessionState } from '../../lib/auth.tsx';
import { homePathForRole } from '../../lib/authorization.ts';

export default function SignInRoute() {
  const { session, endReason } = useSessionState();
  const [searchParams] = useSearchParams();
  const redirectTo = searchParams.get('redirectTo');

  // Signed in (now or already): go back to where the user was sent from, else to the role's home.
  if (session) {
    const destination = isSafeReturnPath(redirectTo) ? redirectTo : homePathForRole(session.user.role);
    return <Navigate to={destination} replace />;
  }

  return (
    <AuthLayout title="Sign in">
      <div className="rounded-xl border border-slate-200 bg-white px-6 py-8 shadow-sm sm:px-8">
        <h1 className="text-2xl font-semibold text-plumb-950">Sign in</h1>
        <p className="mt-2 mb-7 text-sm leading-relaxed text-slate-600">
          Use the e-mail address your lab supervisor or the network coordinator registered for you.
        </p>
        {endReason === 'expired' ? (
          <div className="mb-5">
            <Alert tone="info">Your session has ended. Sign in again to continue.</Alert>
          </div>
        ) : null}
        <SignInForm />
      </div>
      <p className="mt-6 text-center text-sm text-slate-600">
        No account yet? Your lab supervisor or the network coordinator can invite you.
      </p>
    </AuthLayout>
  );
}

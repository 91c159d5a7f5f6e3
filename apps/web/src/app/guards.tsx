// Route guards used by the router: signed in at all, signed in with an allowed role, and the
// redirect from "/" to the role's home page.
import { Navigate, Outlet, useLocation } from 'react-router-dom';
import { NotAllowedForRole } from '../components/errors/not-allowed.tsx';
import { AppLayout } from '../components/layouts/app-layout.tsx';
import { paths } from '../config/paths.ts';
import { useSession } from '../lib/auth.tsx';
import { accessPolicies, homePathForRole, type AccessPolicy } from '../lib/authorization.ts';

/** Signed-out users go to sign-in and come back here afterwards. Signed-in users get the app frame. */
export function RequireSession() {
  const session = useSession();
  const location = useLocation();
  if (!session) {
    const returnTo = `${location.pathname}${location.search}${location.hash}`;
    return <Navigate to={paths.auth.signIn.getHref(returnTo)} replace />;
  }
  return (
    <AppLayout>
      <Outlet />
    </AppLayout>
  );
}

/** Renders the child routes only for the roles of the policy; others see why they cannot. */
export function RequireRole({ policy }: { policy: AccessPolicy }) {
  const session = useSession();
  const allowed: readonly string[] = accessPolicies[policy];
  if (!session || !allowed.includes(session.user.role)) return <NotAllowedForRole />;
  return <Outlet />;
}

export function RedirectToRoleHome() {
  const session = useSession();
  if (!session) return <Navigate to={paths.auth.signIn.getHref()} replace />;
  return <Navigate to={homePathForRole(session.user.role)} replace />;
}

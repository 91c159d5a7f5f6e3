import { Link } from 'react-router-dom';
import { useSession } from '../../lib/auth.tsx';
import { homePathForRole, roleLabels } from '../../lib/authorization.ts';
import { ContentLayout } from '../layouts/content-layout.tsx';

/** Shown in place of a page the signed-in role may not open. */
export function NotAllowedForRole() {
  const session = useSession();
  const role = session?.user.role;
  return (
    <ContentLayout title="Not available for your role" area="Access">
      <div className="max-w-2xl space-y-4 text-[0.95rem] text-slate-700">
        <p>
          This page is not available for your role
          {role ? (
            <>
              {' '}
              (<strong className="font-semibold text-slate-900">{roleLabels[role]}</strong>)
            </>
          ) : null}
          . If your work needs it, ask whoever manages your account to change your role.
        </p>
        {role ? (
          <p>
            <Link
              to={homePathForRole(role)}
              className="font-medium text-plumb-700 underline underline-offset-4 hover:text-plumb-900"
            >
              Go to your home page
            </Link>
          </p>
        ) : null}
      </div>
    </ContentLayout>
  );
}

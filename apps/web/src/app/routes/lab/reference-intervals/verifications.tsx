// Verifications (lab members; supervisors manage).
import { ContentLayout } from '../../../../components/layouts/content-layout.tsx';
import { Verifications } from '../../../../features/reference-intervals/components/verifications.tsx';
import { useSession } from '../../../../lib/auth.tsx';
import { canAccess } from '../../../../lib/authorization.ts';

export default function VerificationsRoute() {
  const session = useSession();
  const canManage = session ? canAccess(session.user.role, 'labManagement') : false;
  return (
    <ContentLayout
      title="Verifications"
      area="Reference intervals"
      description="Verify a transferred interval with 20 local results (CLSI EP28-A3c): accepted when no more than 2 fall outside."
    >
      <Verifications canManage={canManage} />
    </ContentLayout>
  );
}

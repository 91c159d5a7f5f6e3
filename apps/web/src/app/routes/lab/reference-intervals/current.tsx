// Current intervals (lab members; supervisors manage).
import { ContentLayout } from '../../../../components/layouts/content-layout.tsx';
import { CurrentIntervals } from '../../../../features/reference-intervals/components/current-intervals.tsx';
import { useSession } from '../../../../lib/auth.tsx';
import { canAccess } from '../../../../lib/authorization.ts';

export default function CurrentRoute() {
  const session = useSession();
  const canManage = session ? canAccess(session.user.role, 'labManagement') : false;
  return (
    <ContentLayout
      title="Current intervals"
      area="Reference intervals"
      description="The reference intervals your lab prints on its reports today, with their source."
    >
      <CurrentIntervals canManage={canManage} />
    </ContentLayout>
  );
}

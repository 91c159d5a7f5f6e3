// The lab's test menu: its measurement procedures and the short codes its files use (supervisors).
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { TestMenu } from '../../../features/lab-procedures/components/test-menu.tsx';
import { useSession } from '../../../lib/auth.tsx';
import { canAccess } from '../../../lib/authorization.ts';

export default function ProceduresRoute() {
  const session = useSession();
  const labId = session?.user.labId ?? null;
  return (
    <ContentLayout
      title="Procedures"
      area="Lab management"
      width="wide"
      description="The measurement procedures your lab reports: analyte, instrument model, method, reagent and unit, with the short code your QC files use for each."
    >
      {session && labId ? (
        <TestMenu labId={labId} canManage={canAccess(session.user.role, 'labManagement')} />
      ) : (
        <EmptyState
          title="Your account belongs to no lab"
          description="Ask your network coordinator to add your account to your lab."
        />
      )}
    </ContentLayout>
  );
}

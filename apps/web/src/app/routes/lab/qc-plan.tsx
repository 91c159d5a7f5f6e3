// The lab's QC plans: sigma of every procedure and level, the plan in use and the recommended plan.
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { QcPlanTable } from '../../../features/qc-insight/components/qc-plan-table.tsx';
import { useSession } from '../../../lib/auth.tsx';

export default function QcPlanRoute() {
  const session = useSession();
  const labId = session?.user.labId ?? null;
  return (
    <ContentLayout
      title="QC plan"
      area="My lab"
      width="wide"
      description="How many controls each procedure needs, from its sigma: the plan your lab uses and the plan that detects the critical shift with the fewest controls."
    >
      {session && labId ? (
        <QcPlanTable
          labId={labId}
          canEdit={session.user.role === 'analyst' || session.user.role === 'supervisor'}
        />
      ) : (
        <EmptyState
          title="Your account belongs to no lab"
          description="Ask your network coordinator to add your account to your lab."
        />
      )}
    </ContentLayout>
  );
}

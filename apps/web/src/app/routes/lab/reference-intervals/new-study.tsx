// New reference-interval study (lab members; supervisors manage).
import { ContentLayout } from '../../../../components/layouts/content-layout.tsx';
import { NewStudyForm } from '../../../../features/reference-intervals/components/new-study-form.tsx';
import { useSession } from '../../../../lib/auth.tsx';
import { canAccess } from '../../../../lib/authorization.ts';

export default function NewStudyRoute() {
  const session = useSession();
  const canManage = session ? canAccess(session.user.role, 'labManagement') : false;
  return (
    <ContentLayout
      title="New reference-interval study"
      area="Reference intervals"
      description="Choose the results, partitions and method; the study runs in the background."
    >
      {canManage ? <NewStudyForm /> : <p>Only the lab's supervisor can start a study.</p>}
    </ContentLayout>
  );
}

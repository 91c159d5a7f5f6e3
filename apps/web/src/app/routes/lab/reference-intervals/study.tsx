// One reference-interval study: its versions, limits, histograms, partition advice and approval.
import { useParams } from 'react-router-dom';
import { ContentLayout } from '../../../../components/layouts/content-layout.tsx';
import { StudyView } from '../../../../features/reference-intervals/components/study-view.tsx';
import { useSession } from '../../../../lib/auth.tsx';
import { canAccess } from '../../../../lib/authorization.ts';

export default function StudyRoute() {
  const { studyId = '' } = useParams();
  const session = useSession();
  const canManage = session ? canAccess(session.user.role, 'labManagement') : false;
  return (
    <ContentLayout title="Reference-interval study" area="Reference intervals" width="wide">
      <StudyView studyId={studyId} canManage={canManage} />
    </ContentLayout>
  );
}

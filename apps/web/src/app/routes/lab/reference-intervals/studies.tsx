// Reference-interval studies (lab members; supervisors manage).
import { Link } from 'react-router-dom';
import { ContentLayout } from '../../../../components/layouts/content-layout.tsx';
import { paths } from '../../../../config/paths.ts';
import { StudiesList } from '../../../../features/reference-intervals/components/studies-list.tsx';
import { PatientUpload } from '../../../../features/reference-intervals/components/patient-upload.tsx';
import { IntervalCaution } from '../../../../features/reference-intervals/components/interval-caution.tsx';
import { useSession } from '../../../../lib/auth.tsx';
import { canAccess } from '../../../../lib/authorization.ts';

export default function StudiesRoute() {
  const session = useSession();
  const canManage = session ? canAccess(session.user.role, 'labManagement') : false;
  return (
    <ContentLayout
      title="Reference-interval studies"
      area="Reference intervals"
      description="Studies of the lab's own patient results: limits with confidence intervals per partition, partition advice, and the interval in use today."
      actions={
        canManage ? (
          <Link
            className="rounded-md bg-plumb-700 px-4 py-2 text-sm font-medium text-white"
            to={paths.lab.riNewStudy.getHref()}
          >
            New study
          </Link>
        ) : null
      }
    >
      <div className="grid gap-8">
        <IntervalCaution />
        <StudiesList />
        <PatientUpload />
      </div>
    </ContentLayout>
  );
}

// People and access of the lab (supervisors): its users and invitations, and the API tokens its
// middleware uses to send files.
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { ApiTokens } from '../../../features/lab-admin/components/api-tokens.tsx';
import { LabUsers } from '../../../features/lab-admin/components/lab-users.tsx';
import { useSession, useUser } from '../../../lib/auth.tsx';

export default function LabAdministrationRoute() {
  const session = useSession();
  const user = useUser();
  const labId = session?.user.labId ?? null;
  return (
    <ContentLayout
      title="Lab administration"
      area={user.data?.lab ? `Lab ${user.data.lab.code}` : 'Lab management'}
      description="Who has access to your lab’s data, and the API tokens its systems use to send files."
    >
      {session && labId ? (
        <div className="space-y-10">
          <LabUsers labId={labId} currentUserId={session.user.id} />
          <ApiTokens labId={labId} />
        </div>
      ) : (
        <EmptyState
          title="Your account belongs to no lab"
          description="Ask your network coordinator to add your account to your lab."
        />
      )}
    </ContentLayout>
  );
}

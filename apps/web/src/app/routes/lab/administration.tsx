import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function LabAdministrationRoute() {
  return (
    <ContentLayout
      title="Lab administration"
      area="Lab management"
      description="People and access for your lab."
    >
      <EmptyState
        title="Your lab's users and API tokens will be managed here"
        description="This page will hold your lab's users and their roles, the API tokens your middleware uses to send files, and invitations waiting for an answer."
      />
    </ContentLayout>
  );
}

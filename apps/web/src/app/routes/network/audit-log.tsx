import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function AuditLogRoute() {
  return (
    <ContentLayout
      title="Audit log"
      area="Network oversight"
      description="A record of what was done, by whom and when."
    >
      <EmptyState
        title="The audit trail will be listed here"
        description="Uploads, exclusions, sign-offs and changes to the catalogue and peer groups will be listed here, newest first, with who did what and when."
      />
    </ContentLayout>
  );
}

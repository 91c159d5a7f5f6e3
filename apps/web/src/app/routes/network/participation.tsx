import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function ParticipationRoute() {
  return (
    <ContentLayout
      title="Participation"
      area="Network"
      description="Who has submitted, who has not, and who stands out."
    >
      <EmptyState
        title="Participation in each cycle will be shown here"
        description="For the open cycle this page will show which labs have submitted, which are late, and which labs are outliers on which analytes."
      />
    </ContentLayout>
  );
}

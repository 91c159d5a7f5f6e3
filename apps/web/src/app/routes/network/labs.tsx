import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function LabsRoute() {
  return (
    <ContentLayout title="Labs" area="Network set-up" description="Member labs of the network.">
      <EmptyState
        title="Member labs will be listed here"
        description="Every member lab will be listed here with its de-identifying code, whether it is active, its users and its measurement procedures. Only you see which code belongs to which lab."
      />
    </ContentLayout>
  );
}

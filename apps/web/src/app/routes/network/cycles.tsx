import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function CyclesRoute() {
  return (
    <ContentLayout title="Cycles" area="Network" description="The network's monthly cycles.">
      <EmptyState
        title="Monthly cycles will be listed here"
        description="Each monthly cycle will be listed here with its state and submission deadline; this is where cycles are opened, closed and published."
      />
    </ContentLayout>
  );
}

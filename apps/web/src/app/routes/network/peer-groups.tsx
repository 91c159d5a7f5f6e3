import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function PeerGroupsRoute() {
  return (
    <ContentLayout
      title="Peer groups"
      area="Network set-up"
      description="Which procedures are compared with each other, per control lot and level."
    >
      <EmptyState
        title="Peer groups will be listed here"
        description="Peer groups for each control lot and level will appear here with their member procedures, lab count and statistics."
        expected={[
          'The grouping rule, and merging or splitting groups',
          "Excluding a lab's data with a recorded reason",
          'The effect of a change on the statistics before the month is published',
        ]}
      />
    </ContentLayout>
  );
}

import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { PeerGroupsWorkspace } from '../../../features/peer-groups/components/peer-groups-workspace.tsx';
import { RecomputeFailuresNotice } from '../../../features/peer-groups/components/recompute-failures-notice.tsx';

export default function PeerGroupsRoute() {
  return (
    <ContentLayout
      title="Peer groups"
      area="Network set-up"
      description="Which procedures are compared with each other, per control lot and level: merge, split or move groups, or leave a lab’s data out for a month, each with a preview of the statistics before and after."
      width="wide"
    >
      <RecomputeFailuresNotice />
      <PeerGroupsWorkspace />
    </ContentLayout>
  );
}

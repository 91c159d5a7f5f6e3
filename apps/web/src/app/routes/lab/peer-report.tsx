import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function PeerReportRoute() {
  return (
    <ContentLayout
      title="Peer report"
      area="My lab"
      description="Your lab's results beside its peer groups, month by month."
    >
      <EmptyState
        title="Your lab's peer report will appear here"
        description="Once a monthly cycle is published, this page will show, for each measurement procedure and control level, your lab's figures beside its peer group's."
        expected={[
          'Lab mean, SD, CV and n beside peer mean, SD, CV and lab count',
          'SDI, CVR, bias % and sigma metric, with flags to investigate',
          'Trends over months, control charts with multirule checks, comments and the monthly sign-off',
        ]}
      />
    </ContentLayout>
  );
}

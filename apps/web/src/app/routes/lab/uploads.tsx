import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function UploadsRoute() {
  return (
    <ContentLayout title="Uploads" area="My lab" description="Send this month's control data for your lab.">
      <EmptyState
        title="Your lab's uploads will be listed here"
        description="Every control data file your lab submits will be listed here with its period, the rows accepted and rejected, and where it is in processing."
        expected={[
          'QC summary files (one row per procedure, control lot, level and month) and daily values files',
          'The column mapping of your files, remembered after the first upload',
          'A row-by-row list of anything rejected, to fix before the data is stored',
        ]}
      />
    </ContentLayout>
  );
}

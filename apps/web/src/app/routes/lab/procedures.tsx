import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function ProceduresRoute() {
  return (
    <ContentLayout
      title="Procedures"
      area="Lab management"
      description="The measurement procedures your lab reports and the short codes used in its files."
    >
      <EmptyState
        title="Your lab's measurement procedures will be listed here"
        description="Each measurement procedure of your lab will be listed here: analyte, instrument model, method, reagent and unit, with the short code your files use for it."
      />
    </ContentLayout>
  );
}

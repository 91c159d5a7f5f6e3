import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';

// Shell page: the feature that fills this area replaces the empty state.
export default function CatalogueRoute() {
  return (
    <ContentLayout
      title="Catalogue"
      area="Network set-up"
      description="The shared vocabulary every lab's procedures are built from."
    >
      <EmptyState
        title="The network's catalogue will be kept here"
        description="Analytes with their LOINC code, canonical UCUM unit and total allowable error; methods, instrument models and reagents; control materials with their lots, levels and expiry dates."
      />
    </ContentLayout>
  );
}

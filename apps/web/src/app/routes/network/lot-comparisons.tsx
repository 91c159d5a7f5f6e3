import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { LotComparisonsView } from '../../../features/lot-comparisons/components/lot-comparisons-view.tsx';

export default function LotComparisonsRoute() {
  return (
    <ContentLayout
      title="Lot comparisons"
      area="Network set-up"
      description="When labs move to a new control lot, did their means move with it? The same labs’ means before and after the change tell a lot effect from a lab problem."
      width="wide"
    >
      <LotComparisonsView />
    </ContentLayout>
  );
}

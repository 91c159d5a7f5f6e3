// The network's catalogue: six lists, chosen in a side list (?list=…), each with search, paging,
// create/edit, retire/restore and CSV import.
import { useSearchParams } from 'react-router-dom';
import { catalogueListSchema } from '@plumbline/contracts';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { CatalogueBrowser } from '../../../features/catalogue/components/catalogue-browser.tsx';
import { CatalogueListNav } from '../../../features/catalogue/components/catalogue-list-nav.tsx';

export default function CatalogueRoute() {
  const [searchParams] = useSearchParams();
  const parsed = catalogueListSchema.safeParse(searchParams.get('list'));
  const list = parsed.success ? parsed.data : 'analytes';

  return (
    <ContentLayout
      title="Catalogue"
      area="Network set-up"
      width="wide"
      description="The shared vocabulary every lab's procedures are built from. Entries are retired, never deleted, because data refers to them."
    >
      <div className="flex flex-col gap-6 md:flex-row">
        <CatalogueListNav current={list} />
        {/* Keyed by list: search, sorting and paging start afresh on another list. */}
        <CatalogueBrowser key={list} list={list} />
      </div>
    </ContentLayout>
  );
}

// Procedures across the network: composes the procedure list (network-labs) with the filter options
// from the labs list and the catalogue.
import { useQuery } from '@tanstack/react-query';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { catalogueKeys } from '../../../features/catalogue/api/catalogue-keys.ts';
import { networkLabsKeys } from '../../../features/network-labs/api/network-labs-keys.ts';
import {
  NetworkProcedures,
  type FilterOption,
} from '../../../features/network-labs/components/network-procedures.tsx';

const allOf = { state: 'all', sort: 'code', order: 'asc', limit: 500 } as const;
const asOptions = (items: { id: string; code: string; name: string }[] | undefined): FilterOption[] =>
  (items ?? []).map((item) => ({ id: item.id, label: `${item.code} · ${item.name}` }));

export default function NetworkProceduresRoute() {
  const labs = useQuery(networkLabsKeys.labs());
  const analytes = useQuery(catalogueKeys.list('analytes', allOf));
  const instrumentModels = useQuery(catalogueKeys.list('instrument-models', allOf));
  const methods = useQuery(catalogueKeys.list('methods', allOf));

  return (
    <ContentLayout
      title="Network procedures"
      area="Network set-up"
      width="wide"
      description="Which labs run which analyte on which instrument model, method and reagent. A procedure is compared at the narrowest tier with enough labs; those with no such tier cannot be peered."
    >
      <NetworkProcedures
        options={{
          labs: asOptions(labs.data),
          analytes: asOptions(analytes.data?.items),
          instrumentModels: asOptions(instrumentModels.data?.items),
          methods: asOptions(methods.data?.items),
        }}
      />
    </ContentLayout>
  );
}

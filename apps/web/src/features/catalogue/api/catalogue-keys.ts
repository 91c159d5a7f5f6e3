// Query factory of the catalogue feature: one page of one list (search, state, sort, paging).
// Every catalogue query and every invalidation after a change goes through these keys.
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  analyteItemSchema,
  controlLotItemSchema,
  controlMaterialItemSchema,
  instrumentModelItemSchema,
  methodItemSchema,
  reagentItemSchema,
  type CatalogueList,
  type CatalogueListQuery,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export const catalogueItemSchemas = {
  analytes: analyteItemSchema,
  methods: methodItemSchema,
  'instrument-models': instrumentModelItemSchema,
  reagents: reagentItemSchema,
  'control-materials': controlMaterialItemSchema,
  'control-lots': controlLotItemSchema,
} as const satisfies Record<CatalogueList, z.ZodType>;

export type CatalogueItemOf<L extends CatalogueList> = z.infer<(typeof catalogueItemSchemas)[L]>;
export type CatalogueItem = CatalogueItemOf<CatalogueList>;
export type CataloguePageOf<L extends CatalogueList> = { total: number; items: CatalogueItemOf<L>[] };

export type CatalogueListParams = Partial<
  Pick<CatalogueListQuery, 'q' | 'sort' | 'order' | 'state' | 'limit' | 'offset'>
>;

export const CATALOGUE_PAGE_SIZE = 50;

export async function getCataloguePage<L extends CatalogueList>(
  list: L,
  params: CatalogueListParams,
  signal?: AbortSignal,
): Promise<CataloguePageOf<L>> {
  const schema = z.object({ total: z.number(), items: z.array(catalogueItemSchemas[list]) });
  const page = await apiRequest(`/catalogue/${list}`, {
    schema,
    query: { ...params, q: params.q || undefined },
    signal,
  });
  return page as CataloguePageOf<L>;
}

export const catalogueKeys = {
  all: ['catalogue'] as const,
  /** Every page of one list: invalidate this after a change to the list. */
  lists: (list: CatalogueList) => [...catalogueKeys.all, list, 'list'] as const,
  list: <L extends CatalogueList>(list: L, params: CatalogueListParams) =>
    queryOptions({
      queryKey: [...catalogueKeys.lists(list), params] as const,
      queryFn: ({ signal }) => getCataloguePage(list, params, signal),
      // Keep the current page on screen while the next page, sort or search loads.
      placeholderData: keepPreviousData,
    }),
};

// Query factory of the lab-procedures feature: the lab's test menu (its measurement procedures,
// retired ones included) and the catalogue entries a procedure is built from.
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  analyteItemSchema,
  instrumentModelItemSchema,
  methodItemSchema,
  reagentItemSchema,
  testMenuSchema,
} from '@plumbline/contracts';
import { apiDownload, apiRequest, saveFile } from '../../../lib/api-client.ts';

export function getTestMenu(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/test-menu`, { schema: testMenuSchema, signal });
}

const catalogueListSchemas = {
  analytes: analyteItemSchema,
  'instrument-models': instrumentModelItemSchema,
  methods: methodItemSchema,
  reagents: reagentItemSchema,
} as const;
export type ProcedureCatalogueList = keyof typeof catalogueListSchemas;

/** Active entries of one catalogue list, by name (at most 500: far more than a network holds). */
export function getCatalogueOptions<L extends ProcedureCatalogueList>(list: L, signal?: AbortSignal) {
  return apiRequest(`/catalogue/${list}`, {
    schema: z.object({ total: z.number(), items: z.array(catalogueListSchemas[list]) }),
    query: { state: 'active', sort: 'name', order: 'asc', limit: 500 },
    signal,
  });
}

export async function downloadTestMenuCsv(labId: string): Promise<void> {
  const { blob, filename } = await apiDownload(`/labs/${encodeURIComponent(labId)}/test-menu.csv`);
  saveFile(blob, filename ?? 'test-menu.csv');
}

export const testMenuKeys = {
  all: ['lab-procedures'] as const,
  menus: () => [...testMenuKeys.all, 'test-menu'] as const,
  menu: (labId: string) =>
    queryOptions({
      queryKey: [...testMenuKeys.menus(), labId] as const,
      queryFn: ({ signal }) => getTestMenu(labId, signal),
    }),
  catalogue: <L extends ProcedureCatalogueList>(list: L) =>
    queryOptions({
      queryKey: [...testMenuKeys.all, 'catalogue', list] as const,
      queryFn: ({ signal }) => getCatalogueOptions(list, signal),
      staleTime: 5 * 60 * 1000,
    }),
};

// Creating (POST /api/catalogue/<list>) and editing (PATCH /api/catalogue/<list>/:id) one entry. The
// body is what the contract's create schema produced in the form; a PATCH with every field is fine,
// the API records only what changed.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CatalogueList } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { catalogueItemSchemas, catalogueKeys, type CatalogueItemOf } from './catalogue-keys.ts';

export type SaveCatalogueEntryInput = { id?: string; body: Record<string, unknown> };

export function saveCatalogueEntry<L extends CatalogueList>(
  list: L,
  { id, body }: SaveCatalogueEntryInput,
): Promise<CatalogueItemOf<L>> {
  const path = id ? `/catalogue/${list}/${encodeURIComponent(id)}` : `/catalogue/${list}`;
  return apiRequest(path, {
    method: id ? 'PATCH' : 'POST',
    body,
    schema: catalogueItemSchemas[list],
  }) as Promise<CatalogueItemOf<L>>;
}

export function useSaveCatalogueEntry<L extends CatalogueList>(list: L) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: SaveCatalogueEntryInput) => saveCatalogueEntry(list, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: catalogueKeys.lists(list) }),
  });
}

// Retiring and restoring an entry: POST /api/catalogue/<list>/:id/retire|restore with an optional
// reason. Nothing is ever deleted, because data may refer to it.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CatalogueList } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { catalogueItemSchemas, catalogueKeys } from './catalogue-keys.ts';

export type CatalogueStateChange = { id: string; action: 'retire' | 'restore'; reason: string };

export function changeCatalogueState(list: CatalogueList, { id, action, reason }: CatalogueStateChange) {
  return apiRequest(`/catalogue/${list}/${encodeURIComponent(id)}/${action}`, {
    method: 'POST',
    body: { reason: reason || undefined },
    schema: catalogueItemSchemas[list],
  });
}

export function useChangeCatalogueState(list: CatalogueList) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (change: CatalogueStateChange) => changeCatalogueState(list, change),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: catalogueKeys.lists(list) }),
  });
}

// CSV import of one catalogue list: POST /api/catalogue/<list>/import?dryRun=true|false with the file
// as multipart (field "file"). The dry run is the preview; applying a file that still has row errors
// answers 422 with the same report in error.details, which is returned here as a result too.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { importResultSchema, type CatalogueList, type ImportResult } from '@plumbline/contracts';
import { apiRequest, isApiError } from '../../../lib/api-client.ts';
import { catalogueKeys } from './catalogue-keys.ts';

export type ImportCatalogueInput = { file: File; dryRun: boolean };

export async function importCatalogue(
  list: CatalogueList,
  { file, dryRun }: ImportCatalogueInput,
): Promise<ImportResult> {
  const form = new FormData();
  form.append('file', file, file.name);
  try {
    return await apiRequest(`/catalogue/${list}/import`, {
      method: 'POST',
      body: form,
      query: { dryRun },
      schema: importResultSchema,
    });
  } catch (error) {
    if (isApiError(error) && error.code === 'validation_failed') {
      const report = importResultSchema.safeParse(error.details);
      if (report.success) return report.data;
    }
    throw error;
  }
}

export function useImportCatalogue(list: CatalogueList) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: ImportCatalogueInput) => importCatalogue(list, input),
    onSuccess: async (result) => {
      if (result.applied) await queryClient.invalidateQueries({ queryKey: catalogueKeys.lists(list) });
    },
  });
}

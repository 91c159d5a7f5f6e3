// Query factory of the lab-overview feature: what a lab sees first (GET /api/labs/:labId/overview).
import { queryOptions } from '@tanstack/react-query';
import { labOverviewSchema } from '@plumbline/contracts';
import { apiDownload, apiRequest, saveFile } from '../../../lib/api-client.ts';

export function getLabOverview(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/overview`, { schema: labOverviewSchema, signal });
}

/** Every upload of the lab as CSV (GET /api/labs/:labId/uploads.csv). */
export async function downloadUploadsCsv(labId: string): Promise<void> {
  const { blob, filename } = await apiDownload(`/labs/${encodeURIComponent(labId)}/uploads.csv`);
  saveFile(blob, filename ?? 'uploads.csv');
}

export const labOverviewKeys = {
  all: ['lab-overview'] as const,
  overview: (labId: string) =>
    queryOptions({
      queryKey: [...labOverviewKeys.all, labId] as const,
      queryFn: ({ signal }) => getLabOverview(labId, signal),
    }),
};

// CSV files of the review: the control chart's points, the SDI/CVR trend, the period's comments.
import { apiDownload, saveFile } from '../../../lib/api-client.ts';
import { reportRowPath, type DrilldownParams } from './lab-review-keys.ts';

async function download(path: string, query: Record<string, string | undefined>, fallbackName: string) {
  const { blob, filename } = await apiDownload(path, { query });
  saveFile(blob, filename ?? fallbackName);
}

export function downloadControlChartCsv(params: DrilldownParams) {
  return download(
    `${reportRowPath(params.labId, params)}/levey-jennings.csv`,
    { period: params.period, target: params.target, units: params.units },
    `control-values-${params.period}-level-${params.level}.csv`,
  );
}

export function downloadTrendCsv(params: DrilldownParams) {
  return download(
    `${reportRowPath(params.labId, params)}/trend.csv`,
    { period: params.period, units: params.units },
    `sdi-trend-${params.period}-level-${params.level}.csv`,
  );
}

export function downloadCommentsCsv(labId: string, period: string) {
  return download(`/labs/${encodeURIComponent(labId)}/comments.csv`, { period }, `comments-${period}.csv`);
}

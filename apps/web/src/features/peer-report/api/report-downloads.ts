// The report's files from the API: the table as CSV and the monthly report as PDF. Both need the
// Bearer token, so they are fetched and handed to the browser rather than linked.
import { apiDownload, saveFile } from '../../../lib/api-client.ts';
import type { PeerReportParams } from './peer-report-keys.ts';

export type ReportFileKind = 'csv' | 'pdf';

/** The name to save under when the API does not give one. */
export function reportFileName({ period }: PeerReportParams, kind: ReportFileKind, labCode?: string): string {
  return `${labCode ? `${labCode}-` : ''}peer-report-${period}.${kind}`;
}

export async function downloadReportFile(
  params: PeerReportParams,
  kind: ReportFileKind,
  labCode?: string,
): Promise<void> {
  const { blob, filename } = await apiDownload(
    `/labs/${encodeURIComponent(params.labId)}/peer-report.${kind}`,
    { query: { period: params.period, units: params.units } },
  );
  saveFile(blob, filename ?? reportFileName(params, kind, labCode));
}

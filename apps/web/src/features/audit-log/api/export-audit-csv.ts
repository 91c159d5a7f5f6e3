// CSV export of the audit log with the current filters: GET /api/audit-events.csv needs the Bearer
// token, so the file is fetched as a blob and then handed to the browser as a download.
import { useMutation } from '@tanstack/react-query';
import { apiDownload, saveFile } from '../../../lib/api-client.ts';
import { auditQuery, type AuditFilters } from './audit-keys.ts';

/** e.g. audit-log_2026-11-01_2026-11-30.csv, so several exports do not overwrite each other. */
export function exportFilename(filters: AuditFilters, today: Date): string {
  const parts = ['audit-log'];
  if (filters.from || filters.to) parts.push(filters.from ?? 'start', filters.to ?? 'today');
  else parts.push(today.toISOString().slice(0, 10));
  return `${parts.join('_')}.csv`;
}

export async function exportAuditCsv(filters: AuditFilters): Promise<string> {
  const { blob } = await apiDownload('/audit-events.csv', { query: auditQuery(filters) });
  const filename = exportFilename(filters, new Date());
  saveFile(blob, filename);
  return filename;
}

export function useExportAuditCsv() {
  return useMutation({ mutationFn: exportAuditCsv });
}

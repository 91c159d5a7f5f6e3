import type { ColumnMapping, UploadKind, UploadPreview } from '@plumbline/contracts';

/** The mapping being edited: canonical column → the file's header, or null for "not in this file". */
export type MappingDraft = Record<string, string | null>;

export type MappingIssue = { column: string; message: string };

/** What stops the mapping from being used: required columns left out, one file column chosen twice. */
export function mappingIssues(columns: UploadPreview['columns'], draft: MappingDraft): MappingIssue[] {
  const issues: MappingIssue[] = [];
  const firstUse = new Map<string, string>();
  for (const column of columns) {
    const header = draft[column.name] ?? null;
    if (header === null) {
      if (column.required) {
        issues.push({ column: column.name, message: 'Choose the column of your file that holds this.' });
      }
      continue;
    }
    const earlier = firstUse.get(header);
    if (earlier) {
      issues.push({ column: column.name, message: `“${header}” is already chosen for ${earlier}.` });
    } else {
      firstUse.set(header, column.name);
    }
  }
  return issues;
}

/** The mapping as the API takes it: only the columns the file has. */
export function toColumnMapping(draft: MappingDraft): ColumnMapping {
  const mapping: ColumnMapping = {};
  for (const [column, header] of Object.entries(draft)) if (header) mapping[column] = header;
  return mapping;
}

/** The first sample value of a header, to show beside the choice. */
export function sampleValue(preview: UploadPreview, header: string | null): string | null {
  if (header === null) return null;
  const index = preview.headers.indexOf(header);
  if (index === -1) return null;
  return preview.rows.find((row) => (row[index] ?? '').trim() !== '')?.[index]?.trim() ?? null;
}

/**
 * The monthly periods the sample rows belong to: the `period` column of a summary file, or the month of
 * `measured_at` in a values file. Used to show the right month's report once the file is stored.
 */
export function samplePeriods(kind: UploadKind, preview: UploadPreview, draft: MappingDraft): string[] {
  const header = draft[kind === 'qc-summary' ? 'period' : 'measured_at'] ?? null;
  const index = header === null ? -1 : preview.headers.indexOf(header);
  if (index === -1) return [];
  const periods = new Set<string>();
  for (const row of preview.rows) {
    const match = /^(\d{4}-(0[1-9]|1[0-2]))/.exec((row[index] ?? '').trim());
    if (match) periods.add(match[1]);
  }
  return [...periods].sort();
}

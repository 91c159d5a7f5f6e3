// Pure helpers of the report table: naming the peer tier in words, keys of rows, the worst flag of a
// row, and the filters (flagged only, analyte, severity).
import type { PeerReportRow, PeerTier, ReportFlag } from '@plumbline/contracts';

/** What the lab is compared with, in words. */
export const peerTierWords: Record<PeerTier, string> = {
  instrument: 'same instrument, method and reagent',
  method: 'same method, any instrument',
  analyte: 'all methods for the analyte',
};

export type Severity = ReportFlag['severity'];
const order: readonly Severity[] = ['fine', 'acceptable', 'warning', 'action'];

/** Identifies a row across the report, comments and the drill-down. */
export function reportRowKey(row: { procedureId: string; controlLotId: string; level: number }): string {
  return `${row.procedureId}/${row.controlLotId}/${row.level}`;
}

export function keyOfRow(row: PeerReportRow): string {
  return reportRowKey({ procedureId: row.procedure.id, controlLotId: row.controlLot.id, level: row.level });
}

/** The worst severity among the row's flags; null when the row has no flag at all. */
export function worstFlag(row: PeerReportRow): Severity | null {
  let worst: Severity | null = null;
  for (const flag of row.flags) {
    if (worst === null || order.indexOf(flag.severity) > order.indexOf(worst)) worst = flag.severity;
  }
  return worst;
}

/** A row to look at: a warning or action flag. */
export function isFlagged(row: PeerReportRow): boolean {
  const worst = worstFlag(row);
  return worst === 'warning' || worst === 'action';
}

export type ReportFilters = {
  flaggedOnly: boolean;
  /** Analyte code; '' for every analyte. */
  analyte: string;
  /** Only rows whose worst flag is this severity; '' for any. */
  severity: Severity | '';
};

export const noFilters: ReportFilters = { flaggedOnly: false, analyte: '', severity: '' };

export function filterRows(rows: readonly PeerReportRow[], filters: ReportFilters): PeerReportRow[] {
  return rows.filter((row) => {
    // A row that cannot be computed needs a look as much as a flagged one.
    if (filters.flaggedOnly && !isFlagged(row) && !row.notComputable) return false;
    if (filters.analyte && row.analyte.code !== filters.analyte) return false;
    if (filters.severity && (worstFlag(row) ?? 'fine') !== filters.severity) return false;
    return true;
  });
}

/** The analytes of the report, for the filter, by name. */
export function analytesOf(rows: readonly PeerReportRow[]): { code: string; name: string }[] {
  const byCode = new Map(rows.map((row) => [row.analyte.code, row.analyte.name]));
  return [...byCode].map(([code, name]) => ({ code, name })).sort((a, b) => a.name.localeCompare(b.name));
}

/** A figure with a fixed number of decimals, or an em dash when there is none. */
export function fixed(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined ? '—' : value.toFixed(decimals);
}

/** A signed figure with a true minus sign: "+1.25", "−0.40". */
export function signed(value: number | null | undefined, decimals = 2): string {
  if (value === null || value === undefined) return '—';
  const text = Math.abs(value).toFixed(decimals);
  if (Number(text) === 0) return text;
  return `${value > 0 ? '+' : '\u2212'}${text}`;
}

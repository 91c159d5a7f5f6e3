import { shiftsSignalledIn } from '../procedure-events/procedure-shifts.service.ts';
import type { UnitSystem } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import type { Principal } from '../../auth/principal.ts';
import { buildPeerReport } from '../peer-report/peer-report.service.ts';
import { listComments, getPeriodSignoff } from '../lab-review/lab-review.service.ts';
import { testMenu } from '../lab-procedures/lab-procedures.service.ts';
import { listLabUploads } from '../uploads/uploads.service.ts';
import { buildDrilldown } from '../report-drilldown/report-drilldown.service.ts';
import { visibleLab } from '../lab-review/lab-scope.ts';
import { commentsCsv, peerReportCsv, testMenuCsv, uploadsCsv, worstFlag } from './report-csv.ts';
import { renderMonthlyReportPdf } from './monthly-report-pdf.ts';

type ExportDeps = Pick<AppDeps, 'db' | 'storage' | 'ingestQueue'>;

/** At most this many flagged rows get charts in the PDF (the rest are listed), so a bad month stays printable. */
export const MAX_CHARTED_ROWS = 24;

export type FileExport = { filename: string; contentType: string; body: string | Buffer };

const csvFile = (filename: string, body: string): FileExport => ({
  filename,
  contentType: 'text/csv; charset=utf-8',
  body,
});

export async function peerReportCsvExport(
  deps: ExportDeps,
  principal: Principal,
  labId: string,
  period: string,
  units?: UnitSystem,
) {
  const report = await buildPeerReport(deps.db, principal, labId, period, { units });
  return csvFile(`peer-report-${report.lab.code}-${period}.csv`, peerReportCsv(report));
}

export async function commentsCsvExport(
  deps: ExportDeps,
  principal: Principal,
  labId: string,
  period?: string,
) {
  const lab = await visibleLab(deps.db, principal, labId);
  const comments = await listComments(deps.db, principal, labId, period);
  return csvFile(`comments-${lab.code}${period ? `-${period}` : ''}.csv`, commentsCsv(comments));
}

export async function testMenuCsvExport(deps: ExportDeps, principal: Principal, labId: string) {
  const lab = await visibleLab(deps.db, principal, labId);
  return csvFile(`test-menu-${lab.code}.csv`, testMenuCsv(await testMenu(deps.db, principal, labId)));
}

export async function uploadsCsvExport(deps: ExportDeps, principal: Principal, labId: string) {
  const lab = await visibleLab(deps.db, principal, labId);
  return csvFile(`uploads-${lab.code}.csv`, uploadsCsv(await listLabUploads(deps, principal, labId)));
}

/** The monthly report as PDF: the report table with flags, charts of flagged rows, comments, sign-off, caution. */
export async function monthlyReportPdf(
  deps: ExportDeps,
  principal: Principal,
  labId: string,
  period: string,
  units?: UnitSystem,
  now = new Date(),
): Promise<FileExport> {
  const report = await buildPeerReport(deps.db, principal, labId, period, { units });
  const flaggedRows = report.rows.filter((r) => {
    const worst = worstFlag(r.flags);
    return worst === 'warning' || worst === 'action';
  });
  const flagged = [];
  for (const row of flaggedRows.slice(0, MAX_CHARTED_ROWS)) {
    const drilldown = await buildDrilldown(
      deps.db,
      principal,
      labId,
      { procedureId: row.procedure.id, controlLotId: row.controlLot.id, level: row.level },
      { period, target: 'lab', units: report.units },
    );
    flagged.push({ row, drilldown });
  }
  const comments = await listComments(deps.db, principal, labId, period);
  const { signoff } = await getPeriodSignoff(deps.db, principal, labId, period);
  const shifts = await shiftsSignalledIn(deps.db, principal, labId, period);
  const body = await renderMonthlyReportPdf({
    shifts,
    report,
    flagged,
    flaggedNotCharted: Math.max(0, flaggedRows.length - MAX_CHARTED_ROWS),
    comments,
    signoff,
    generatedAt: now,
  });
  return { filename: `peer-report-${report.lab.code}-${period}.pdf`, contentType: 'application/pdf', body };
}

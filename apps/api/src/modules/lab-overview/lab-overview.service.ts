import type { AttentionItem, LabOverview, ReportFlag, SeverityCounts } from '@plumbline/contracts';
import type { Database } from '@plumbline/db';
import type { AppDeps } from '../../deps.ts';
import type { Principal } from '../../auth/principal.ts';
import { buildPeerReport } from '../peer-report/peer-report.service.ts';
import { listLabUploads } from '../uploads/uploads.service.ts';
import { findSignoff, visibleLab } from '../lab-review/lab-scope.ts';
import { toSignoff } from '../lab-review/lab-review.service.ts';
import { findSignoffWithSigner } from '../lab-review/lab-review.repository.ts';
import * as repo from './lab-overview.repository.ts';
import { shiftsSignalledIn } from '../procedure-events/procedure-shifts.service.ts';

const DAY_MS = 24 * 60 * 60 * 1000;
/** Deadline this close (or past) turns a reminder into a warning (common practice, a choice of ours). */
const DEADLINE_WARNING_DAYS = 7;

const severityRank: Record<ReportFlag['severity'], number> = {
  fine: 0,
  acceptable: 1,
  warning: 2,
  action: 3,
};
const attentionRank: Record<AttentionItem['severity'], number> = { action: 0, warning: 1, info: 2 };

const emptyCounts = (): SeverityCounts => ({ fine: 0, acceptable: 0, warning: 0, action: 0 });

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function item(
  partial: Pick<AttentionItem, 'kind' | 'severity' | 'message'> & Partial<AttentionItem>,
): AttentionItem {
  return { period: null, uploadId: null, count: null, ...partial };
}

/**
 * What a lab sees first: the period it is submitting for, the flags of its latest report, its latest
 * uploads and what needs doing next.
 */
export async function labOverview(
  deps: Pick<AppDeps, 'db' | 'storage' | 'ingestQueue'>,
  principal: Principal,
  labId: string,
  now = new Date(),
): Promise<LabOverview> {
  const db: Database = deps.db;
  const lab = await visibleLab(db, principal, labId);
  const periods = await repo.listPeriods(db);
  const withData = await repo.labPeriodsWithData(db, labId);
  const attention: AttentionItem[] = [];

  // The period being submitted: the earliest open one, else the latest.
  const current = periods.find((p) => p.state === 'open') ?? periods.at(-1) ?? null;
  let currentPeriod: LabOverview['currentPeriod'] = null;
  if (current) {
    const data = withData.find((d) => d.period === current.period);
    const submitted = Boolean(data && data.rows > 0);
    const daysToDeadline = Math.floor((current.deadline.getTime() - now.getTime()) / DAY_MS);
    const pastDeadline = current.deadline.getTime() < now.getTime();
    const signoffRow = await findSignoffWithSigner(db, labId, current.period);
    currentPeriod = {
      period: current.period,
      state: current.state,
      deadline: current.deadline.toISOString(),
      submitted,
      late: (pastDeadline && !submitted) || Boolean(data && data.lateRows > 0),
      daysToDeadline,
      signoff: signoffRow ? toSignoff(signoffRow) : null,
    };

    const procedures = await repo.activeProceduresWithData(db, labId, current.period);
    if (procedures.length === 0) {
      attention.push(
        item({
          kind: 'no-procedures',
          severity: 'action',
          message:
            'The lab has no active measurement procedure: register its test menu before uploading QC data.',
          count: 0,
        }),
      );
    } else if (current.state === 'open') {
      const urgency: AttentionItem['severity'] = pastDeadline
        ? 'action'
        : daysToDeadline < DEADLINE_WARNING_DAYS
          ? 'warning'
          : 'info';
      const missing = procedures.filter((p) => !p.hasData);
      if (!submitted) {
        attention.push(
          item({
            kind: 'data-due',
            severity: urgency,
            period: current.period,
            message: pastDeadline
              ? `No QC data for ${current.period} yet, and the deadline (${current.deadline.toISOString().slice(0, 10)}) has passed.`
              : `QC data for ${current.period} is due by ${current.deadline.toISOString().slice(0, 10)} (${plural(daysToDeadline, 'day')} left).`,
          }),
        );
      } else if (missing.length > 0) {
        attention.push(
          item({
            kind: 'missing-data',
            severity: urgency === 'info' ? 'info' : 'warning',
            period: current.period,
            count: missing.length,
            message: `${plural(missing.length, 'procedure')} without data for ${current.period}: ${missing
              .slice(0, 8)
              .map((p) => p.code)
              .join(', ')}${missing.length > 8 ? ', …' : ''}.`,
          }),
        );
      }
    }
  }

  // Uploads: the five latest; those waiting for a decision or failed.
  const uploads = await listLabUploads(deps, principal, labId);
  const recentUploads = uploads.slice(0, 5);
  for (const upload of uploads.filter((u) => u.status === 'needs-review')) {
    attention.push(
      item({
        kind: 'upload-needs-review',
        severity: 'warning',
        uploadId: upload.id,
        count: upload.rowsRejected,
        message: `"${upload.filename}" has ${plural(upload.rowsRejected, 'rejected row')}: store its valid rows or cancel it.`,
      }),
    );
  }
  for (const upload of recentUploads.filter((u) => u.status === 'failed')) {
    attention.push(
      item({
        kind: 'upload-failed',
        severity: 'warning',
        uploadId: upload.id,
        message: `"${upload.filename}" could not be read${upload.failureMessage ? `: ${upload.failureMessage}` : '.'}`,
      }),
    );
  }

  // Past periods with data that nobody signed.
  const unsigned = withData.filter((d) => d.signedAt === null && (!current || d.period < current.period));
  if (unsigned.length > 0) {
    attention.push(
      item({
        kind: 'unsigned-period',
        severity: 'warning',
        period: unsigned[0].period,
        count: unsigned.length,
        message:
          unsigned.length === 1
            ? `The review of ${unsigned[0].period} is not signed off yet.`
            : `${unsigned.length} periods are not signed off yet (latest ${unsigned[0].period}).`,
      }),
    );
  }

  // Flags of the latest period with data.
  let flags: LabOverview['flags'] = null;
  const latest = withData[0]?.period;
  if (latest) {
    const report = await buildPeerReport(db, principal, labId, latest, { units: lab.preferredUnits });
    const bySeverity = emptyCounts();
    const rowsBySeverity = emptyCounts();
    let rowsNotComputable = 0;
    for (const row of report.rows) {
      if (row.notComputable) {
        rowsNotComputable += 1;
        continue;
      }
      let worst: ReportFlag['severity'] = 'fine';
      for (const flag of row.flags) {
        bySeverity[flag.severity] += 1;
        if (severityRank[flag.severity] > severityRank[worst]) worst = flag.severity;
      }
      rowsBySeverity[worst] += 1;
    }
    flags = {
      period: latest,
      published: report.published !== null,
      rows: report.rows.length,
      rowsBySeverity,
      rowsNotComputable,
      bySeverity,
    };
    if (rowsNotComputable > 0) {
      attention.push(
        item({
          kind: 'rows-not-computable',
          severity: 'warning',
          period: latest,
          count: rowsNotComputable,
          message: `${plural(rowsNotComputable, 'report row')} of ${latest} cannot be computed; the report says why for each.`,
        }),
      );
    }
    const signed = Boolean(await findSignoff(db, labId, latest));
    if (rowsBySeverity.action > 0) {
      attention.push(
        item({
          kind: 'action-flags',
          severity: signed ? 'info' : 'action',
          period: latest,
          count: rowsBySeverity.action,
          message: `${plural(rowsBySeverity.action, 'report row')} of ${latest} ${rowsBySeverity.action === 1 ? 'has' : 'have'} an action flag: investigate and comment.`,
        }),
      );
    }
    if (rowsBySeverity.warning > 0) {
      attention.push(
        item({
          kind: 'warning-flags',
          severity: signed ? 'info' : 'warning',
          period: latest,
          count: rowsBySeverity.warning,
          message: `${plural(rowsBySeverity.warning, 'report row')} of ${latest} ${rowsBySeverity.warning === 1 ? 'has' : 'have'} a warning flag.`,
        }),
      );
    }
  }

  if (flags) attention.push(...(await shiftAttention(db, principal, labId, flags.period)));

  attention.sort((a, b) => attentionRank[a.severity] - attentionRank[b.severity]);
  return {
    lab: { id: lab.id, code: lab.code, name: lab.name, preferredUnits: lab.preferredUnits },
    currentPeriod,
    flags,
    recentUploads,
    attention,
  };
}

/** Shifts of the lab's procedures signalled in `period`, each with the nearest earlier recorded event. */
async function shiftAttention(
  db: Database,
  principal: Principal,
  labId: string,
  period: string,
): Promise<AttentionItem[]> {
  return (await shiftsSignalledIn(db, principal, labId, period)).map(({ procedureCode, shift }) => {
    const event = shift.events[0];
    return item({
      kind: 'shift-detected',
      severity: 'warning',
      period,
      count: null,
      message:
        `${procedureCode} (lot ${shift.controlLot}, level ${shift.level}): SDI shifted ${shift.direction} by ` +
        `${Math.abs(shift.sizeSdi).toFixed(1)} from ${shift.period}` +
        (event
          ? `; recorded before it: ${event.kind} on ${event.occurredOn}${event.note ? ` (${event.note})` : ''}.`
          : '; no event recorded before it.'),
    });
  });
}

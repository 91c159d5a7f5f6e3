import {
  toCsv,
  type Comment,
  type PeerReport,
  type ReportFlag,
  type TestMenuItem,
  type UploadSummary,
} from '@plumbline/contracts';

const severityRank: Record<ReportFlag['severity'], number> = {
  fine: 0,
  acceptable: 1,
  warning: 2,
  action: 3,
};

/** The worst flag of a row, or null when it has none (no peer comparison). */
export function worstFlag(flags: readonly ReportFlag[]): ReportFlag['severity'] | null {
  let worst: ReportFlag['severity'] | null = null;
  for (const f of flags)
    if (worst === null || severityRank[f.severity] > severityRank[worst]) worst = f.severity;
  return worst;
}

/** The peer report as CSV: one line per procedure, lot and level; numbers unrounded, in the report's units. */
export function peerReportCsv(report: PeerReport): string {
  const figures = report.published ? `published v${report.published.version}` : 'provisional';
  return toCsv(
    [
      'period',
      'lab',
      'figures',
      'procedure',
      'analyte',
      'control_lot',
      'level',
      'unit',
      'lab_n',
      'lab_mean',
      'lab_sd',
      'lab_cv_pct',
      'peer_tier',
      'peer_labs',
      'peer_n',
      'peer_mean',
      'peer_sd',
      'peer_cv_pct',
      'peer_within_cv_pct',
      'sdi',
      'cvr',
      'bias_pct',
      'sigma',
      'tea_pct',
      'tea_source',
      'cumulative_sdi',
      'cumulative_cvr',
      'worst_flag',
      'flags',
      'excluded',
      'peer_note',
      'late',
      'not_computable',
      'cumulative_not_computable',
    ],
    report.rows.map((r) => [
      report.period,
      report.lab.code,
      figures,
      r.procedure.code,
      r.analyte.name,
      r.controlLot.lotNumber,
      r.level,
      r.unit,
      r.lab.n,
      r.lab.mean,
      r.lab.sd,
      r.lab.cv,
      r.peer?.tier,
      r.peer?.labs,
      r.peer?.n,
      r.peer?.mean,
      r.peer?.sd,
      r.peer?.cv,
      r.peer?.withinCv,
      r.sdi,
      r.cvr,
      r.biasPct,
      r.sigma,
      r.tea?.pct ?? null,
      r.analyte.teaSource,
      r.cumulative.sdi,
      r.cumulative.cvr,
      worstFlag(r.flags),
      r.flags.map((f) => `${f.kind}:${f.severity}`).join(' '),
      r.excluded ? `${r.excluded.reason}${r.excluded.note ? `: ${r.excluded.note}` : ''}` : '',
      r.peerNote,
      r.late ? 'yes' : 'no',
      r.notComputable?.reason,
      r.cumulative.notComputable?.reason,
    ]),
  );
}

export function commentsCsv(comments: readonly Comment[]): string {
  return toCsv(
    ['period', 'procedure', 'analyte', 'control_lot', 'level', 'author', 'created_at', 'comment'],
    comments.map((c) => [
      c.period,
      c.procedure.code,
      c.analyte.name,
      c.controlLot.lotNumber,
      c.level,
      c.author.name,
      c.createdAt,
      c.body,
    ]),
  );
}

export function testMenuCsv(items: readonly TestMenuItem[]): string {
  return toCsv(
    [
      'code',
      'analyte_code',
      'analyte',
      'loinc',
      'instrument_model',
      'method',
      'reagent',
      'unit',
      'analyte_unit',
      'created_at',
      'retired_at',
    ],
    items.map((p) => [
      p.code,
      p.analyte.code,
      p.analyte.name,
      p.analyte.loinc,
      p.instrumentModel.name,
      p.method.name,
      p.reagent.name,
      p.unit,
      p.analyte.unit,
      p.createdAt,
      p.retiredAt,
    ]),
  );
}

export function uploadsCsv(uploads: readonly UploadSummary[]): string {
  return toCsv(
    [
      'created_at',
      'filename',
      'kind',
      'status',
      'rows_total',
      'rows_accepted',
      'rows_rejected',
      'size_bytes',
      'sha256',
      'via',
      'uploaded_by',
      'stored_at',
      'confirmed_at',
      'failure',
    ],
    uploads.map((u) => [
      u.createdAt,
      u.filename,
      u.kind,
      u.status,
      u.rowsTotal,
      u.rowsAccepted,
      u.rowsRejected,
      u.size,
      u.sha256,
      u.via,
      u.uploadedBy?.name,
      u.storedAt,
      u.confirmedAt,
      u.failureMessage,
    ]),
  );
}

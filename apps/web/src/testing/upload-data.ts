// Invented uploads, previews and reports for web tests, parsed with the contract schemas so they stay
// in step with the wire format.
import {
  peerReportSchema,
  periodListSchema,
  uploadDetailSchema,
  uploadPreviewSchema,
  uploadSummarySchema,
  canonicalColumns,
  type PeerReport,
  type UploadDetail,
  type UploadPreview,
  type UploadSummary,
} from '@plumbline/contracts';
import { buildMe } from './data.ts';

export const testLabId = buildMe('analyst').lab!.id;
export const testUploadId = '3c2b8f9e-1d4a-4f6b-9e2c-7a5d1b3c9e01';

export function buildUploadSummary(overrides: Partial<UploadSummary> = {}): UploadSummary {
  return uploadSummarySchema.parse({
    id: testUploadId,
    labId: testLabId,
    kind: 'qc-summary',
    filename: 'november-summary.csv',
    size: 1840,
    sha256: 'a3f1c9e07b4d2a6158e9c0d7f3b2a1e4c5d6b7a8f9e0d1c2b3a4f5e6d7c8b9a0',
    status: 'queued',
    progress: 0,
    rowsTotal: 0,
    rowsAccepted: 0,
    rowsRejected: 0,
    failureMessage: null,
    duplicateOf: null,
    via: 'user',
    uploadedBy: { id: buildMe('analyst').id, name: buildMe('analyst').name },
    createdAt: '2026-12-01T09:30:00.000Z',
    storedAt: null,
    confirmedAt: null,
    ...overrides,
  });
}

export function buildUploadDetail(overrides: Partial<UploadDetail> = {}): UploadDetail {
  const { errors = [], errorsTruncated = false, columnMapping = null, errorsTotal, ...summary } = overrides;
  return uploadDetailSchema.parse({
    ...buildUploadSummary(summary),
    errors,
    errorsTotal: errorsTotal ?? errors.length,
    errorsTruncated,
    columnMapping,
  });
}

/** A summary file whose headers are the lab's own names, not the canonical ones. */
export function buildSummaryPreview(overrides: Partial<UploadPreview> = {}): UploadPreview {
  return uploadPreviewSchema.parse({
    kind: 'qc-summary',
    delimiter: ';',
    decimalComma: true,
    bom: false,
    headers: ['Month', 'Test code', 'Lot', 'Lvl', 'Count', 'Average', 'Std dev', 'Units'],
    rows: [
      ['2026-11', 'K1', 'PGC-26187', '1', '31', '4,12', '0,05', 'mmol/L'],
      ['2026-11', 'K1', 'PGC-26187', '2', '31', '6,48', '0,08', 'mmol/L'],
    ],
    suggestedMapping: {
      period: 'Month',
      procedure: 'Test code',
      control_lot: 'Lot',
      level: 'Lvl',
      n: 'Count',
      mean: 'Average',
      sd: 'Std dev',
      unit: 'Units',
    },
    mappingSource: 'saved',
    missingColumns: [],
    columns: canonicalColumns['qc-summary'].map((c) => ({ ...c })),
    ...overrides,
  });
}

export function buildPeriods() {
  return periodListSchema.parse([
    { period: '2026-12', state: 'open', deadline: '2027-01-10T23:59:00.000Z' },
    { period: '2026-11', state: 'open', deadline: '2026-12-10T23:59:00.000Z' },
    { period: '2026-10', state: 'published', deadline: '2026-11-10T23:59:00.000Z' },
  ]);
}

export function buildPeerReport(
  period: string,
  rows: { code: string; level: number; mean: number }[],
): PeerReport {
  return peerReportSchema.parse({
    period,
    lab: buildMe('analyst').lab,
    units: 'si',
    published: null,
    statisticsPending: false,
    rows: rows.map((row, index) => ({
      procedure: {
        id: `7e1f0c2a-5b3d-4e8f-9a1b-2c3d4e5f60${String(index).padStart(2, '0')}`,
        code: row.code,
      },
      analyte: {
        code: 'K',
        name: 'Potassium',
        unit: 'mmol/L',
        decimals: 2,
        teaPct: null,
        teaAbsolute: null,
        teaSource: null,
      },
      controlLot: { id: '5a4b3c2d-1e0f-4a9b-8c7d-6e5f4a3b2c1d', lotNumber: 'PGC-26187' },
      level: row.level,
      unit: 'mmol/L',
      canonicalUnit: 'mmol/L',
      decimals: 2,
      source: 'summary',
      late: false,
      lab: { n: 31, mean: row.mean, sd: 0.05, cv: 1.2 },
      peer: null,
      peerNote: 'too few labs in every peer group',
      sdi: null,
      cvr: null,
      biasPct: null,
      sigma: null,
      tea: null,
      cumulative: { lab: null, peer: null, sdi: null, cvr: null, notComputable: null },
      notComputable: null,
      excluded: null,
      flags: [],
    })),
  });
}

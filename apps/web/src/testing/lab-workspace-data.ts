// Invented peer-report rows, comments, sign-offs and drill-downs for the lab workspace's web tests,
// parsed with the contract schemas so they stay in step with the wire format.
import {
  commentSchema,
  drilldownSchema,
  peerReportRowSchema,
  peerReportSchema,
  signoffSchema,
  type Comment,
  type Drilldown,
  type PeerReport,
  type PeerReportRow,
  type Signoff,
} from '@plumbline/contracts';
import { buildMe } from './data.ts';

export const testLabId = buildMe('analyst').lab!.id;
export const lotId = '5a4b3c2d-1e0f-4a9b-8c7d-6e5f4a3b2c1d';
export const potassiumProcedureId = '7e1f0c2a-5b3d-4e8f-9a1b-2c3d4e5f6001';
export const glucoseProcedureId = '7e1f0c2a-5b3d-4e8f-9a1b-2c3d4e5f6002';

type RowInput = {
  procedureId: string;
  code: string;
  analyte: { code: string; name: string };
  level: number;
  labMean: number;
  peerMean: number;
  sdi: number;
  cvr: number;
  flags: PeerReportRow['flags'];
};

export function buildReportRow(input: RowInput): PeerReportRow {
  return peerReportRowSchema.parse({
    procedure: { id: input.procedureId, code: input.code },
    analyte: {
      ...input.analyte,
      unit: 'mmol/L',
      decimals: 2,
      teaPct: 5.8,
      teaAbsolute: null,
      teaSource: 'network quality specification',
    },
    controlLot: { id: lotId, lotNumber: 'PGC-26187' },
    level: input.level,
    unit: 'mmol/L',
    canonicalUnit: 'mmol/L',
    decimals: 2,
    source: 'summary',
    late: false,
    lab: { n: 30, mean: input.labMean, sd: 0.05, cv: 1.2 },
    peer: { tier: 'instrument', labs: 6, n: 180, mean: input.peerMean, sd: 0.06, cv: 1.4, withinCv: 1.1 },
    peerNote: 'compared with the narrowest peer group',
    sdi: input.sdi,
    cvr: input.cvr,
    biasPct: (100 * (input.labMean - input.peerMean)) / input.peerMean,
    sigma: 3.1,
    tea: { pct: 5.8, governing: 'percent' },
    cumulative: { lab: null, peer: null, sdi: input.sdi - 0.2, cvr: null, notComputable: null },
    notComputable: null,
    excluded: null,
    flags: input.flags,
  });
}

/** Three results: potassium level 1 with an action flag, level 2 with a warning, glucose fine. */
export function buildLabReport(period = '2026-11', published: PeerReport['published'] = null): PeerReport {
  const potassium = { code: 'K', name: 'Potassium' };
  return peerReportSchema.parse({
    period,
    lab: buildMe('analyst').lab,
    units: 'si',
    published,
    statisticsPending: false,
    rows: [
      buildReportRow({
        procedureId: potassiumProcedureId,
        code: 'K-CHEM2',
        analyte: potassium,
        level: 1,
        labMean: 4.42,
        peerMean: 4.15,
        sdi: 4.5,
        cvr: 0.9,
        flags: [
          { kind: 'sdi', severity: 'action', message: 'SDI +4.50 is beyond ±3' },
          { kind: 'cvr', severity: 'fine', message: 'CVR 0.90 is within 1' },
        ],
      }),
      buildReportRow({
        procedureId: potassiumProcedureId,
        code: 'K-CHEM2',
        analyte: potassium,
        level: 2,
        labMean: 6.71,
        peerMean: 6.52,
        sdi: 2.4,
        cvr: 1.1,
        flags: [
          { kind: 'sdi', severity: 'warning', message: 'SDI +2.40 is beyond ±2' },
          { kind: 'cvr', severity: 'acceptable', message: 'CVR 1.10 is within 1.5' },
        ],
      }),
      buildReportRow({
        procedureId: glucoseProcedureId,
        code: 'GLU-CHEM2',
        analyte: { code: 'GLU', name: 'Glucose' },
        level: 1,
        labMean: 5.51,
        peerMean: 5.5,
        sdi: 0.2,
        cvr: 0.8,
        flags: [
          { kind: 'sdi', severity: 'fine', message: 'SDI +0.20 is within 1' },
          { kind: 'cvr', severity: 'fine', message: 'CVR 0.80 is within 1' },
        ],
      }),
    ],
  });
}

export function buildComment(overrides: Partial<Comment> = {}): Comment {
  return commentSchema.parse({
    id: '8d7c6b5a-4f3e-4d2c-9b1a-0f9e8d7c6b01',
    labId: testLabId,
    period: '2026-11',
    procedure: { id: potassiumProcedureId, code: 'K-CHEM2' },
    analyte: { code: 'K', name: 'Potassium' },
    controlLot: { id: lotId, lotNumber: 'PGC-26187' },
    level: 1,
    body: 'Recalibrated the potassium electrode on 14 November; level 1 back within 1 SD.',
    author: { id: buildMe('analyst').id, name: buildMe('analyst').name },
    createdAt: '2026-12-01T09:00:00.000Z',
    ...overrides,
  });
}

export function buildSignoff(overrides: Partial<Signoff> = {}): Signoff {
  return signoffSchema.parse({
    labId: testLabId,
    period: '2026-11',
    statement: 'Reviewed all November results; the potassium bias was corrected by recalibration.',
    signedBy: { id: buildMe('supervisor').id, name: buildMe('supervisor').name },
    signedAt: '2026-12-02T10:15:00.000Z',
    ...overrides,
  });
}

export function buildDrilldown(overrides: Partial<Drilldown> = {}): Drilldown {
  const days = [0.3, -0.5, 0.8, -0.2, 3.8, -0.4];
  return drilldownSchema.parse({
    period: '2026-11',
    procedure: { id: potassiumProcedureId, code: 'K-CHEM2' },
    analyte: { code: 'K', name: 'Potassium' },
    controlLot: { id: lotId, lotNumber: 'PGC-26187' },
    level: 1,
    units: 'si',
    unit: 'mmol/L',
    decimals: 2,
    peer: { tier: 'instrument', labs: 6 },
    trend: ['2026-08', '2026-09', '2026-10', '2026-11'].map((period, i) => ({
      period,
      sdi: [3.9, 4.2, 4.1, 4.5][i],
      cvr: [0.9, 1.0, 0.8, 0.9][i],
      biasPct: [5.5, 6.1, 5.9, 6.5][i],
      labMean: 4.4,
      labSd: 0.05,
      peerMean: 4.15,
      peerSd: 0.06,
      tier: 'instrument',
      published: period !== '2026-11',
    })),
    distribution: {
      labMeans: [4.11, 4.14, 4.15, 4.18, 4.42].map((mean, i) => ({ mean, own: i === 4, excluded: false })),
      peerMean: 4.15,
      peerSd: 0.06,
    },
    twoLevel: {
      levels: [1, 2],
      points: [
        { sdi1: -0.6, sdi2: -0.2, own: false },
        { sdi1: 0.3, sdi2: 0.5, own: false },
        { sdi1: 4.5, sdi2: 2.4, own: true },
      ],
    },
    leveyJennings: {
      target: { kind: 'lab', basis: 'established', mean: 4.4, sd: 0.05 },
      points: days.map((z, i) => ({
        measuredAt: `2026-11-${String(10 + i).padStart(2, '0')}T08:00:00.000Z`,
        run: `R${i + 1}`,
        value: Number((4.4 + z * 0.05).toFixed(3)),
        z,
        rules: z > 3 ? ['1-2s', '1-3s'] : [],
      })),
      runs: days.map((z, i) => ({
        run: `R${i + 1}`,
        verdict: z > 3 ? 'reject' : 'accept',
        rules: z > 3 ? ['1-2s', '1-3s'] : [],
      })),
    },
    uncertainty: {
      uRw: 1.2,
      rmsBias: 6.0,
      uRef: 0.6,
      uBias: 6.03,
      uc: 6.15,
      U: 12.3,
      k: 2,
      longTerm: { periods: 4, n: 120, mean: 4.4, sd: 0.053, cv: 1.2 },
      comparisons: [{ period: '2026-11', biasPct: 6.5, uRefPct: 0.6 }],
    },
    uncertaintyNote: null,
    notComputable: [],
    ...overrides,
  });
}

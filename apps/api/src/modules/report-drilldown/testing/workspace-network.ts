import { peerStatistics as computePeerStatistics, pool } from '@plumbline/stats';
import { qcSummaries, qcValues, recomputeAllPeerStatistics } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import type { TestApp } from '../../../testing/test-app.ts';

/**
 * Test support for the lab workspace: an invented network of six labs (A–F) on one instrument model,
 * each with a glucose (mmol/L) and a creatinine (umol/L) procedure, monthly summaries for 2026-01..03 at
 * both levels of one control lot stored directly, provisional peer statistics recomputed, and lab A's
 * daily glucose values for 2026-03. Every figure is made up.
 */

export const LAB_NAMES = ['A', 'B', 'C', 'D', 'E', 'F'] as const;
export type LabName = (typeof LAB_NAMES)[number];
export const PERIODS = ['2026-01', '2026-02', '2026-03'] as const;

export type Summary = { n: number; mean: number; sd: number };
/** summaries[analyte][lab][period][level] */
export type SummaryTable = Record<
  'glucose' | 'creatinine',
  Record<LabName, Record<string, Record<number, Summary>>>
>;

// Lab offsets from the common mean (fractions), and a small drift per period; lab A reads high in March.
const offsets: Record<LabName, number> = { A: 0.004, B: -0.012, C: 0.006, D: -0.004, E: 0.011, F: -0.008 };
const drift: Record<string, number> = { '2026-01': 0, '2026-02': 0.003, '2026-03': -0.002 };
const marchShiftOfA = 0.08;
const base = {
  glucose: { 1: { mean: 5.5, cv: 2.2 }, 2: { mean: 15.2, cv: 1.9 } },
  creatinine: { 1: { mean: 82, cv: 3.1 }, 2: { mean: 410, cv: 2.4 } },
} as const;

function buildTable(): SummaryTable {
  const table = { glucose: {}, creatinine: {} } as SummaryTable;
  for (const analyte of ['glucose', 'creatinine'] as const) {
    LAB_NAMES.forEach((lab, labIndex) => {
      table[analyte][lab] = {};
      PERIODS.forEach((period, periodIndex) => {
        table[analyte][lab][period] = {};
        for (const level of [1, 2] as const) {
          const b = base[analyte][level];
          const shift =
            offsets[lab] + drift[period] + (lab === 'A' && period === '2026-03' ? marchShiftOfA : 0);
          const mean = Number((b.mean * (1 + shift * (level === 2 ? 0.8 : 1))).toFixed(4));
          const cv = b.cv * (1 + 0.05 * ((labIndex + periodIndex) % 4));
          table[analyte][lab][period][level] = {
            n: 18 + ((labIndex * 3 + periodIndex) % 7),
            mean,
            sd: Number(((mean * cv) / 100).toFixed(5)),
          };
        }
      });
    });
  }
  return table;
}

/** Lab A's daily glucose values of 2026-03 as z-scores against its own established figures (Jan + Feb pooled). */
export const MARCH_Z = {
  1: [
    0.3, -0.5, 1.1, -0.2, 0.8, -1.2, 0.4, 3.4, -0.6, 0.2, -0.9, 1.3, 0.1, 2.3, 2.4, -0.3, 0.5, -1.1, 0.7,
    -0.4,
  ],
  2: [
    0.1, 0.6, -0.4, 0.9, -0.7, 0.2, -1.3, 0.5, 0.3, -0.2, 1.0, -0.5, 0.4, 1.6, 2.2, 0.8, -0.6, 0.3, -0.9, 0.2,
  ],
} as const;

export type WorkspaceLab = {
  id: string;
  code: string;
  glucose: string;
  creatinine: string;
  analyst: { id: string; auth: string; name: string };
  supervisor: { id: string; auth: string; name: string };
};

export async function seedWorkspaceNetwork(t: TestApp) {
  const catalogue: QcCatalogue = await createQcCatalogue(t.db);
  const table = buildTable();
  const labs = {} as Record<LabName, WorkspaceLab>;
  for (const name of LAB_NAMES) {
    const { lab, procedures } = await catalogue.makeLabWithProcedures([
      { code: 'GLU1' },
      { code: 'CREA1', analyte: catalogue.analytes.creatinine },
    ]);
    const analyst = await t.makeUser('analyst', lab.id);
    const supervisor = await t.makeUser('supervisor', lab.id);
    labs[name] = {
      id: lab.id,
      code: lab.code,
      glucose: procedures[0].id,
      creatinine: procedures[1].id,
      analyst,
      supervisor,
    };
    const rows = [];
    for (const analyte of ['glucose', 'creatinine'] as const) {
      for (const period of PERIODS) {
        for (const level of [1, 2]) {
          rows.push({
            labId: lab.id,
            procedureId: analyte === 'glucose' ? procedures[0].id : procedures[1].id,
            controlLotId: catalogue.lot.id,
            level,
            period,
            ...table[analyte][name][period][level],
          });
        }
      }
    }
    await t.db.insert(qcSummaries).values(rows);
  }

  // Lab A's March daily glucose values: one run per day, level 2 five minutes after level 1.
  const values: (typeof qcValues.$inferInsert)[] = [];
  for (const level of [1, 2] as const) {
    const earlier = pool([table.glucose.A['2026-01'][level], table.glucose.A['2026-02'][level]]);
    MARCH_Z[level].forEach((z, day) => {
      const measuredAt = new Date(Date.UTC(2026, 2, day + 1, 8, level === 1 ? 0 : 5));
      values.push({
        labId: labs.A.id,
        procedureId: labs.A.glucose,
        controlLotId: catalogue.lot.id,
        level,
        period: '2026-03',
        measuredAt,
        value: Number((earlier.mean + z * earlier.sd).toFixed(4)),
        run: `R${String(day + 1).padStart(2, '0')}`,
      });
    });
  }
  await t.db.insert(qcValues).values(values);
  await recomputeAllPeerStatistics(t.db);
  return { catalogue, labs, table };
}
export type WorkspaceNetwork = Awaited<ReturnType<typeof seedWorkspaceNetwork>>;

export type Analyte = 'glucose' | 'creatinine';

/** Peer figures of a period recomputed from the stored inputs with @plumbline/stats (docs/methods.md §2). */
export function expectedPeer(net: WorkspaceNetwork, analyte: Analyte, period: string, level: number) {
  return computePeerStatistics(
    LAB_NAMES.map((name) => ({ id: net.labs[name][analyte], ...net.table[analyte][name][period][level] })),
    { minLabs: 3 },
  );
}

/** Lot-to-date peer figures: each lab's months pooled, then peerStatistics (docs/methods.md §1–2). */
export function expectedPeerToDate(net: WorkspaceNetwork, analyte: Analyte, period: string, level: number) {
  return computePeerStatistics(
    LAB_NAMES.map((name) => ({
      id: net.labs[name][analyte],
      ...pool(PERIODS.filter((p) => p <= period).map((p) => net.table[analyte][name][p][level])),
    })),
    { minLabs: 3 },
  );
}

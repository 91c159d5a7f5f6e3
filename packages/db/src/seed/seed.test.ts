import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verify } from '@node-rs/argon2';
import { createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import {
  buildDemoNetwork,
  demoScenarios,
  isDatabaseEmpty,
  seedDemoNetwork,
  type SeedSummary,
} from './index.ts';
import { demoAnalytes } from './catalogue.ts';

const analyte = (code: string) => {
  const found = demoAnalytes.find((a) => a.code === code);
  if (!found) throw new Error(`no analyte ${code}`);
  return found;
};

/** Pooled n, mean and SD of monthly summaries (docs/methods.md §1: N = Σnᵢ, SS = Σ(nᵢ−1)sᵢ² + Σnᵢ(x̄ᵢ−mean)²). */
function pool(rows: { n: number; mean: number; sd: number }[]) {
  const n = rows.reduce((sum, r) => sum + r.n, 0);
  const mean = rows.reduce((sum, r) => sum + r.n * r.mean, 0) / n;
  const ss = rows.reduce((sum, r) => sum + (r.n - 1) * r.sd ** 2 + r.n * (r.mean - mean) ** 2, 0);
  const withinSs = rows.reduce((sum, r) => sum + (r.n - 1) * r.sd ** 2, 0);
  const withinDf = rows.reduce((sum, r) => sum + (r.n - 1), 0);
  return { n, mean, sd: Math.sqrt(ss / (n - 1)), withinSd: Math.sqrt(withinSs / withinDf) };
}

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[middle] : (sorted[middle - 1] + sorted[middle]) / 2;
};

describe('the demo network plan', () => {
  it('when built twice from the same seed, then it is identical; another seed gives other figures', () => {
    const first = buildDemoNetwork(7);
    const again = buildDemoNetwork(7);
    const other = buildDemoNetwork(8);
    expect(JSON.stringify(again)).toBe(JSON.stringify(first));
    expect(other.qcSummaries.map((s) => s.mean)).not.toEqual(first.qcSummaries.map((s) => s.mean));
  });

  it('carries the LOINC code matching each analyte and its canonical unit', () => {
    // LOINC codes from memory (LOINC table, serum or plasma): [Moles/volume] for mmol/L and umol/L,
    // [Mass/volume] for g/L, [Enzymatic activity/volume] for U/L.
    const expected: Record<string, [string, string]> = {
      NA: ['2951-2', 'mmol/L'],
      K: ['2823-3', 'mmol/L'],
      CL: ['2075-0', 'mmol/L'],
      GLU: ['14749-6', 'mmol/L'],
      CREA: ['14682-9', 'umol/L'],
      UREA: ['22664-7', 'mmol/L'],
      CA: ['2000-8', 'mmol/L'],
      ALT: ['1742-6', 'U/L'],
      AST: ['1920-8', 'U/L'],
      ALB: ['1751-7', 'g/L'],
    };
    for (const [code, [loinc, unit]] of Object.entries(expected)) {
      expect([analyte(code).loinc, analyte(code).unit], code).toEqual([loinc, unit]);
    }
  });

  it('stores molar masses that reproduce the textbook conversion factors', () => {
    // Common practice: glucose mg/dL ÷ 18.016 = mmol/L; creatinine umol/L ÷ 88.4 = mg/dL;
    // calcium mg/dL × 0.2495 = mmol/L; urea mmol/L × 6.006 = mg/dL (urea, not urea nitrogen).
    const mgPerDlPerMmolPerL = (molarMass: number) => molarMass / 10;
    expect(mgPerDlPerMmolPerL(analyte('GLU').molarMass!)).toBeCloseTo(18.016, 3);
    expect(1000 / mgPerDlPerMmolPerL(analyte('CREA').molarMass!)).toBeCloseTo(88.4, 1);
    expect(1 / mgPerDlPerMmolPerL(analyte('CA').molarMass!)).toBeCloseTo(0.2495, 4);
    expect(mgPerDlPerMmolPerL(analyte('UREA').molarMass!)).toBeCloseTo(6.006, 3);
  });

  it('states TEa percentages that follow from their stated sources', () => {
    // Biological-variation desirable TEa = 1.65 × 0.5 × CV_I + 0.25 × √(CV_I² + CV_G²) (Fraser; Clin Chem
    // 2005;51:450); potassium CV_I 4.6 %, CV_G 5.6 % → 5.61 % as published in Biochem Med 2018;28(2):020711.
    const bvDesirable = 1.65 * 0.5 * 4.6 + 0.25 * Math.sqrt(4.6 ** 2 + 5.6 ** 2);
    expect(analyte('K').teaPct).toBeCloseTo(bvDesirable, 2);
    // US CLIA 2024 absolute limits (memory) expressed as a percent at the stated concentration.
    expect(analyte('NA').teaPct).toBeCloseTo((100 * 4) / 140, 2);
    expect(analyte('CA').teaPct).toBeCloseTo((100 * 1.0) / 10.0, 2);
    for (const a of demoAnalytes) expect(a.teaSource.length, a.code).toBeGreaterThan(10);
  });

  it('states TEa absolute parts that are the US CLIA 2024 units converted to the canonical unit', () => {
    // US CLIA 2024 acceptance limits (42 CFR 493.931, from memory): glucose ±6 mg/dL, creatinine
    // ±0.2 mg/dL, urea nitrogen ±2 mg/dL, ALT and AST ±6 U/L, each "or ± %, whichever is greater".
    // Conversions from the molar masses (g/mol): mg/dL → mmol/L divides by M/10.
    expect(analyte('GLU').teaAbsolute).toBeCloseTo(6 / (analyte('GLU').molarMass! / 10), 3);
    expect(analyte('CREA').teaAbsolute).toBeCloseTo((0.2 * 10_000) / analyte('CREA').molarMass!, 1);
    // Urea nitrogen: two nitrogen atoms (14.007 g/mol each, IUPAC standard atomic weight) per urea.
    expect(analyte('UREA').teaAbsolute).toBeCloseTo(2 / ((2 * 14.007) / 10), 3);
    expect([analyte('ALT').teaAbsolute, analyte('AST').teaAbsolute]).toEqual([6, 6]);
  });

  it('gives every analyte plausibility limits with a source that hold both control levels', () => {
    for (const a of demoAnalytes) {
      expect(a.plausibilitySource, a.code).toMatch(/common practice/);
      expect(a.plausibleLow, a.code).toBeLessThan(a.plausibleHigh);
      for (const level of a.levels) {
        // Method offsets in the demo are a few percent, lab shifts ±2.5 % (1 SD): 20 % either way is ample.
        expect(level.target * 0.8, a.code).toBeGreaterThan(a.plausibleLow);
        expect(level.target * 1.2, a.code).toBeLessThan(a.plausibleHigh);
      }
    }
  });
});

describe('seeding the demo network into an empty database', () => {
  let scratch: ScratchDatabase;
  let summary: SeedSummary;
  let emptyBefore: boolean;
  const password = 'seed-test-password';

  beforeAll(async () => {
    scratch = await createScratchDatabase('seed');
    emptyBefore = await isDatabaseEmpty(scratch.db);
    summary = await seedDemoNetwork(scratch.db, { password });
  }, 60_000);

  afterAll(async () => {
    await scratch?.drop();
  });

  const query = async <T extends object>(text: string, params: unknown[] = []) =>
    (await scratch.pool.query(text, params)).rows as T[];
  const count = async (table: string) =>
    Number((await query<{ count: string }>(`select count(*) from ${table}`))[0].count);

  it('when the database was fresh, then it was reported empty and is not any more', async () => {
    expect(emptyBefore).toBe(true);
    expect(await isDatabaseEmpty(scratch.db)).toBe(false);
  });

  it('gives three labs routine results for sodium, potassium, creatinine and ALT, current intervals, studies and a verification', async () => {
    const perLab = await query<{ lab_id: string; analytes: string[] }>(
      `select p.lab_id, array_agg(distinct a.code order by a.code) as analytes
         from patient_results p join analytes a on a.id = p.analyte_id group by p.lab_id`,
    );
    expect(perLab).toHaveLength(3);
    for (const lab of perLab) expect(lab.analytes).toEqual(['ALT', 'CREA', 'K', 'NA']);
    // A pathological share sits outside the current interval (invented data; common practice that
    // routine results hold some): more than 2.5 % of sodium results fall outside 135–145.
    const [na] = await query<{ share: number }>(
      `select avg(case when value < 135 or value > 145 then 1.0 else 0 end)::float8 as share
         from patient_results p join analytes a on a.id = p.analyte_id where a.code = 'NA'`,
    );
    expect(na.share).toBeGreaterThan(0.025);
    expect(await count('current_intervals')).toBeGreaterThanOrEqual(12);
    expect(await count('ri_studies')).toBeGreaterThanOrEqual(3);
    expect(await count('interval_verifications')).toBe(3);
  });

  it('when seeded a second time, then it refuses and leaves the data alone', async () => {
    await expect(seedDemoNetwork(scratch.db)).rejects.toThrow(/already holds/);
    expect(await count('labs')).toBe(summary.labs);
  });

  it('writes the rows the summary reports, with the sizes the demo needs', async () => {
    expect(await count('labs')).toBe(summary.labs);
    expect(summary.labs).toBeGreaterThanOrEqual(12);
    expect(await count('instrument_models')).toBeGreaterThanOrEqual(3);
    expect(await count('analytes')).toBeGreaterThanOrEqual(10);
    expect(await count('procedures')).toBe(summary.procedures);
    expect(await count('qc_summaries')).toBe(summary.qcSummaries);
    expect(await count('qc_values')).toBe(summary.qcValues);
    expect(await count('users')).toBe(summary.users);
    const units = await query<{ preferred_units: string; labs: string }>(
      'select preferred_units, count(*) as labs from labs group by preferred_units',
    );
    const conventional = Number(units.find((u) => u.preferred_units === 'conventional')?.labs ?? 0);
    expect(conventional).toBeGreaterThanOrEqual(2);
    expect(conventional).toBeLessThan(summary.labs / 2);
    // Peer figures are computed by the peer-statistics code, not by the seed.
    expect(await count('peer_groups')).toBe(0);
    expect(await count('peer_statistics')).toBe(0);
    expect(await count(`audit_events where kind = 'seed.demo-network'`)).toBe(1);
  });

  it('includes the ten required analytes and two methods for some of them', async () => {
    const codes = (await query<{ code: string }>('select code from analytes')).map((r) => r.code);
    expect(codes).toEqual(
      expect.arrayContaining(['NA', 'K', 'CL', 'GLU', 'CREA', 'UREA', 'CA', 'ALT', 'AST', 'ALB']),
    );
    const twoMethods = await query<{ code: string }>(
      `select a.code from procedures p join analytes a on a.id = p.analyte_id
       group by a.code having count(distinct p.method_id) >= 2`,
    );
    expect(twoMethods.map((r) => r.code)).toEqual(expect.arrayContaining(['CREA', 'GLU']));
  });

  it('has one control material with two lots of two levels, expiring after December 2026', async () => {
    expect(await count('control_materials')).toBe(1);
    const lots = await query<{
      lot_number: string;
      levels: number[];
      expires_on: string;
      level_rows: string;
    }>(
      `select l.lot_number, l.levels, to_char(l.expires_on, 'YYYY-MM-DD') as expires_on,
              (select count(*) from control_lot_levels c where c.control_lot_id = l.id) as level_rows
       from control_lots l order by l.lot_number`,
    );
    expect(lots).toHaveLength(2);
    for (const lot of lots) {
      expect(lot.levels).toEqual([1, 2]);
      expect(Number(lot.level_rows)).toBe(2);
      expect(lot.expires_on > '2026-12-01').toBe(true);
    }
  });

  it('has six past periods with QC summaries and an open current period, deadlines on the 10th', async () => {
    const periods = await query<{ period: string; state: string; deadline: Date; summaries: string }>(
      `select p.period, p.state, p.deadline, (select count(*) from qc_summaries s where s.period = p.period) as summaries
       from periods p order by p.period`,
    );
    expect(periods.map((p) => p.period)).toEqual([
      '2026-06',
      '2026-07',
      '2026-08',
      '2026-09',
      '2026-10',
      '2026-11',
      '2026-12',
    ]);
    expect(periods.slice(0, 6).every((p) => Number(p.summaries) > 0)).toBe(true);
    expect(Number(periods[6].summaries)).toBe(0);
    expect(periods[6].state).toBe('open');
    for (const p of periods) expect(p.deadline.getUTCDate(), p.period).toBe(10);
  });

  it('stores realistic monthly figures: n 20–31, positive SD, CV of a few percent', async () => {
    const rows = await query<{ lab: string; analyte: string; n: number; mean: number; sd: number }>(
      `select l.code as lab, a.code as analyte, s.n, s.mean, s.sd from qc_summaries s
       join labs l on l.id = s.lab_id join procedures p on p.id = s.procedure_id join analytes a on a.id = p.analyte_id`,
    );
    const { imprecise } = demoScenarios;
    for (const row of rows) {
      const where = `${row.lab} ${row.analyte}`;
      expect(row.n, where).toBeGreaterThanOrEqual(20);
      expect(row.n, where).toBeLessThanOrEqual(31);
      expect(row.sd, where).toBeGreaterThan(0);
      const cv = (100 * row.sd) / row.mean;
      const limit = row.lab === imprecise.labCode && row.analyte === imprecise.analyteCode ? 12 : 8;
      expect(cv, where).toBeLessThan(limit);
    }
  });

  /** Each lab's summaries for one analyte, lot, level and period, with its procedure's peer-group key. */
  const summariesOf = (analyteCode: string) =>
    query<{
      lab: string;
      lot: string;
      level: number;
      period: string;
      n: number;
      mean: number;
      sd: number;
      group_key: string;
    }>(
      `select l.code as lab, s.control_lot_id as lot, s.level, s.period, s.n, s.mean, s.sd,
              p.instrument_model_id || ':' || p.method_id || ':' || p.reagent_id as group_key
       from qc_summaries s join labs l on l.id = s.lab_id join procedures p on p.id = s.procedure_id
       join analytes a on a.id = p.analyte_id where a.code = $1`,
      [analyteCode],
    );

  it('when compared with its instrument peers, then the biased lab stands beyond +2.5 SDI every month', async () => {
    const { biased } = demoScenarios;
    const rows = await summariesOf(biased.analyteCode);
    const own = rows.filter((r) => r.lab === biased.labCode);
    expect(own.length).toBeGreaterThanOrEqual(12);
    const othersAbsSdi: number[] = [];
    for (const mine of own) {
      const peers = rows.filter(
        (r) =>
          r.lab !== mine.lab &&
          r.group_key === mine.group_key &&
          r.lot === mine.lot &&
          r.level === mine.level &&
          r.period === mine.period,
      );
      expect(peers.length).toBeGreaterThanOrEqual(3);
      const peer = pool(peers);
      expect((mine.mean - peer.mean) / peer.sd, `${mine.period} L${mine.level}`).toBeGreaterThan(2.5);
      for (const other of peers) {
        const rest = pool(peers.filter((p) => p !== other));
        othersAbsSdi.push(Math.abs((other.mean - rest.mean) / rest.sd));
      }
    }
    // The other labs sit close to their peers (common practice: |SDI| ≤ 1 is unremarkable).
    expect(median(othersAbsSdi)).toBeLessThan(1);
  });

  it('when compared with its instrument peers, then the imprecise lab has a CVR near 2.5', async () => {
    const { imprecise } = demoScenarios;
    const rows = await summariesOf(imprecise.analyteCode);
    const own = rows.filter((r) => r.lab === imprecise.labCode);
    const ratios = own.map((mine) => {
      const peers = rows.filter(
        (r) =>
          r.lab !== mine.lab &&
          r.group_key === mine.group_key &&
          r.lot === mine.lot &&
          r.level === mine.level &&
          r.period === mine.period,
      );
      const peer = pool(peers);
      // CVR = lab CV / peer pooled within-lab CV (docs/methods.md §3).
      return mine.sd / mine.mean / (peer.withinSd / peer.mean);
    });
    expect(ratios.length).toBeGreaterThanOrEqual(12);
    expect(median(ratios)).toBeGreaterThan(1.8);
    expect(median(ratios)).toBeLessThan(3.5);
  });

  it('leaves some instrument-tier groups too small, so peer figures must fall back to a broader tier', async () => {
    const groups = await query<{ labs: string }>(
      `select count(distinct lab_id) as labs from procedures
       group by analyte_id, instrument_model_id, method_id, reagent_id`,
    );
    const sizes = groups.map((g) => Number(g.labs));
    expect(sizes.some((size) => size < 3)).toBe(true);
    expect(sizes.some((size) => size >= 5)).toBe(true);
  });

  /** Daily values of one lab's procedure for an analyte, grouped by level. */
  const dailyValues = async (labCode: string, analyteCode: string) =>
    query<{ level: number; value: number; run: string; summary_source: string; summary_n: number }>(
      `select v.level, v.value, v.run, s.source as summary_source, s.n as summary_n
       from qc_values v join labs l on l.id = v.lab_id join procedures p on p.id = v.procedure_id
       join analytes a on a.id = p.analyte_id
       join qc_summaries s on s.procedure_id = v.procedure_id and s.control_lot_id = v.control_lot_id
         and s.level = v.level and s.period = v.period
       where l.code = $1 and a.code = $2 order by v.measured_at`,
      [labCode, analyteCode],
    );

  /** z of one value against the mean and SD of the other values of its level (leave-one-out). */
  const zAgainstOthers = (values: number[], index: number) => {
    const others = values.filter((_, i) => i !== index);
    const mean = others.reduce((s, v) => s + v, 0) / others.length;
    const sd = Math.sqrt(others.reduce((s, v) => s + (v - mean) ** 2, 0) / (others.length - 1));
    return (values[index] - mean) / sd;
  };

  it('has daily values with a 1-3s point and a 2-2s run, summarised as source "values"', async () => {
    const [thirteen, twoTwo] = demoScenarios.dailyValues;
    const first = await dailyValues(thirteen.labCode, thirteen.analyteCode);
    const second = await dailyValues(twoTwo.labCode, twoTwo.analyteCode);
    for (const rows of [first, second]) {
      expect(rows.length).toBe(60);
      expect(rows.every((r) => r.summary_source === 'values' && r.summary_n === 30)).toBe(true);
      expect(rows.every((r) => r.run && r.run.length > 0)).toBe(true);
    }
    // 1-3s: one control value beyond 3 SD (Westgard et al., Clin Chem 1981).
    const levelOne = first.filter((r) => r.level === 1).map((r) => r.value);
    expect(levelOne.some((_, i) => Math.abs(zAgainstOthers(levelOne, i)) > 3)).toBe(true);
    // 2-2s across levels: both levels of one run beyond the same 2 SD limit.
    const byLevel = (level: number) => second.filter((r) => r.level === level);
    const [l1, l2] = [byLevel(1), byLevel(2)];
    const l1z = l1.map((_, i) =>
      zAgainstOthers(
        l1.map((r) => r.value),
        i,
      ),
    );
    const l2z = l2.map((_, i) =>
      zAgainstOthers(
        l2.map((r) => r.value),
        i,
      ),
    );
    const runsBothHigh = l1.filter((r, i) => l1z[i] > 2 && l2[i].run === r.run && l2z[i] > 2);
    expect(runsBothHigh.length).toBeGreaterThanOrEqual(1);
  });

  it('creates the coordinator and a supervisor and an analyst for at least two labs, with the given password', async () => {
    const accounts = await query<{ email: string; role: string; lab: string | null; password_hash: string }>(
      `select u.email, u.role, l.code as lab, u.password_hash from users u left join labs l on l.id = u.lab_id`,
    );
    const coordinators = accounts.filter((a) => a.role === 'coordinator');
    expect(coordinators).toHaveLength(1);
    expect(coordinators[0].lab).toBeNull();
    const labsWithBoth = new Set(
      accounts
        .filter((a) => a.role === 'supervisor')
        .map((a) => a.lab)
        .filter((lab) => accounts.some((b) => b.role === 'analyst' && b.lab === lab)),
    );
    expect(labsWithBoth.size).toBeGreaterThanOrEqual(2);
    for (const a of accounts) {
      expect(a.email).toMatch(/@plumbline\.example$/);
      expect(await verify(a.password_hash, password)).toBe(true);
    }
    expect(await verify(accounts[0].password_hash, 'plumbline-demo')).toBe(false);
    expect(summary.accounts.map((a) => a.email).sort()).toEqual(accounts.map((a) => a.email).sort());
  });
});

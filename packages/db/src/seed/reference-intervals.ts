import { sql } from 'drizzle-orm';
import type { Executor } from '../client.ts';
import { createRandom, type RandomSource } from './random.ts';

/**
 * Invented routine patient results for the demo labs (healthy plus a pathological share), the labs'
 * current intervals, a few studies left queued (the worker computes them when it starts) and one
 * verification. Every value is invented; no person stands behind any row.
 */
type Healthy = (r: RandomSource, sex: 'female' | 'male') => number;
type Plan = { code: string; decimals: number; healthy: Healthy; pathological: Healthy; share: number };

const logNormal = (r: RandomSource, median: number, sdLog: number) => median * Math.exp(r.normal(0, sdLog));

const PLANS: Plan[] = [
  {
    code: 'NA',
    decimals: 0,
    healthy: (r) => r.normal(140, 1.8),
    pathological: (r) => (r.uniform() < 0.6 ? r.normal(131, 4) : r.normal(148, 3)),
    share: 0.12,
  },
  {
    code: 'K',
    decimals: 1,
    healthy: (r, sex) => r.normal(sex === 'male' ? 4.25 : 4.1, 0.3),
    pathological: (r) => (r.uniform() < 0.5 ? r.normal(3.2, 0.3) : r.normal(5.6, 0.5)),
    share: 0.12,
  },
  {
    code: 'CREA',
    decimals: 0,
    healthy: (r, sex) => logNormal(r, sex === 'male' ? 82 : 63, 0.14),
    pathological: (r) => logNormal(r, 170, 0.5),
    share: 0.15,
  },
  {
    code: 'ALT',
    decimals: 0,
    healthy: (r, sex) => logNormal(r, sex === 'male' ? 24 : 18, 0.38),
    pathological: (r) => logNormal(r, 85, 0.6),
    share: 0.15,
  },
];

const MONTHS = ['2026-05', '2026-06', '2026-07', '2026-08', '2026-09', '2026-10', '2026-11'];
const SETTINGS = ['outpatient', 'outpatient', 'outpatient', 'inpatient', 'screening', 'emergency'];
export const DEMO_RESULTS_PER_ANALYTE = 2500;

/** Current intervals the demo labs print today (invented entries; the sources name no product). */
const CURRENT: { code: string; sex: string; lower: number; upper: number }[] = [
  { code: 'NA', sex: 'all', lower: 135, upper: 145 },
  { code: 'K', sex: 'all', lower: 3.5, upper: 5.1 },
  { code: 'CREA', sex: 'female', lower: 45, upper: 84 },
  { code: 'CREA', sex: 'male', lower: 59, upper: 104 },
  { code: 'ALT', sex: 'female', lower: 7, upper: 35 },
  { code: 'ALT', sex: 'male', lower: 10, upper: 50 },
];

export async function seedReferenceIntervals(
  tx: Executor,
  ids: { labs: Map<string, string>; analytes: Map<string, string>; supervisors: Map<string, string> },
): Promise<{ patientResults: number }> {
  const random = createRandom(20261204);
  let count = 0;
  for (const [index, [labCode, labId]] of [...ids.labs.entries()].slice(0, 3).entries()) {
    const supervisor = ids.supervisors.get(labCode) ?? null;
    const bias = 1 + (index - 1) * 0.01;
    for (const plan of PLANS) {
      const analyteId = ids.analytes.get(plan.code);
      if (!analyteId) continue;
      const rows = Array.from({ length: DEMO_RESULTS_PER_ANALYTE }, () => {
        const sex = random.uniform() < 0.52 ? 'female' : 'male';
        const draw = random.uniform() < plan.share ? plan.pathological : plan.healthy;
        const value = Math.max(
          10 ** -plan.decimals,
          Number((draw(random, sex) * bias).toFixed(plan.decimals)),
        );
        return {
          sex,
          value,
          age: random.integer(18, 90),
          month: MONTHS[random.integer(0, MONTHS.length - 1)],
          setting: SETTINGS[random.integer(0, SETTINGS.length - 1)],
        };
      });
      await tx.execute(sql`
        insert into patient_results (lab_id, analyte_id, value, sex, age_years, collected_month, setting)
        select ${labId}, ${analyteId}, * from unnest(
          ${sql.param(rows.map((r) => r.value))}::float8[], ${sql.param(rows.map((r) => r.sex))}::text[],
          ${sql.param(rows.map((r) => r.age))}::int2[], ${sql.param(rows.map((r) => r.month))}::text[],
          ${sql.param(rows.map((r) => r.setting))}::text[])`);
      count += rows.length;
    }

    for (const c of CURRENT) {
      await tx.execute(sql`
        insert into current_intervals (lab_id, analyte_id, sex, age_low, age_high, lower, upper, source, updated_by)
        values (${labId}, ${ids.analytes.get(c.code)}, ${c.sex}, 18, 120, ${c.lower}, ${c.upper},
                'Interval in use since the analyser change (demo entry)', ${supervisor})`);
    }

    const studies: [string, string, string, string, boolean][] = [
      ['Sodium, adults', 'NA', 'nonparametric', 'tukey', false],
      ['Creatinine, adults by sex', 'CREA', 'nonparametric', 'tukey', true],
      ['ALT from routine results (indirect)', 'ALT', 'indirect', 'none', true],
    ];
    for (const [name, code, method, screening, bySex] of studies) {
      await tx.execute(sql`
        insert into ri_studies (lab_id, analyte_id, name, selection, partitioning, method, screening, status, created_by)
        values (${labId}, ${ids.analytes.get(code)}, ${name},
                ${JSON.stringify({ ageLow: 18, ageHigh: 120, sex: 'all', settings: code === 'ALT' ? [] : ['outpatient', 'screening'] })}::jsonb,
                ${JSON.stringify({ bySex, ageBands: [] })}::jsonb, ${method}, ${screening}, 'queued', ${supervisor})`);
    }

    // A verification of the transferred potassium interval with 20 invented results.
    const values = Array.from({ length: 20 }, () => Number(random.normal(4.2, 0.3).toFixed(1)));
    const outside = values.filter((v) => v < 3.5 || v > 5.1).length;
    await tx.execute(sql`
      insert into interval_verifications (lab_id, analyte_id, interval, rounds, accepted, created_by)
      values (${labId}, ${ids.analytes.get('K')},
              ${JSON.stringify({ sex: 'all', ageLow: 18, ageHigh: 120, lower: 3.5, upper: 5.1, source: 'Interval in use since the analyser change (demo entry)' })}::jsonb,
              ${JSON.stringify([{ values, outside, accepted: outside <= 2 }])}::jsonb, ${outside <= 2}, ${supervisor})`);
  }
  return { patientResults: count };
}

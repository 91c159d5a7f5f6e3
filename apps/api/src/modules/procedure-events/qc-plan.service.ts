import { recordAudit, thresholds, type Database } from '@plumbline/db';
import type { QcPlanInput, QcPlanPage, QcPlanRow } from '@plumbline/contracts';
import {
  evaluateQcPlan,
  recommendQcPlan,
  type QcPlanRecommendation,
  type QcPlanRule,
} from '@plumbline/stats';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { badRequest, notFound } from '../../errors/app-error.ts';
import { labMember, UUID, visibleLab } from '../lab-review/lab-scope.ts';
import { buildPeerReport } from '../peer-report/peer-report.service.ts';
import * as events from './procedure-events.repository.ts';
import * as repo from './qc-plan.repository.ts';

/** Simulated run groups per multirule plan on this page (Monte Carlo SE ≤ 0.016); single rules are exact. */
const SIMULATIONS = 1000;
/** Recommendations by sigma (to 0.05) and thresholds: they depend on nothing else, so they are kept. */
const recommendations = new Map<string, QcPlanRecommendation>();

function recommendationFor(sigma: number, minPed: number, maxPfr: number): QcPlanRecommendation {
  // Beyond 8 sigma every candidate detects the critical shift; below 1.65 there is no critical shift
  // (every such sigma gets the same plan, so the cache stays small).
  const rounded = Math.round(Math.min(8, Math.max(-5, sigma)) * 20) / 20;
  const key = `${rounded}|${minPed}|${maxPfr}`;
  let found = recommendations.get(key);
  if (!found) {
    found = recommendQcPlan(rounded, { minPed, maxPfr, simulations: SIMULATIONS });
    recommendations.set(key, found);
  }
  return found;
}

/**
 * Every procedure and control level of the lab in its latest period with data: sigma (peer report),
 * ΔSEcrit, the plan the lab entered with its power, and the recommended plan (methods.md §8).
 */
export async function qcPlanPage(db: Database, principal: Principal, labId: string): Promise<QcPlanPage> {
  await visibleLab(db, principal, labId);
  const { qcPlanMinPed: minPed, qcPlanMaxPfr: maxPfr } = thresholds();
  const period = await repo.latestPeriodWithData(db, labId);
  if (!period) return { period: null, settings: { minPed, maxPfr }, rows: [] };
  const report = await buildPeerReport(db, principal, labId, period);
  const plans = await repo.listPlans(db, labId);
  const rows: QcPlanRow[] = report.rows.map((row) => {
    const sigma = row.sigma;
    const stored = plans.find((p) => p.procedureId === row.procedure.id && p.level === row.level);
    const recommendation = sigma === null ? null : recommendationFor(sigma, minPed, maxPfr);
    const deltaSeCrit = sigma === null ? null : sigma - 1.65;
    let current: QcPlanRow['current'] = null;
    if (stored) {
      const plan = { rules: stored.rules.split('/') as QcPlanRule[], n: stored.n, runs: stored.runs };
      const power = evaluateQcPlan(plan, Math.max(0, deltaSeCrit ?? 0), SIMULATIONS);
      current = { ...plan, ped: deltaSeCrit === null ? null : power.ped, pfr: power.pfr };
    }
    return {
      procedure: row.procedure,
      analyte: row.analyte.name,
      controlLot: row.controlLot.lotNumber,
      level: row.level,
      teaPct: row.tea?.pct ?? null,
      teaSource: row.analyte.teaSource,
      biasPct: row.biasPct,
      cvPct: row.lab.cv,
      sigma,
      deltaSeCrit,
      current,
      recommended: recommendation?.plan ?? null,
      reached: recommendation?.reached ?? null,
      explanation:
        recommendation?.explanation ??
        (row.notComputable?.reason
          ? `No sigma: ${row.notComputable.reason}`
          : 'No sigma: the analyte has no TEa or the row has no peer comparison.'),
    };
  });
  return { period, settings: { minPed, maxPfr }, rows };
}

/** The lab's analysts and supervisors enter the plan they use for a procedure and level; audited. */
export async function saveQcPlan(
  db: Database,
  principal: Principal,
  labId: string,
  procedureId: string,
  levelText: string,
  input: QcPlanInput,
): Promise<void> {
  const member = labMember(principal, labId);
  await visibleLab(db, principal, labId);
  const procedure = UUID.test(procedureId) ? await events.findProcedure(db, labId, procedureId) : null;
  if (!procedure) throw notFound('Procedure');
  const level = Number(levelText);
  if (!Number.isInteger(level) || level < 1 || level > 99)
    throw badRequest(`Level must be a whole number 1–99, got "${levelText.slice(0, 20)}".`);
  const rules = [...new Set(input.rules)].join('/');
  await db.transaction(async (tx) => {
    await repo.upsertPlan(tx, {
      labId,
      procedureId: procedure.id,
      level,
      rules,
      n: input.n,
      runs: input.runs,
      updatedBy: member.userId,
    });
    await recordAudit(tx, {
      kind: 'qc-plan.saved',
      ...actorOf(principal),
      labId,
      entity: 'procedure',
      entityId: procedure.id,
      details: { level, rules, n: input.n, runs: input.runs },
    });
  });
}

import { sql } from 'drizzle-orm';
import { hash } from '@node-rs/argon2';
import type { Database } from '../client.ts';
import {
  analytes,
  controlLotLevels,
  controlLots,
  controlMaterials,
  instrumentModels,
  labs,
  methods,
  periods,
  procedures,
  qcSummaries,
  qcValues,
  reagents,
  users,
} from '../schema/index.ts';
import { recordAudit } from '../queries/audit.ts';
import { buildDemoNetwork, demoPassword, type DemoAccount } from './demo-network.ts';
import { seedReferenceIntervals } from './reference-intervals.ts';

export {
  buildDemoNetwork,
  demoAccounts,
  demoPassword,
  demoScenarios,
  DEFAULT_DEMO_PASSWORD,
  DEMO_CURRENT_PERIOD,
  DEMO_NETWORK_NAME,
  DEMO_PAST_PERIODS,
  DEMO_SEED,
  type DemoAccount,
  type DemoNetworkPlan,
} from './demo-network.ts';

export type SeedOptions = {
  /** Password of every demo account; defaults to DEMO_PASSWORD, else 'plumbline-demo'. */
  password?: string;
};

export type SeedSummary = {
  networkName: string;
  labs: number;
  analytes: number;
  methods: number;
  instrumentModels: number;
  reagents: number;
  controlLots: number;
  procedures: number;
  periods: number;
  qcSummaries: number;
  qcValues: number;
  users: number;
  accounts: DemoAccount[];
};

/** Rows per INSERT statement: well under PostgreSQL's 65,535 bind parameters for our widest table. */
const BATCH_SIZE = 500;

async function insertInBatches<T>(rows: T[], insert: (batch: T[]) => Promise<unknown>): Promise<void> {
  for (let start = 0; start < rows.length; start += BATCH_SIZE) {
    await insert(rows.slice(start, start + BATCH_SIZE));
  }
}

/** True when the database holds no labs, users or catalogue yet (a fresh, migrated database). */
export async function isDatabaseEmpty(db: Database): Promise<boolean> {
  const result = await db.execute<{ has_data: boolean }>(
    sql`select exists (select 1 from ${labs}) or exists (select 1 from ${users}) or exists (select 1 from ${analytes}) as has_data`,
  );
  return !result.rows[0].has_data;
}

function lookup(map: Map<string, string>, key: string, what: string): string {
  const id = map.get(key);
  if (!id) throw new Error(`Demo seed: unknown ${what} '${key}'`);
  return id;
}

/**
 * Writes the invented demo network into an empty database in one transaction: catalogue, labs,
 * procedures, periods, six months of QC summaries, a month of daily values for two procedures,
 * the demo accounts and one audit event. Peer groups and statistics are computed elsewhere.
 * Refuses a database that already holds data.
 */
export async function seedDemoNetwork(db: Database, options: SeedOptions = {}): Promise<SeedSummary> {
  if (!(await isDatabaseEmpty(db))) {
    throw new Error(
      'Demo seed: the database already holds labs, users or a catalogue; seed only an empty database.',
    );
  }
  const plan = buildDemoNetwork();
  const password = demoPassword(options.password);
  const passwordHashes = await Promise.all(plan.accounts.map(() => hash(password)));

  await db.transaction(async (tx) => {
    const toMap = (rows: { id: string; code: string }[]) => new Map(rows.map((r) => [r.code, r.id]));

    const analyteIds = toMap(
      await tx
        .insert(analytes)
        .values(
          plan.analytes.map((a) => ({
            code: a.code,
            name: a.name,
            loinc: a.loinc,
            unit: a.unit,
            conventionalUnit: a.conventionalUnit,
            molarMass: a.molarMass,
            decimals: a.decimals,
            teaPct: a.teaPct,
            teaAbsolute: a.teaAbsolute,
            teaSource: a.teaSource,
            teaDate: a.teaDate,
            plausibleLow: a.plausibleLow,
            plausibleHigh: a.plausibleHigh,
            plausibilitySource: a.plausibilitySource,
          })),
        )
        .returning({ id: analytes.id, code: analytes.code }),
    );
    const methodIds = toMap(
      await tx.insert(methods).values(plan.methods).returning({ id: methods.id, code: methods.code }),
    );
    const instrumentIds = toMap(
      await tx
        .insert(instrumentModels)
        .values(plan.instrumentModels.map(({ code, name, manufacturer }) => ({ code, name, manufacturer })))
        .returning({ id: instrumentModels.id, code: instrumentModels.code }),
    );
    const reagentIds = toMap(
      await tx.insert(reagents).values(plan.reagents).returning({ id: reagents.id, code: reagents.code }),
    );
    const [material] = await tx
      .insert(controlMaterials)
      .values(plan.controlMaterial)
      .returning({ id: controlMaterials.id });
    const lotRows = await tx
      .insert(controlLots)
      .values(
        plan.controlLots.map((lot) => ({
          materialId: material.id,
          lotNumber: lot.lotNumber,
          levels: lot.levels,
          expiresOn: lot.expiresOn,
          state: lot.state,
        })),
      )
      .returning({ id: controlLots.id, lotNumber: controlLots.lotNumber });
    const lotIds = new Map(lotRows.map((r) => [r.lotNumber, r.id]));
    await tx.insert(controlLotLevels).values(
      plan.controlLots.flatMap((lot) =>
        lot.levels.map((level) => ({
          controlLotId: lookup(lotIds, lot.lotNumber, 'control lot'),
          level,
          description: lot.levelDescriptions[level] ?? null,
        })),
      ),
    );

    const labIds = toMap(await tx.insert(labs).values(plan.labs).returning({ id: labs.id, code: labs.code }));

    const procedureIds = new Map<string, string>();
    await insertInBatches(plan.procedures, async (batch) => {
      const rows = await tx
        .insert(procedures)
        .values(
          batch.map((p) => ({
            labId: lookup(labIds, p.labCode, 'lab'),
            code: p.code,
            analyteId: lookup(analyteIds, p.analyteCode, 'analyte'),
            instrumentModelId: lookup(instrumentIds, p.instrumentCode, 'instrument model'),
            methodId: lookup(methodIds, p.methodCode, 'method'),
            reagentId: lookup(reagentIds, p.reagentCode, 'reagent'),
            unit: p.unit,
          })),
        )
        .returning({ id: procedures.id, labId: procedures.labId, code: procedures.code });
      for (const row of rows) procedureIds.set(`${row.labId}/${row.code}`, row.id);
    });
    const procedureId = (labCode: string, code: string) =>
      lookup(procedureIds, `${lookup(labIds, labCode, 'lab')}/${code}`, 'procedure');

    await tx.insert(periods).values(plan.periods);

    await insertInBatches(plan.qcSummaries, (batch) =>
      tx.insert(qcSummaries).values(
        batch.map((s) => ({
          labId: lookup(labIds, s.labCode, 'lab'),
          procedureId: procedureId(s.labCode, s.procedureCode),
          controlLotId: lookup(lotIds, s.lotNumber, 'control lot'),
          level: s.level,
          period: s.period,
          n: s.n,
          mean: s.mean,
          sd: s.sd,
          source: s.source,
          late: s.late,
          updatedAt: s.updatedAt,
        })),
      ),
    );
    await insertInBatches(plan.qcValues, (batch) =>
      tx.insert(qcValues).values(
        batch.map((v) => ({
          labId: lookup(labIds, v.labCode, 'lab'),
          procedureId: procedureId(v.labCode, v.procedureCode),
          controlLotId: lookup(lotIds, v.lotNumber, 'control lot'),
          level: v.level,
          period: v.period,
          measuredAt: v.measuredAt,
          value: v.value,
          run: v.run,
        })),
      ),
    );

    const userRows = await tx
      .insert(users)
      .values(
        plan.accounts.map((a, index) => ({
          email: a.email,
          name: a.name,
          passwordHash: passwordHashes[index],
          role: a.role,
          labId: a.labCode ? lookup(labIds, a.labCode, 'lab') : null,
        })),
      )
      .returning({ id: users.id, email: users.email });

    // Reference intervals for the labs that have demo accounts.
    const accountLabs = plan.accounts.filter((a) => a.labCode && a.role === 'supervisor');
    const userIdByEmail = new Map(userRows.map((u) => [u.email, u.id]));
    await seedReferenceIntervals(tx, {
      labs: new Map(accountLabs.map((a) => [a.labCode!, lookup(labIds, a.labCode!, 'lab')])),
      analytes: analyteIds,
      supervisors: new Map(accountLabs.map((a) => [a.labCode!, userIdByEmail.get(a.email)!])),
    });

    await recordAudit(tx, {
      kind: 'seed.demo-network',
      actorLabel: 'seed',
      details: {
        network: plan.networkName,
        seed: plan.seed,
        labs: plan.labs.length,
        procedures: plan.procedures.length,
        qcSummaries: plan.qcSummaries.length,
        qcValues: plan.qcValues.length,
        accounts: plan.accounts.map((a) => a.email),
      },
    });
  });

  return {
    networkName: plan.networkName,
    labs: plan.labs.length,
    analytes: plan.analytes.length,
    methods: plan.methods.length,
    instrumentModels: plan.instrumentModels.length,
    reagents: plan.reagents.length,
    controlLots: plan.controlLots.length,
    procedures: plan.procedures.length,
    periods: plan.periods.length,
    qcSummaries: plan.qcSummaries.length,
    qcValues: plan.qcValues.length,
    users: plan.accounts.length,
    accounts: plan.accounts,
  };
}

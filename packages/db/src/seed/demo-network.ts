/**
 * The demo network as plain data: invented labs, their measurement procedures, six months of QC
 * summaries, a month of daily values for two procedures, and the demo accounts. Pure and
 * deterministic: the same seed gives the same network on every machine. Rows refer to each other
 * by codes (lab code, procedure code, lot number); `seedDemoNetwork` turns them into ids.
 *
 * Everything here is invented: the network, labs, people, instrument models, reagents and the
 * control material.
 */
import {
  demoAnalytes,
  demoControlLots,
  demoControlMaterial,
  demoInstrumentModels,
  demoMethods,
  demoReagents,
  type DemoAnalyte,
} from './catalogue.ts';
import { createRandom, type RandomSource } from './random.ts';

export const DEMO_NETWORK_NAME = 'Corrowdale Regional Laboratory Network';
export const DEMO_SEED = 20261201;
export const DEMO_EMAIL_DOMAIN = 'plumbline.example';

/** Six past monthly periods with QC data, then the current one. */
export const DEMO_PAST_PERIODS = ['2026-06', '2026-07', '2026-08', '2026-09', '2026-10', '2026-11'];
export const DEMO_CURRENT_PERIOD = '2026-12';

/**
 * Lot 1 covers June to August, lot 2 August to November: August is the crossover month in which
 * every lab runs both lots in parallel, as labs do when they change lots.
 */
const LOT_PERIODS: Record<string, string[]> = {
  'PGC-26041': ['2026-06', '2026-07', '2026-08'],
  'PGC-26187': ['2026-08', '2026-09', '2026-10', '2026-11'],
};

type ProcedureCodeStyle = (shortCode: string) => string;
const codeStyles: Record<string, ProcedureCodeStyle> = {
  numbered: (s) => `${s}1`,
  chem2: (s) => `${s}-CHEM2`,
  bench: (s) => `B1-${s}`,
  plain: (s) => s,
  serum: (s) => `${s}.S`,
};

type LabSetup = {
  code: string;
  name: string;
  preferredUnits: 'si' | 'conventional';
  instrument: string;
  codeStyle: keyof typeof codeStyles;
  /** Analytes this lab does not run. */
  skip?: string[];
  /** Analyte code -> method code, where the lab departs from its instrument's default. */
  methods?: Record<string, string>;
  /** Analyte code -> reagent code, where the lab buys another maker's reagent. */
  reagents?: Record<string, string>;
};

// Instrument groups: QX4 six labs, TL8 five, VT2 two, KM9 one. The small groups, the third-party
// reagents and the method departures give peer groups too small to publish at the instrument tier,
// so the figures fall back to the method or analyte tier.
const labSetups: LabSetup[] = [
  {
    code: 'PL-003',
    name: 'Corrowdale University Hospital, Clinical Biochemistry',
    preferredUnits: 'si',
    instrument: 'QX4',
    codeStyle: 'numbered',
  },
  {
    code: 'PL-007',
    name: 'Brennick Vale General Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'TL8',
    codeStyle: 'chem2',
    methods: { ALB: 'ALB-BCG' },
  },
  {
    code: 'PL-011',
    name: 'Harlowmere District Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'QX4',
    codeStyle: 'bench',
    methods: { ALB: 'ALB-BCP' },
  },
  {
    code: 'PL-014',
    name: 'Quillanford Community Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'TL8',
    codeStyle: 'plain',
  },
  {
    code: 'PL-018',
    name: 'Tamsridge Medical Centre Laboratory',
    preferredUnits: 'si',
    instrument: 'TL8',
    codeStyle: 'serum',
    methods: { CREA: 'CREA-PIC' },
    reagents: { ALT: 'SB-OPEN', AST: 'SB-OPEN' },
  },
  {
    code: 'PL-022',
    name: 'Orrinvale Regional Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'QX4',
    codeStyle: 'chem2',
  },
  {
    code: 'PL-025',
    name: 'Saltmere Cross Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'TL8',
    codeStyle: 'numbered',
    methods: { CREA: 'CREA-PIC', ALB: 'ALB-BCG' },
  },
  {
    code: 'PL-029',
    name: 'Dunmarrow Clinic Laboratory',
    preferredUnits: 'conventional',
    instrument: 'VT2',
    codeStyle: 'plain',
    skip: ['TP'],
  },
  {
    code: 'PL-031',
    name: 'Keldrith Valley Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'QX4',
    codeStyle: 'serum',
    methods: { CREA: 'CREA-PIC' },
  },
  {
    code: 'PL-036',
    name: 'Pellbrook Outpatient Laboratory',
    preferredUnits: 'si',
    instrument: 'VT2',
    codeStyle: 'bench',
  },
  {
    code: 'PL-040',
    name: "Fenwarden Children's Hospital Laboratory",
    preferredUnits: 'si',
    instrument: 'TL8',
    codeStyle: 'numbered',
    skip: ['CHOL'],
  },
  {
    code: 'PL-044',
    name: 'Mirren Bay Hospital Laboratory',
    preferredUnits: 'si',
    instrument: 'QX4',
    codeStyle: 'plain',
    methods: { ALT: 'IFCC-NOP5P', AST: 'IFCC-NOP5P' },
    reagents: { CREA: 'SB-OPEN' },
  },
  {
    code: 'PL-047',
    name: 'Varrowby Health Centre Laboratory',
    preferredUnits: 'conventional',
    instrument: 'KM9',
    codeStyle: 'chem2',
    skip: ['TP', 'CHOL'],
  },
  {
    code: 'PL-052',
    name: 'Ostrey Hill Laboratory Services',
    preferredUnits: 'si',
    instrument: 'QX4',
    codeStyle: 'numbered',
    methods: { CREA: 'CREA-PIC', ALT: 'IFCC-NOP5P', AST: 'IFCC-NOP5P' },
  },
];

/** The situations the demo is built to show; tests and docs refer to them. */
export const demoScenarios = {
  /** One lab reads clearly high on one analyte (a calibration bias), in every month and level. */
  biased: { labCode: 'PL-022', analyteCode: 'K', biasInWithinSd: 4.2 },
  /** One lab is imprecise on another analyte: its CV is about 2.5 times its peers'. */
  imprecise: { labCode: 'PL-014', analyteCode: 'GLU', cvFactor: 2.5 },
  /** The open month: one lab has not submitted yet. */
  notYetSubmitted: { labCode: 'PL-052', period: '2026-11' },
  /** One lab submitted one month after the deadline. */
  late: { labCode: 'PL-044', period: '2026-09' },
  /** Daily values for the latest past month, with multirule violations placed on purpose. */
  dailyValues: [
    // Level 1 far above the lab's mean on day 12: a 1-3s rejection.
    {
      labCode: 'PL-003',
      analyteCode: 'K',
      period: '2026-11',
      violation: '1-3s',
      day: 12,
      levels: [1],
      z: 3.8,
    },
    // Both levels above +2 SD in the same run on day 20: a 2-2s rejection across levels.
    {
      labCode: 'PL-014',
      analyteCode: 'CREA',
      period: '2026-11',
      violation: '2-2s',
      day: 20,
      levels: [1, 2],
      z: 2.8,
    },
  ],
} as const;

export type DemoAccount = {
  email: string;
  name: string;
  role: 'analyst' | 'supervisor' | 'coordinator';
  /** Null for the coordinator, who belongs to the network. */
  labCode: string | null;
  labName: string | null;
};

const labNameByCode = new Map(labSetups.map((lab) => [lab.code, lab.name]));
const account = (
  local: string,
  name: string,
  role: DemoAccount['role'],
  labCode: string | null,
): DemoAccount => ({
  email: `${local}@${DEMO_EMAIL_DOMAIN}`,
  name,
  role,
  labCode,
  labName: labCode ? (labNameByCode.get(labCode) ?? null) : null,
});

/** Sign-in accounts of the demo; all share one password (see `demoPassword`). */
export const demoAccounts: DemoAccount[] = [
  account('coordinator', 'Maren Oduya', 'coordinator', null),
  account('supervisor.pl003', 'Tobias Renwick', 'supervisor', 'PL-003'),
  account('analyst.pl003', 'Priya Castellane', 'analyst', 'PL-003'),
  account('supervisor.pl014', 'Ines Halloran', 'supervisor', 'PL-014'),
  account('analyst.pl014', 'Jonah Whitcombe', 'analyst', 'PL-014'),
  account('supervisor.pl022', 'Helga Marrowby', 'supervisor', 'PL-022'),
  account('analyst.pl022', 'Samir Okafor-Lind', 'analyst', 'PL-022'),
];

export const DEFAULT_DEMO_PASSWORD = 'plumbline-demo';

/** The demo accounts' password: the option, else DEMO_PASSWORD, else 'plumbline-demo'. */
export function demoPassword(option?: string): string {
  return option || process.env.DEMO_PASSWORD || DEFAULT_DEMO_PASSWORD;
}

// ---------------------------------------------------------------------------------------------
// The plan

export type PlannedLab = { code: string; name: string; preferredUnits: 'si' | 'conventional' };
export type PlannedProcedure = {
  labCode: string;
  code: string;
  analyteCode: string;
  instrumentCode: string;
  methodCode: string;
  reagentCode: string;
  unit: string;
};
export type PlannedPeriod = {
  period: string;
  state: 'open' | 'closed' | 'published';
  deadline: Date;
  closedAt: Date | null;
  publishedAt: Date | null;
};
export type PlannedSummary = {
  labCode: string;
  procedureCode: string;
  lotNumber: string;
  level: number;
  period: string;
  n: number;
  mean: number;
  sd: number;
  source: 'summary' | 'values';
  late: boolean;
  updatedAt: Date;
};
export type PlannedValue = {
  labCode: string;
  procedureCode: string;
  lotNumber: string;
  level: number;
  period: string;
  measuredAt: Date;
  value: number;
  run: string;
};

export type DemoNetworkPlan = {
  networkName: string;
  seed: number;
  labs: PlannedLab[];
  analytes: DemoAnalyte[];
  methods: typeof demoMethods;
  instrumentModels: typeof demoInstrumentModels;
  reagents: typeof demoReagents;
  controlMaterial: typeof demoControlMaterial;
  controlLots: typeof demoControlLots;
  procedures: PlannedProcedure[];
  periods: PlannedPeriod[];
  qcSummaries: PlannedSummary[];
  qcValues: PlannedValue[];
  accounts: DemoAccount[];
};

const analyteByCode = new Map(demoAnalytes.map((a) => [a.code, a]));
const instrumentByCode = new Map(demoInstrumentModels.map((m) => [m.code, m]));

function roundTo(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  return Math.round(value * factor) / factor;
}

function nextMonth(period: string): string {
  const [year, month] = period.split('-').map(Number);
  return month === 12 ? `${year + 1}-01` : `${year}-${String(month + 1).padStart(2, '0')}`;
}

function daysInMonth(period: string): number {
  const [year, month] = period.split('-').map(Number);
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** A UTC instant on a given day of a 'YYYY-MM' month. */
function at(period: string, day: number, hour: number, minute = 0): Date {
  const [year, month] = period.split('-').map(Number);
  return new Date(Date.UTC(year, month - 1, day, hour, minute));
}

/** Two-pass mean and SD (n − 1). */
function describe(values: number[]): { n: number; mean: number; sd: number } {
  const n = values.length;
  const mean = values.reduce((sum, v) => sum + v, 0) / n;
  const ss = values.reduce((sum, v) => sum + (v - mean) ** 2, 0);
  return { n, mean, sd: Math.sqrt(ss / (n - 1)) };
}

function buildProcedures(): PlannedProcedure[] {
  const procedures: PlannedProcedure[] = [];
  for (const lab of labSetups) {
    const instrument = instrumentByCode.get(lab.instrument)!;
    for (const analyte of demoAnalytes) {
      if (lab.skip?.includes(analyte.code)) continue;
      const unit =
        lab.preferredUnits === 'conventional' && analyte.conventionalUnit
          ? analyte.conventionalUnit
          : analyte.unit;
      procedures.push({
        labCode: lab.code,
        code: codeStyles[lab.codeStyle](analyte.shortCode),
        analyteCode: analyte.code,
        instrumentCode: instrument.code,
        methodCode: lab.methods?.[analyte.code] ?? instrument.defaultMethods[analyte.code],
        reagentCode: lab.reagents?.[analyte.code] ?? instrument.systemReagent,
        unit,
      });
    }
  }
  return procedures;
}

/** Deadlines on the 10th of the following month; months before the latest past one are published. */
function buildPeriods(): PlannedPeriod[] {
  const periods: PlannedPeriod[] = [];
  const lastPast = DEMO_PAST_PERIODS[DEMO_PAST_PERIODS.length - 1];
  for (const period of [...DEMO_PAST_PERIODS, DEMO_CURRENT_PERIOD]) {
    const following = nextMonth(period);
    const deadline = at(following, 10, 23, 59);
    const open = period === lastPast || period === DEMO_CURRENT_PERIOD;
    periods.push({
      period,
      state: open ? 'open' : 'published',
      deadline,
      closedAt: open ? null : at(following, 11, 8),
      publishedAt: open ? null : at(following, 13, 14),
    });
  }
  return periods;
}

/** The figures one lab's procedure "really" has at one level of one lot. */
type TrueFigures = { mean: number; sd: number; withinSdTypical: number };

/**
 * Builds the whole demo network from a seed. Random draws happen in a fixed order, so the output
 * depends on nothing but the seed.
 */
export function buildDemoNetwork(seed: number = DEMO_SEED): DemoNetworkPlan {
  const random = createRandom(seed);
  const procedures = buildProcedures();
  const periods = buildPeriods();

  // Lot 2's targets differ a little from lot 1's, as a new lot of the same material does.
  const lotTargets = new Map<string, number>();
  for (const analyte of demoAnalytes) {
    analyte.levels.forEach((level, index) => {
      const levelNumber = index + 1;
      lotTargets.set(`${demoControlLots[0].lotNumber}/${analyte.code}/${levelNumber}`, level.target);
      const shifted = level.target * (1 + random.normal(0, 0.025));
      lotTargets.set(
        `${demoControlLots[1].lotNumber}/${analyte.code}/${levelNumber}`,
        roundTo(shifted, analyte.decimals),
      );
    });
  }

  // Each instrument model reads a little off per analyte; a third-party reagent adds its own offset.
  const instrumentOffsetPct = new Map<string, number>();
  for (const model of demoInstrumentModels) {
    for (const analyte of demoAnalytes) {
      instrumentOffsetPct.set(
        `${model.code}/${analyte.code}`,
        random.normal(0, 0.4 * analyte.levels[0].cvPct),
      );
    }
  }
  const thirdPartyReagentOffsetInCv = 1.0;

  // Each lab procedure: a small bias (about ±0.5 SD) and its own CV of a few percent.
  type ProcedureCharacter = { biasInWithinSd: number; cvFactor: number };
  const character = new Map<string, ProcedureCharacter>();
  for (const procedure of procedures) {
    let biasInWithinSd = random.normal(0, 0.45);
    let cvFactor = Math.exp(random.normal(0, 0.15));
    const { biased, imprecise } = demoScenarios;
    if (procedure.labCode === biased.labCode && procedure.analyteCode === biased.analyteCode) {
      biasInWithinSd = biased.biasInWithinSd;
    }
    if (procedure.labCode === imprecise.labCode && procedure.analyteCode === imprecise.analyteCode) {
      cvFactor = imprecise.cvFactor;
    }
    character.set(`${procedure.labCode}/${procedure.code}`, { biasInWithinSd, cvFactor });
  }

  const trueFigures = (procedure: PlannedProcedure, lotNumber: string, level: number): TrueFigures => {
    const analyte = analyteByCode.get(procedure.analyteCode)!;
    const spec = analyte.levels[level - 1];
    const target = lotTargets.get(`${lotNumber}/${analyte.code}/${level}`)!;
    const method = analyte.methods[procedure.methodCode];
    const { biasInWithinSd, cvFactor } = character.get(`${procedure.labCode}/${procedure.code}`)!;
    const reagentOffsetPct =
      procedure.reagentCode === instrumentByCode.get(procedure.instrumentCode)!.systemReagent
        ? 0
        : thirdPartyReagentOffsetInCv * spec.cvPct;
    const offsetPct =
      method.offsetPct[level - 1] +
      instrumentOffsetPct.get(`${procedure.instrumentCode}/${analyte.code}`)! +
      reagentOffsetPct;
    const withinSdTypical = (target * spec.cvPct) / 100;
    return {
      mean: target * (1 + offsetPct / 100) + biasInWithinSd * withinSdTypical,
      sd: withinSdTypical * method.cvFactor[level - 1] * cvFactor,
      withinSdTypical,
    };
  };

  const dailyKey = (labCode: string, analyteCode: string, period: string) =>
    `${labCode}/${analyteCode}/${period}`;
  const dailyPlans = new Map<string, (typeof demoScenarios.dailyValues)[number]>(
    demoScenarios.dailyValues.map((plan) => [dailyKey(plan.labCode, plan.analyteCode, plan.period), plan]),
  );

  const qcSummaries: PlannedSummary[] = [];
  const qcValues: PlannedValue[] = [];
  for (const period of DEMO_PAST_PERIODS) {
    const following = nextMonth(period);
    const deadline = periods.find((p) => p.period === period)!.deadline;
    for (const lot of demoControlLots) {
      if (!LOT_PERIODS[lot.lotNumber].includes(period)) continue;
      for (const lab of labSetups) {
        const { notYetSubmitted, late } = demoScenarios;
        if (lab.code === notYetSubmitted.labCode && period === notYetSubmitted.period) continue;
        const isLate = lab.code === late.labCode && period === late.period;
        const submittedAt = isLate
          ? new Date(deadline.getTime() + 3 * 86_400_000)
          : at(following, random.integer(2, 9), random.integer(8, 16), random.integer(0, 59));
        for (const procedure of procedures.filter((p) => p.labCode === lab.code)) {
          const analyte = analyteByCode.get(procedure.analyteCode)!;
          const dailyPlan =
            lot.lotNumber === demoControlLots[1].lotNumber
              ? dailyPlans.get(dailyKey(lab.code, analyte.code, period))
              : undefined;
          if (dailyPlan) {
            const values = buildDailyValues(
              random,
              procedure,
              lot.lotNumber,
              period,
              analyte,
              dailyPlan,
              trueFigures,
            );
            qcValues.push(...values);
            for (const level of lot.levels) {
              const figures = describe(values.filter((v) => v.level === level).map((v) => v.value));
              qcSummaries.push({
                labCode: lab.code,
                procedureCode: procedure.code,
                lotNumber: lot.lotNumber,
                level,
                period,
                n: figures.n,
                mean: roundTo(figures.mean, analyte.decimals + 2),
                sd: roundTo(figures.sd, analyte.decimals + 2),
                source: 'values',
                late: false,
                updatedAt: submittedAt,
              });
            }
            continue;
          }
          for (const level of lot.levels) {
            const figures = trueFigures(procedure, lot.lotNumber, level);
            // The lab's mean wanders a little from month to month.
            const monthMean = figures.mean + random.normal(0, 0.25) * figures.withinSdTypical;
            const n = Math.min(random.integer(20, 31), daysInMonth(period));
            const values = Array.from({ length: n }, () => random.normal(monthMean, figures.sd));
            const summary = describe(values);
            qcSummaries.push({
              labCode: lab.code,
              procedureCode: procedure.code,
              lotNumber: lot.lotNumber,
              level,
              period,
              n,
              mean: roundTo(summary.mean, analyte.decimals + 2),
              sd: Math.max(roundTo(summary.sd, analyte.decimals + 2), 10 ** -(analyte.decimals + 2)),
              source: 'summary',
              late: isLate,
              updatedAt: submittedAt,
            });
          }
        }
      }
    }
  }

  return {
    networkName: DEMO_NETWORK_NAME,
    seed,
    labs: labSetups.map(({ code, name, preferredUnits }) => ({ code, name, preferredUnits })),
    analytes: demoAnalytes,
    methods: demoMethods,
    instrumentModels: demoInstrumentModels,
    reagents: demoReagents,
    controlMaterial: demoControlMaterial,
    controlLots: demoControlLots,
    procedures,
    periods,
    qcSummaries,
    qcValues,
    accounts: demoAccounts,
  };
}

/**
 * One run a day, both levels a minute apart, around the lab's own mean and SD; the planned
 * violation is placed on its day. z-scores and rule results are left to the ingest code.
 */
function buildDailyValues(
  random: RandomSource,
  procedure: PlannedProcedure,
  lotNumber: string,
  period: string,
  analyte: DemoAnalyte,
  plan: (typeof demoScenarios.dailyValues)[number],
  trueFigures: (procedure: PlannedProcedure, lotNumber: string, level: number) => TrueFigures,
): PlannedValue[] {
  const values: PlannedValue[] = [];
  const days = daysInMonth(period);
  for (let day = 1; day <= days; day++) {
    const hour = 7;
    const minute = random.integer(0, 45);
    const run = `${period}-${String(day).padStart(2, '0')}-R1`;
    for (const level of [1, 2]) {
      const figures = trueFigures(procedure, lotNumber, level);
      const planted = day === plan.day && (plan.levels as readonly number[]).includes(level);
      const z = planted ? plan.z : random.normal(0, 1);
      values.push({
        labCode: procedure.labCode,
        procedureCode: procedure.code,
        lotNumber,
        level,
        period,
        measuredAt: at(period, day, hour, minute + level - 1),
        value: roundTo(figures.mean + z * figures.sd, analyte.decimals),
        run,
      });
    }
  }
  return values;
}

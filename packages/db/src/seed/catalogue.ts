/**
 * The invented catalogue of the demo network: analytes, methods, instrument models, reagents and the
 * control material. Every maker, model, reagent and material name here is made up. Method principles
 * are the trade's generic terms.
 */

/** How a method reads relative to the analyte's reference method on the demo control material. */
export type MethodEffect = {
  /** Percent offset of the method's readings on the control material, per level. */
  offsetPct: [number, number];
  /** Multiplier on the analyte's typical within-lab CV, per level. */
  cvFactor: [number, number];
};

export type DemoAnalyte = {
  code: string;
  name: string;
  loinc: string;
  /** Canonical UCUM unit; every stored value is in this unit. */
  unit: string;
  conventionalUnit: string | null;
  molarMass: number | null;
  decimals: number;
  teaPct: number;
  /** Absolute part of the TEa in `unit`, where the published rule has one ("± X or ± Y %, whichever is greater"). */
  teaAbsolute: number | null;
  teaSource: string;
  teaDate: string | null;
  /** Plausibility limits in `unit`: QC figures outside them are refused at upload. */
  plausibleLow: number;
  plausibleHigh: number;
  plausibilitySource: string;
  /** Short code labs build their procedure codes from (e.g. "NA1", "K-CHEM2"). */
  shortCode: string;
  /** Target of each control level on lot 1 (canonical unit) and the typical within-lab CV %. */
  levels: [{ target: number; cvPct: number }, { target: number; cvPct: number }];
  /** Methods in use for this analyte; the first is the reference (no offset). */
  methods: Record<string, MethodEffect>;
};

const sameAsReference: MethodEffect = { offsetPct: [0, 0], cvFactor: [1, 1] };

// Where the TEa percentages come from (all from memory, not re-read):
// - "US CLIA" rows: acceptance limits of the CLIA proficiency-testing rule of 2024 (42 CFR 493.931,
//   effective 2024-07-11). Where the rule gives "x units or y %, whichever is greater" both parts are
//   kept (teaAbsolute below); where it gives only an absolute limit we express it as a percent at a
//   stated concentration.
// - Potassium uses the biological-variation desirable specification (CV_I 4.6 %, CV_G 5.6 %), the
//   value tabulated in Biochem Med 2018;28(2):020711.
const CLIA_2024 = 'US CLIA PT acceptance limit, 2024 rule (42 CFR 493.931)';
const CLIA_2024_DATE = '2024-07-11';

// Plausibility limits: wide bounds around what a clinical analyser reports for each analyte (common
// practice, from memory; no published table). They are meant to catch unit mix-ups and typing errors
// (a mean 10 or 1000 times too large), not to judge results.
const PLAUSIBILITY_SOURCE = 'common practice (wide bounds around analysers’ reportable ranges, from memory)';

/**
 * Absolute parts of the CLIA 2024 rules that read "± X or ± Y %, whichever is greater" (from memory),
 * converted to the canonical unit: glucose 6 mg/dL ÷ 18.016 (mg/dL per mmol/L, molar mass 180.16);
 * creatinine 0.2 mg/dL × 88.42 (µmol/L per mg/dL, molar mass 113.12); urea nitrogen 2 mg/dL ÷ 2.8014
 * (mg/dL of urea nitrogen per mmol/L of urea: 2 × 14.007 g/mol N ÷ 10); ALT and AST 6 U/L as such.
 * Rules that give an absolute limit only (sodium ±4 mmol/L, calcium ±1.0 mg/dL) stay as the percent
 * stated in their source text.
 */
const limitsByCode: Record<string, { teaAbsolute: number | null; low: number; high: number }> = {
  NA: { teaAbsolute: null, low: 80, high: 200 },
  K: { teaAbsolute: null, low: 1, high: 15 },
  CL: { teaAbsolute: null, low: 50, high: 160 },
  GLU: { teaAbsolute: 0.333, low: 0.5, high: 60 },
  CREA: { teaAbsolute: 17.7, low: 10, high: 3000 },
  UREA: { teaAbsolute: 0.714, low: 0.5, high: 100 },
  CA: { teaAbsolute: null, low: 0.5, high: 5 },
  ALT: { teaAbsolute: 6, low: 1, high: 3000 },
  AST: { teaAbsolute: 6, low: 1, high: 3000 },
  ALB: { teaAbsolute: null, low: 5, high: 80 },
  TP: { teaAbsolute: null, low: 20, high: 150 },
  CHOL: { teaAbsolute: null, low: 0.5, high: 20 },
};

// LOINC codes are from memory, cross-checked against LOINC display names quoted in public FHIR
// material. Codes match the canonical unit's property: substance concentration (mmol/L, umol/L)
// uses the [Moles/volume] code, g/L the [Mass/volume] code, U/L the [Enzymatic activity/volume] code.
// Mass-concentration twins a lab may also send: glucose 2345-7, creatinine 2160-0, urea 3091-6
// (urea nitrogen 3094-0), calcium 17861-6, cholesterol 2093-3.
const analytesWithoutLimits: Omit<
  DemoAnalyte,
  'teaAbsolute' | 'plausibleLow' | 'plausibleHigh' | 'plausibilitySource'
>[] = [
  {
    code: 'NA',
    name: 'Sodium',
    loinc: '2951-2',
    unit: 'mmol/L',
    // mmol/L reads the same as mEq/L for a monovalent ion: no separate conventional unit.
    conventionalUnit: null,
    molarMass: 22.99,
    decimals: 1,
    teaPct: 2.86,
    teaSource: `${CLIA_2024}: ±4 mmol/L, expressed as a percent at 140 mmol/L`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'NA',
    levels: [
      { target: 128, cvPct: 0.9 },
      { target: 152, cvPct: 0.8 },
    ],
    methods: { 'ISE-IND': sameAsReference },
  },
  {
    code: 'K',
    name: 'Potassium',
    loinc: '2823-3',
    unit: 'mmol/L',
    conventionalUnit: null,
    molarMass: 39.098,
    decimals: 2,
    teaPct: 5.61,
    teaSource:
      'Biological variation, desirable specification: 1.65 × 0.5 × CV_I + 0.25 × √(CV_I² + CV_G²) with CV_I 4.6 %, CV_G 5.6 %',
    teaDate: null,
    shortCode: 'K',
    levels: [
      { target: 3.6, cvPct: 1.4 },
      { target: 6.2, cvPct: 1.2 },
    ],
    methods: { 'ISE-IND': sameAsReference },
  },
  {
    code: 'CL',
    name: 'Chloride',
    loinc: '2075-0',
    unit: 'mmol/L',
    conventionalUnit: null,
    molarMass: 35.45,
    decimals: 1,
    teaPct: 5,
    teaSource: `${CLIA_2024}: ±5 %`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'CL',
    levels: [
      { target: 90, cvPct: 1.1 },
      { target: 112, cvPct: 1.0 },
    ],
    methods: { 'ISE-IND': sameAsReference },
  },
  {
    code: 'GLU',
    name: 'Glucose',
    loinc: '14749-6',
    unit: 'mmol/L',
    conventionalUnit: 'mg/dL',
    molarMass: 180.16,
    decimals: 2,
    teaPct: 8,
    teaSource: `${CLIA_2024}: ±6 mg/dL or ±8 %, whichever is greater`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'GLU',
    levels: [
      { target: 5.4, cvPct: 1.8 },
      { target: 16.8, cvPct: 1.5 },
    ],
    methods: {
      'GLU-HK': sameAsReference,
      'GLU-GOD': { offsetPct: [-1.5, -1.2], cvFactor: [1.2, 1.1] },
    },
  },
  {
    code: 'CREA',
    name: 'Creatinine',
    loinc: '14682-9',
    unit: 'umol/L',
    conventionalUnit: 'mg/dL',
    molarMass: 113.12,
    decimals: 1,
    teaPct: 10,
    teaSource: `${CLIA_2024}: ±0.2 mg/dL or ±10 %, whichever is greater`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'CREA',
    levels: [
      { target: 88, cvPct: 2.8 },
      { target: 450, cvPct: 1.8 },
    ],
    methods: {
      'CREA-ENZ': sameAsReference,
      // Alkaline picrate reads high on serum-based material, most at low concentration.
      'CREA-PIC': { offsetPct: [7, 2], cvFactor: [1.5, 1.2] },
    },
  },
  {
    code: 'UREA',
    name: 'Urea',
    loinc: '22664-7',
    unit: 'mmol/L',
    // Urea itself in mg/dL (factor 6.006), not urea nitrogen.
    conventionalUnit: 'mg/dL',
    molarMass: 60.06,
    decimals: 2,
    teaPct: 9,
    teaSource: `${CLIA_2024}, urea nitrogen: ±2 mg/dL or ±9 %, whichever is greater`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'UREA',
    levels: [
      { target: 5.8, cvPct: 2.6 },
      { target: 19.5, cvPct: 2.0 },
    ],
    methods: { 'UREA-UV': sameAsReference },
  },
  {
    code: 'CA',
    name: 'Calcium, total',
    loinc: '2000-8',
    unit: 'mmol/L',
    conventionalUnit: 'mg/dL',
    molarMass: 40.08,
    decimals: 2,
    teaPct: 10,
    teaSource: `${CLIA_2024}: ±1.0 mg/dL, expressed as a percent at 10.0 mg/dL (2.50 mmol/L)`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'CA',
    levels: [
      { target: 2.15, cvPct: 1.7 },
      { target: 3.05, cvPct: 1.4 },
    ],
    methods: {
      'CA-ARS': sameAsReference,
      'CA-OCPC': { offsetPct: [1.2, 1.0], cvFactor: [1.1, 1.1] },
    },
  },
  {
    code: 'ALT',
    name: 'Alanine aminotransferase (ALT)',
    loinc: '1742-6',
    unit: 'U/L',
    conventionalUnit: null,
    molarMass: null,
    decimals: 1,
    teaPct: 15,
    teaSource: `${CLIA_2024}: ±6 U/L or ±15 %, whichever is greater`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'ALT',
    levels: [
      { target: 38, cvPct: 4.0 },
      { target: 165, cvPct: 2.4 },
    ],
    methods: {
      'IFCC-NOP5P': sameAsReference,
      'IFCC-P5P': { offsetPct: [6, 4], cvFactor: [1, 1] },
    },
  },
  {
    code: 'AST',
    name: 'Aspartate aminotransferase (AST)',
    loinc: '1920-8',
    unit: 'U/L',
    conventionalUnit: null,
    molarMass: null,
    decimals: 1,
    teaPct: 15,
    teaSource: `${CLIA_2024}: ±6 U/L or ±15 %, whichever is greater`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'AST',
    levels: [
      { target: 45, cvPct: 3.6 },
      { target: 180, cvPct: 2.2 },
    ],
    methods: {
      'IFCC-NOP5P': sameAsReference,
      'IFCC-P5P': { offsetPct: [5, 3], cvFactor: [1, 1] },
    },
  },
  {
    code: 'ALB',
    name: 'Albumin',
    loinc: '1751-7',
    unit: 'g/L',
    conventionalUnit: 'g/dL',
    molarMass: null,
    decimals: 1,
    teaPct: 8,
    teaSource: `${CLIA_2024}: ±8 %`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'ALB',
    // Level 2 is the pathological (low) albumin.
    levels: [
      { target: 38.5, cvPct: 2.0 },
      { target: 26.0, cvPct: 2.4 },
    ],
    methods: {
      'ALB-BCG': sameAsReference,
      // Bromocresol purple reads below bromocresol green, more so at low albumin.
      'ALB-BCP': { offsetPct: [-4, -7], cvFactor: [1, 1.1] },
    },
  },
  {
    code: 'TP',
    name: 'Protein, total',
    loinc: '2885-2',
    unit: 'g/L',
    conventionalUnit: 'g/dL',
    molarMass: null,
    decimals: 1,
    teaPct: 8,
    teaSource: `${CLIA_2024}: ±8 %`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'TP',
    levels: [
      { target: 68, cvPct: 1.6 },
      { target: 47, cvPct: 1.8 },
    ],
    methods: { 'TP-BIU': sameAsReference },
  },
  {
    code: 'CHOL',
    name: 'Cholesterol, total',
    loinc: '14647-2',
    unit: 'mmol/L',
    conventionalUnit: 'mg/dL',
    molarMass: 386.65,
    decimals: 2,
    teaPct: 10,
    teaSource: `${CLIA_2024}: ±10 %`,
    teaDate: CLIA_2024_DATE,
    shortCode: 'CHOL',
    levels: [
      { target: 3.9, cvPct: 1.7 },
      { target: 6.8, cvPct: 1.5 },
    ],
    methods: { 'CHOL-COD': sameAsReference },
  },
];

export const demoAnalytes: DemoAnalyte[] = analytesWithoutLimits.map((a) => {
  const limits = limitsByCode[a.code];
  return {
    ...a,
    teaAbsolute: limits.teaAbsolute,
    plausibleLow: limits.low,
    plausibleHigh: limits.high,
    plausibilitySource: PLAUSIBILITY_SOURCE,
  };
});

export type DemoMethod = { code: string; name: string; principle: string };

export const demoMethods: DemoMethod[] = [
  {
    code: 'ISE-IND',
    name: 'Ion-selective electrode, indirect',
    principle: 'Potentiometry on a diluted sample',
  },
  {
    code: 'GLU-HK',
    name: 'Hexokinase',
    principle: 'Hexokinase / glucose-6-phosphate dehydrogenase, UV end point',
  },
  { code: 'GLU-GOD', name: 'Glucose oxidase', principle: 'Glucose oxidase / peroxidase, colorimetric' },
  {
    code: 'CREA-ENZ',
    name: 'Enzymatic creatinine',
    principle: 'Creatininase / creatinase / sarcosine oxidase, colorimetric',
  },
  {
    code: 'CREA-PIC',
    name: 'Alkaline picrate, kinetic',
    principle: 'Kinetic alkaline picrate, rate-blanked and compensated',
  },
  { code: 'UREA-UV', name: 'Urease/GLDH', principle: 'Urease / glutamate dehydrogenase, kinetic UV' },
  { code: 'CA-ARS', name: 'Arsenazo III', principle: 'Arsenazo III dye binding, colorimetric' },
  {
    code: 'CA-OCPC',
    name: 'o-Cresolphthalein complexone',
    principle: 'o-Cresolphthalein complexone, colorimetric',
  },
  {
    code: 'IFCC-NOP5P',
    name: 'IFCC without P5P',
    principle: "IFCC-type kinetic UV, no pyridoxal-5'-phosphate added",
  },
  {
    code: 'IFCC-P5P',
    name: 'IFCC with P5P',
    principle: "IFCC-type kinetic UV, with pyridoxal-5'-phosphate activation",
  },
  { code: 'ALB-BCG', name: 'Bromocresol green', principle: 'Dye binding, bromocresol green' },
  { code: 'ALB-BCP', name: 'Bromocresol purple', principle: 'Dye binding, bromocresol purple' },
  { code: 'TP-BIU', name: 'Biuret', principle: 'Biuret reaction, colorimetric end point' },
  {
    code: 'CHOL-COD',
    name: 'Cholesterol oxidase',
    principle: 'Cholesterol esterase / cholesterol oxidase / peroxidase, colorimetric',
  },
];

export type DemoInstrumentModel = {
  code: string;
  name: string;
  manufacturer: string;
  /** The maker's own reagent line, used unless a lab buys another. */
  systemReagent: string;
  /** Method the model runs for each analyte unless a lab chose another. */
  defaultMethods: Record<string, string>;
};

const electrolytesAndSingles = {
  NA: 'ISE-IND',
  K: 'ISE-IND',
  CL: 'ISE-IND',
  UREA: 'UREA-UV',
  TP: 'TP-BIU',
  CHOL: 'CHOL-COD',
};

export const demoInstrumentModels: DemoInstrumentModel[] = [
  {
    code: 'QX4',
    name: 'Quorvane QX-400',
    manufacturer: 'Quorvane Instruments',
    systemReagent: 'QX-SYS',
    defaultMethods: {
      ...electrolytesAndSingles,
      GLU: 'GLU-HK',
      CREA: 'CREA-ENZ',
      CA: 'CA-ARS',
      ALT: 'IFCC-P5P',
      AST: 'IFCC-P5P',
      ALB: 'ALB-BCG',
    },
  },
  {
    code: 'TL8',
    name: 'Tesselynd Chemline 8',
    manufacturer: 'Tesselynd Diagnostics',
    systemReagent: 'TL-SYS',
    defaultMethods: {
      ...electrolytesAndSingles,
      GLU: 'GLU-HK',
      CREA: 'CREA-ENZ',
      CA: 'CA-OCPC',
      ALT: 'IFCC-NOP5P',
      AST: 'IFCC-NOP5P',
      ALB: 'ALB-BCP',
    },
  },
  {
    code: 'VT2',
    name: 'Vantorrel Series V2',
    manufacturer: 'Vantorrel Analytical',
    systemReagent: 'VT-SYS',
    defaultMethods: {
      ...electrolytesAndSingles,
      GLU: 'GLU-GOD',
      CREA: 'CREA-PIC',
      CA: 'CA-ARS',
      ALT: 'IFCC-P5P',
      AST: 'IFCC-P5P',
      ALB: 'ALB-BCG',
    },
  },
  {
    code: 'KM9',
    name: 'Kestrimoor K-90',
    manufacturer: 'Kestrimoor Scientific',
    systemReagent: 'KM-SYS',
    defaultMethods: {
      ...electrolytesAndSingles,
      GLU: 'GLU-GOD',
      CREA: 'CREA-ENZ',
      CA: 'CA-OCPC',
      ALT: 'IFCC-NOP5P',
      AST: 'IFCC-NOP5P',
      ALB: 'ALB-BCG',
    },
  },
];

export type DemoReagent = { code: string; name: string; manufacturer: string };

export const demoReagents: DemoReagent[] = [
  { code: 'QX-SYS', name: 'Quorvane QX system reagents', manufacturer: 'Quorvane Instruments' },
  { code: 'TL-SYS', name: 'Tesselynd Chemline system reagents', manufacturer: 'Tesselynd Diagnostics' },
  { code: 'VT-SYS', name: 'Vantorrel V-series reagents', manufacturer: 'Vantorrel Analytical' },
  { code: 'KM-SYS', name: 'Kestrimoor K reagents', manufacturer: 'Kestrimoor Scientific' },
  { code: 'SB-OPEN', name: 'Sorrelbeck open-channel reagents', manufacturer: 'Sorrelbeck Reagents' },
];

export const demoControlMaterial = {
  code: 'PGC',
  name: 'Pendlecott General Chemistry Control',
  manufacturer: 'Pendlecott Control Products',
  matrix: 'Human serum, lyophilised',
};

export type DemoControlLot = {
  lotNumber: string;
  levels: number[];
  expiresOn: string;
  state: 'active' | 'retired';
  levelDescriptions: Record<number, string>;
};

const levelDescriptions = { 1: 'Level 1 (normal range)', 2: 'Level 2 (pathological range)' };

// Both lots stay 'active': neither has expired, and retiring a lot is the coordinator's decision.
export const demoControlLots: DemoControlLot[] = [
  { lotNumber: 'PGC-26041', levels: [1, 2], expiresOn: '2027-02-28', state: 'active', levelDescriptions },
  { lotNumber: 'PGC-26187', levels: [1, 2], expiresOn: '2027-11-30', state: 'active', levelDescriptions },
];

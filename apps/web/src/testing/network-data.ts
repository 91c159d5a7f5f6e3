// Invented catalogue entries, labs, periods and audit events for the coordinator's pages, parsed
// with the contract schemas so they stay in step with the wire format.
import {
  analyteItemSchema,
  auditEventSchema,
  controlLotItemSchema,
  importResultSchema,
  labListSchema,
  labUserSchema,
  type AnalyteItem,
  type AuditEvent,
  type ControlLotItem,
  type ImportResult,
  type LabListItem,
  type LabUser,
} from '@plumbline/contracts';

export function buildAnalyte(overrides: Partial<AnalyteItem> = {}): AnalyteItem {
  return analyteItemSchema.parse({
    id: '9a1b2c3d-4e5f-4a6b-8c7d-0e1f2a3b4c01',
    code: 'GLU',
    name: 'Glucose',
    loinc: '2345-7',
    unit: 'mmol/L',
    conventionalUnit: 'mg/dL',
    molarMass: 180.16,
    decimals: 1,
    teaPct: 6.9,
    teaAbsolute: 0.33,
    teaSource: 'network quality specification',
    teaDate: '2025-02-01',
    plausibleLow: 0.5,
    plausibleHigh: 50,
    plausibilitySource: 'common practice',
    allowsNegative: false,
    retiredAt: null,
    retired: false,
    ...overrides,
  });
}

export function buildControlLot(overrides: Partial<ControlLotItem> = {}): ControlLotItem {
  return controlLotItemSchema.parse({
    id: '9a1b2c3d-4e5f-4a6b-8c7d-0e1f2a3b4c51',
    material: {
      id: '9a1b2c3d-4e5f-4a6b-8c7d-0e1f2a3b4c41',
      code: 'TCM',
      name: 'Tri-level chemistry control',
    },
    lotNumber: 'TCM-2611',
    expiresOn: '2027-06-30',
    expired: false,
    state: 'active',
    levels: [
      { level: 1, description: 'normal' },
      { level: 2, description: 'pathological' },
    ],
    retired: false,
    ...overrides,
  });
}

export function buildImportResult(rows: ImportResult['rows']): ImportResult {
  return importResultSchema.parse({
    rows,
    created: rows.filter((r) => r.action === 'create').length,
    updated: rows.filter((r) => r.action === 'update').length,
    rejected: rows.filter((r) => r.action === 'error').length,
    applied: false,
  });
}

export const testLabs: LabListItem[] = labListSchema.parse([
  {
    id: '2f0c1d3e-5a6b-4c7d-8e9f-0a1b2c3d4e01',
    code: 'L03',
    name: 'Harrow Fen Demo Laboratory',
    active: true,
  },
  {
    id: '2f0c1d3e-5a6b-4c7d-8e9f-0a1b2c3d4e02',
    code: 'L07',
    name: 'Kestrel Vale Demo Laboratory',
    active: true,
  },
  {
    id: '2f0c1d3e-5a6b-4c7d-8e9f-0a1b2c3d4e03',
    code: 'L11',
    name: 'Otterburn Mill Demo Laboratory',
    active: false,
  },
]);

export function buildLabUser(overrides: Partial<LabUser> = {}): LabUser {
  return labUserSchema.parse({
    id: '4b3a2c1d-0e9f-4a8b-9c7d-6e5f4a3b2c01',
    email: 'analyst@harrow-fen.example',
    name: 'Demo Analyst of Harrow Fen',
    role: 'analyst',
    active: true,
    invitationPending: false,
    createdAt: '2026-09-01T08:00:00.000Z',
    ...overrides,
  });
}

export function buildAuditEvent(overrides: Partial<AuditEvent> = {}): AuditEvent {
  return auditEventSchema.parse({
    id: 1,
    at: '2026-12-02T10:15:00.000Z',
    actor: {
      id: '0b5a2c1e-8f7d-4e6b-a1c3-5d9e7f2a4b03',
      name: 'Demo Coordinator',
      email: 'coordinator@network.example',
    },
    actorLabel: null,
    lab: { id: testLabs[0].id, code: testLabs[0].code },
    kind: 'lab.update',
    entity: 'lab',
    entityId: testLabs[0].id,
    details: { changes: { name: { from: 'Old name', to: testLabs[0].name } }, reason: null },
    ...overrides,
  });
}

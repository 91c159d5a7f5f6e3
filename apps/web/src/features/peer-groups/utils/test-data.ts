// Invented peer groups for the feature's tests, parsed with the contract schemas so they stay in
// step with the wire format. Only tests import this file.
import {
  adjustmentPreviewSchema,
  peerGroupAdjustmentSchema,
  peerGroupsViewSchema,
  type AdjustmentPreview,
  type PeerGroup,
  type PeerGroupAdjustment,
  type PeerGroupsView,
} from '@plumbline/contracts';

export const ids = {
  lot: '3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e601',
  analyte: '3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e602',
  groupA: '3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e611',
  groupB: '3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e612',
  groupMethod: '3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e613',
  procedure: (n: number) => `3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e7${String(n).padStart(2, '0')}`,
  lab: (n: number) => `3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e8${String(n).padStart(2, '0')}`,
  named: '3f0c1a2b-4d5e-4f60-8a71-92b3c4d5e901',
};

const named = (name: string) => ({ id: ids.named, name });

function member(n: number, mean: number) {
  return {
    procedureId: ids.procedure(n),
    procedureCode: `GLU${n}`,
    lab: { id: ids.lab(n), code: `PX-${String(n).padStart(3, '0')}`, name: `Invented Lab ${n}` },
    instrumentModel: named('Model Q'),
    method: named('Hexokinase'),
    reagent: named('Kit R'),
    assigned: false,
    data: { n: 20, mean, sd: 0.1, cv: (100 * 0.1) / mean, late: false },
    excluded: null,
  };
}

const figures = (labs: number, mean: number) => ({
  labs,
  n: labs * 20,
  mean,
  sd: 0.12,
  cv: (100 * 0.12) / mean,
  withinSd: 0.1,
  withinCv: (100 * 0.1) / mean,
  robustMean: mean,
  robustSd: 0.05,
  sufficient: labs >= 3,
  excluded: [],
});

function group(
  id: string,
  tier: PeerGroup['tier'],
  label: string,
  members: ReturnType<typeof member>[],
  mean: number,
) {
  return {
    id,
    tier,
    key: `${tier}:${id}`,
    label,
    mergedFrom: [],
    members,
    labsWithData: members.length,
    provisional: figures(members.length, mean),
    published: null,
  };
}

export function buildView(): PeerGroupsView {
  const a = [member(1, 5.5), member(2, 5.52), member(3, 5.48)];
  const b = [member(4, 5.61), member(5, 5.63)];
  return peerGroupsViewSchema.parse({
    controlLot: { id: ids.lot, lotNumber: 'QC-7781', levels: [1, 2] },
    analyte: { id: ids.analyte, code: 'GLU', name: 'Glucose', unit: 'mmol/L', decimals: 1 },
    level: 1,
    period: '2026-11',
    periodState: 'open',
    publication: null,
    minLabs: 3,
    tiers: [
      {
        tier: 'instrument',
        groups: [
          group(ids.groupA, 'instrument', 'Model Q · Hexokinase · Kit R', a, 5.5),
          group(ids.groupB, 'instrument', 'Model W · Hexokinase · Kit R', b, 5.62),
        ],
      },
      {
        tier: 'method',
        groups: [
          group(ids.groupMethod, 'method', 'Hexokinase (every instrument and reagent)', [...a, ...b], 5.55),
        ],
      },
      { tier: 'analyte', groups: [] },
    ],
    exclusions: [],
  });
}

export function buildMergePreview(level: number | null = 1): AdjustmentPreview {
  const view = buildView();
  const [a, b] = view.tiers[0].groups;
  const asPreview = (g: PeerGroup, mean: number, labs: number) => ({
    id: g.id,
    tier: g.tier,
    label: g.label,
    members: g.members.map((m) => ({
      procedureId: m.procedureId,
      procedureCode: m.procedureCode,
      lab: m.lab,
    })),
    figures: figures(labs, mean),
  });
  const merged = {
    ...asPreview(a, 5.5432, 5),
    members: [...asPreview(a, 0, 0).members, ...asPreview(b, 0, 0).members],
  };
  return adjustmentPreviewSchema.parse({
    kind: 'merge',
    description: `Merge “${b.label}” into “${a.label}”`,
    period: '2026-11',
    levels: [{ level: level ?? 1, before: [asPreview(b, 5.62, 2), asPreview(a, 5.5, 3)], after: [merged] }],
  });
}

export function buildAdjustment(overrides: Partial<PeerGroupAdjustment> = {}): PeerGroupAdjustment {
  return peerGroupAdjustmentSchema.parse({
    id: 41,
    kind: 'merge',
    description:
      'Merged “Model W · Hexokinase · Kit R” into “Model Q · Hexokinase · Kit R” (instrument model, method and reagent tier)',
    reason: 'same optics',
    at: '2026-12-02T10:00:00.000Z',
    actor: { id: ids.named, name: 'Demo Coordinator' },
    controlLotId: ids.lot,
    analyteId: ids.analyte,
    period: null,
    undone: null,
    ...overrides,
  });
}

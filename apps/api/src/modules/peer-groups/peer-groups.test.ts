import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq, like } from 'drizzle-orm';
import { peerStatistics as computePeerStatistics, type LabSummary } from '@plumbline/stats';
import {
  auditEvents,
  peerExclusions,
  peerGroupAssignments,
  peerGroups,
  peerStatistics,
  qcSummaries,
  publishPeriod,
  recomputeAllPeerStatistics,
} from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import type {
  AdjustmentPreview,
  PeerGroup,
  PeerGroupFigures,
  PeerGroupsView,
  PeerReportRow,
} from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let catalogue: QcCatalogue;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;
let analyst: Awaited<ReturnType<TestApp['makeUser']>>;
let supervisor: Awaited<ReturnType<TestApp['makeUser']>>;

type Lab = { id: string; code: string; name: string; procedureId: string; auth: string };
const labs: Record<string, Lab> = {};

// Level-1 glucose (mmol/L) of seven invented labs. Instrument groups: A–C (model X1, hexokinase,
// reagent R), D–E (model Y2, hexokinase, R), F (X1, hexokinase, reagent S), G (X1, glucose oxidase,
// R). F reads far high, so in the six-lab hexokinase group Algorithm A leaves it out as an outlier.
const setups = {
  A: { model: 'x1', method: 'hexokinase', reagent: 'r' },
  B: { model: 'x1', method: 'hexokinase', reagent: 'r' },
  C: { model: 'x1', method: 'hexokinase', reagent: 'r' },
  D: { model: 'y2', method: 'hexokinase', reagent: 'r' },
  E: { model: 'y2', method: 'hexokinase', reagent: 'r' },
  F: { model: 'x1', method: 'hexokinase', reagent: 's' },
  G: { model: 'x1', method: 'oxidase', reagent: 'r' },
} as const;
type Name = keyof typeof setups;
const january: Record<Name, { n: number; mean: number; sd: number }> = {
  A: { n: 20, mean: 5.5, sd: 0.12 },
  B: { n: 21, mean: 5.47, sd: 0.11 },
  C: { n: 19, mean: 5.53, sd: 0.1 },
  D: { n: 20, mean: 5.6, sd: 0.13 },
  E: { n: 22, mean: 5.62, sd: 0.12 },
  F: { n: 20, mean: 6.9, sd: 0.14 },
  G: { n: 18, mean: 5.4, sd: 0.15 },
};
const february: Record<Name, { n: number; mean: number; sd: number }> = {
  A: { n: 22, mean: 5.61, sd: 0.14 },
  B: { n: 20, mean: 5.5, sd: 0.11 },
  C: { n: 19, mean: 5.47, sd: 0.12 },
  D: { n: 21, mean: 5.66, sd: 0.1 },
  E: { n: 20, mean: 5.7, sd: 0.13 },
  F: { n: 20, mean: 7.05, sd: 0.15 },
  G: { n: 21, mean: 5.35, sd: 0.12 },
};
const PERIOD = '2026-02';

const inputsOf = (names: Name[]): LabSummary[] =>
  names.map((n) => ({ id: labs[n].procedureId, ...february[n] }));

const as = (auth: string) => ({
  get: (path: string) => request(t.app).get(`/api${path}`).set('Authorization', auth),
  post: (path: string, body?: object) =>
    request(t.app).post(`/api${path}`).set('Authorization', auth).send(body),
});
const asCoordinator = () => as(coordinator.auth);

const viewQuery = (level = 1) =>
  `/peer-groups?controlLotId=${catalogue.lot.id}&analyteId=${catalogue.analytes.glucose.id}&level=${level}&period=${PERIOD}`;

async function view(): Promise<PeerGroupsView> {
  const res = await asCoordinator().get(viewQuery());
  expect(res.status).toBe(200);
  return res.body;
}

/** The group a lab's procedure belongs to at a tier, in the view. */
async function groupOf(name: Name, tier: PeerGroup['tier']): Promise<PeerGroup> {
  const body = await view();
  const group = body.tiers
    .find((x) => x.tier === tier)!
    .groups.find((g) => g.members.some((m) => m.procedureId === labs[name].procedureId));
  if (!group) throw new Error(`no ${tier} group for ${name}`);
  return group;
}

/** The stored provisional period figures of a group for level 1 of the period. */
async function storedFigures(groupId: string) {
  const [row] = await t.db
    .select()
    .from(peerStatistics)
    .where(
      and(
        eq(peerStatistics.peerGroupId, groupId),
        eq(peerStatistics.level, 1),
        eq(peerStatistics.period, PERIOD),
        eq(peerStatistics.scope, 'period'),
        eq(peerStatistics.version, 0),
      ),
    );
  return row ?? null;
}

/** Every provisional row, comparable across recomputes (ids and timestamps left out). */
async function provisionalSnapshot() {
  const rows = await t.db.select().from(peerStatistics).where(eq(peerStatistics.version, 0));
  return rows
    .map(({ id: _id, computedAt: _at, ...rest }) => ({ ...rest, members: [...rest.members].sort() }))
    .sort((a, b) =>
      `${a.peerGroupId}|${a.level}|${a.period}|${a.scope}`.localeCompare(
        `${b.peerGroupId}|${b.level}|${b.period}|${b.scope}`,
      ),
    );
}

/** Figures equal @plumbline/stats `peerStatistics` on the same inputs (to 12 digits). */
function expectFigures(
  figures: Pick<PeerGroupFigures, 'labs' | 'n' | 'mean' | 'sd' | 'withinCv'> | null,
  inputs: LabSummary[],
  excludeIds: string[] = [],
) {
  const expected = computePeerStatistics(inputs, { minLabs: 3, excludeIds });
  expect(figures).not.toBeNull();
  expect(figures!.labs).toBe(expected.labs);
  expect(figures!.n).toBe(expected.n);
  expect(figures!.mean).toBeCloseTo(expected.mean, 12);
  expect(figures!.sd).toBeCloseTo(expected.sd, 12);
  expect(figures!.withinCv).toBeCloseTo(expected.withinCv, 12);
}

async function auditOf(kind: string) {
  return t.db.select().from(auditEvents).where(eq(auditEvents.kind, kind));
}

beforeAll(async () => {
  t = await createTestApp('peergroups');
  catalogue = await createQcCatalogue(t.db);
  coordinator = await t.makeUser('coordinator', null);
  for (const name of Object.keys(setups) as Name[]) {
    const setup = setups[name];
    const { lab, procedures } = await catalogue.makeLabWithProcedures([
      {
        code: 'GLU1',
        model: catalogue.models[setup.model],
        method: catalogue.methods[setup.method],
        reagent: catalogue.reagents[setup.reagent],
      },
    ]);
    const user = await t.makeUser('analyst', lab.id);
    labs[name] = {
      id: lab.id,
      code: lab.code,
      name: lab.name,
      procedureId: procedures[0].id,
      auth: user.auth,
    };
    for (const [period, data] of [
      ['2026-01', january],
      [PERIOD, february],
    ] as const) {
      await t.db.insert(qcSummaries).values({
        labId: lab.id,
        procedureId: procedures[0].id,
        controlLotId: catalogue.lot.id,
        level: 1,
        period,
        ...data[name],
      });
    }
  }
  analyst = await t.makeUser('analyst', labs.A.id);
  supervisor = await t.makeUser('supervisor', labs.A.id);
  await recomputeAllPeerStatistics(t.db);
});
afterAll(async () => t?.close());

describe('the peer-group view', () => {
  it('when the coordinator opens a lot, analyte, level and period, then each tier lists its groups with members (lab code and name) and figures equal to @plumbline/stats', async () => {
    const body = await view();
    expect(body).toMatchObject({
      controlLot: { id: catalogue.lot.id, levels: [1, 2] },
      analyte: { id: catalogue.analytes.glucose.id, name: 'Glucose' },
      level: 1,
      period: PERIOD,
      periodState: 'open',
      publication: null,
      minLabs: 3,
    });
    expect(body.tiers.map((x) => x.tier)).toEqual(['instrument', 'method', 'analyte']);
    expect(body.tiers[0].groups.map((g) => g.members.length)).toEqual([3, 2, 1, 1]);

    const abc = body.tiers[0].groups[0];
    expect(abc.members.map((m) => m.lab)).toEqual(
      (['A', 'B', 'C'] as const)
        .map((n) => ({ id: labs[n].id, code: labs[n].code, name: labs[n].name }))
        .sort((a, b) => a.code.localeCompare(b.code)),
    );
    expect(abc.labsWithData).toBe(3);
    expect(abc.members[0].data).toMatchObject({ n: expect.any(Number), late: false });
    expectFigures(abc.provisional, inputsOf(['A', 'B', 'C']));
    expect(abc.published).toBeNull();

    // Hexokinase: six labs, F is an outlier by Algorithm A (ISO 13528 x* ± 3s*).
    const hexokinase = body.tiers[1].groups[0];
    const expected = computePeerStatistics(inputsOf(['A', 'B', 'C', 'D', 'E', 'F']), { minLabs: 3 });
    expect(expected.excluded).toEqual([{ id: labs.F.procedureId, reason: 'outlier' }]);
    expectFigures(hexokinase.provisional, inputsOf(['A', 'B', 'C', 'D', 'E', 'F']));
    expect(hexokinase.members.find((m) => m.procedureId === labs.F.procedureId)!.excluded).toEqual({
      reason: 'outlier',
      note: null,
    });
    expect(body.tiers[2].groups).toHaveLength(1);
    expect(body.tiers[2].groups[0].members).toHaveLength(7);
  });

  it('when the analytes of a lot are asked for, then those with data are listed', async () => {
    const res = await asCoordinator().get(`/peer-groups/analytes?controlLotId=${catalogue.lot.id}`);
    expect(res.status).toBe(200);
    expect(res.body).toEqual([
      {
        id: catalogue.analytes.glucose.id,
        code: catalogue.analytes.glucose.code,
        name: 'Glucose',
        unit: 'mmol/L',
      },
    ]);
  });

  it('when the query is incomplete or wrong, then 400 naming each field; an unknown lot gives 404', async () => {
    const missing = await asCoordinator().get(`/peer-groups?level=x&period=2026-2`);
    expect(missing.status).toBe(400);
    expect(missing.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([
      'analyteId',
      'controlLotId',
      'level',
      'period',
    ]);

    const noLevel = await asCoordinator().get(viewQuery(3));
    expect(noLevel.status).toBe(400);
    expect(noLevel.body.error.details).toEqual([
      { path: 'level', message: expect.stringContaining('has levels 1, 2') },
    ]);

    const unknown = await asCoordinator().get(
      `/peer-groups?controlLotId=00000000-0000-4000-8000-000000000000&analyteId=${catalogue.analytes.glucose.id}&level=1&period=${PERIOD}`,
    );
    expect(unknown.status).toBe(404);
  });
});

describe('merging two groups', () => {
  it('when the coordinator previews a merge, then before and after equal @plumbline/stats on the old and merged memberships and nothing is written', async () => {
    const abc = await groupOf('A', 'instrument');
    const de = await groupOf('D', 'instrument');
    const storedBefore = await provisionalSnapshot();
    const auditBefore = (await t.db.select().from(auditEvents)).length;

    const res = await asCoordinator().post('/peer-groups/merge/preview', {
      sourceGroupId: de.id,
      targetGroupId: abc.id,
      period: PERIOD,
      level: 1,
    });
    expect(res.status).toBe(200);
    const preview: AdjustmentPreview = res.body;
    expect(preview.kind).toBe('merge');
    expect(preview.levels).toHaveLength(1);
    const [level] = preview.levels;
    expect(level.before.map((g) => g.id)).toEqual([de.id, abc.id]);
    expectFigures(level.before[0].figures, inputsOf(['D', 'E']));
    expectFigures(level.before[1].figures, inputsOf(['A', 'B', 'C']));
    expect(level.after.map((g) => g.id)).toEqual([abc.id]);
    expect(level.after[0].members.map((m) => m.procedureId).sort()).toEqual(
      (['A', 'B', 'C', 'D', 'E'] as const).map((n) => labs[n].procedureId).sort(),
    );
    expectFigures(level.after[0].figures, inputsOf(['A', 'B', 'C', 'D', 'E']));

    expect(await provisionalSnapshot()).toEqual(storedBefore);
    expect((await t.db.select().from(auditEvents)).length).toBe(auditBefore);
    const [source] = await t.db.select().from(peerGroups).where(eq(peerGroups.id, de.id));
    expect(source.mergedIntoId).toBeNull();
  });

  it('when the coordinator confirms the merge, then the stored figures change as @plumbline/stats predicts, it is audited, and undo restores the previous figures', async () => {
    const abc = await groupOf('A', 'instrument');
    const de = await groupOf('D', 'instrument');
    const storedBefore = await provisionalSnapshot();

    const res = await asCoordinator().post('/peer-groups/merge', {
      sourceGroupId: de.id,
      targetGroupId: abc.id,
      reason: 'same optics and calibrator',
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      kind: 'merge',
      reason: 'same optics and calibrator',
      actor: { id: coordinator.id, name: coordinator.name },
      controlLotId: catalogue.lot.id,
      analyteId: catalogue.analytes.glucose.id,
      undone: null,
      description: expect.stringContaining('Merged'),
    });

    expectFigures(await storedFigures(abc.id), inputsOf(['A', 'B', 'C', 'D', 'E']));
    expect(await storedFigures(de.id)).toBeNull();
    const merged = await groupOf('D', 'instrument');
    expect(merged.id).toBe(abc.id);
    expect(merged.mergedFrom).toEqual([{ id: de.id, label: de.label }]);
    expectFigures(merged.provisional, inputsOf(['A', 'B', 'C', 'D', 'E']));
    // Lot-to-date figures follow the merged membership too.
    const [cumulative] = await t.db
      .select()
      .from(peerStatistics)
      .where(
        and(
          eq(peerStatistics.peerGroupId, abc.id),
          eq(peerStatistics.scope, 'cumulative'),
          eq(peerStatistics.period, PERIOD),
          eq(peerStatistics.version, 0),
        ),
      );
    expect(cumulative.labs).toBe(5);

    const [event] = await auditOf('peer-group.merge');
    expect(event).toMatchObject({
      actorId: coordinator.id,
      entityId: abc.id,
      details: expect.objectContaining({ reason: 'same optics and calibrator' }),
    });

    const listed = await asCoordinator().get(`/peer-groups/adjustments?controlLotId=${catalogue.lot.id}`);
    expect(listed.status).toBe(200);
    expect(listed.body.map((a: { id: number }) => a.id)).toContain(res.body.id);

    const undone = await asCoordinator().post(`/peer-groups/adjustments/${res.body.id}/undo`, {
      reason: 'merged the wrong pair',
    });
    expect(undone.status).toBe(200);
    expect(undone.body.undone).toMatchObject({
      actor: { id: coordinator.id },
      reason: 'merged the wrong pair',
    });
    expect(await provisionalSnapshot()).toEqual(storedBefore);
    expect((await groupOf('D', 'instrument')).id).toBe(de.id);

    const again = await asCoordinator().post(`/peer-groups/adjustments/${res.body.id}/undo`, {});
    expect(again.status).toBe(409);
  });

  it('when a month is published and groups are merged afterwards, then the published report keeps its frozen peer figures', async () => {
    await publishPeriod(t.db, '2026-01', { actorLabel: 'test' });
    const reportOfD = async () => {
      const res = await request(t.app)
        .get(`/api/labs/${labs.D.id}/peer-report?period=2026-01`)
        .set('Authorization', labs.D.auth);
      expect(res.status).toBe(200);
      expect(res.body.published).toMatchObject({ version: 1 });
      return res.body.rows.find((r: PeerReportRow) => r.level === 1) as PeerReportRow;
    };
    const before = await reportOfD();
    // D–E alone are too few at the instrument tier, so D was compared with its method group.
    expect(before.peer?.tier).toBe('method');

    const abc = await groupOf('A', 'instrument');
    const de = await groupOf('D', 'instrument');
    const merged = await asCoordinator().post('/peer-groups/merge', {
      sourceGroupId: de.id,
      targetGroupId: abc.id,
      reason: 'checking that publications stay frozen',
    });
    expect(merged.status).toBe(201);
    const after = await reportOfD();
    expect(after.peer).toEqual(before.peer);
    expect(after.sdi).toBe(before.sdi);

    const undone = await asCoordinator().post(`/peer-groups/adjustments/${merged.body.id}/undo`, {});
    expect(undone.status).toBe(200);
  });

  it('when the merge request is wrong, then 400 for its shape and 422 naming the field for groups that cannot merge', async () => {
    const abc = await groupOf('A', 'instrument');
    const hexokinase = await groupOf('A', 'method');

    const shape = await asCoordinator().post('/peer-groups/merge', {
      sourceGroupId: 'nope',
      targetGroupId: abc.id,
    });
    expect(shape.status).toBe(400);
    expect(shape.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([
      'reason',
      'sourceGroupId',
    ]);

    const same = await asCoordinator().post('/peer-groups/merge', {
      sourceGroupId: abc.id,
      targetGroupId: abc.id,
      reason: 'x',
    });
    expect(same.status).toBe(422);
    expect(same.body.error.details).toEqual([
      { path: 'targetGroupId', message: 'choose two different groups to merge' },
    ]);

    const tiers = await asCoordinator().post('/peer-groups/merge/preview', {
      sourceGroupId: abc.id,
      targetGroupId: hexokinase.id,
      period: PERIOD,
    });
    expect(tiers.status).toBe(422);
    expect(tiers.body.error.details[0]).toMatchObject({
      path: 'targetGroupId',
      message: expect.stringContaining('different tiers'),
    });

    const unknown = await asCoordinator().post('/peer-groups/merge/preview', {
      sourceGroupId: '00000000-0000-4000-8000-000000000000',
      targetGroupId: abc.id,
      period: PERIOD,
    });
    expect(unknown.status).toBe(422);
    expect(unknown.body.error.details[0].path).toBe('sourceGroupId');

    const noPeriod = await asCoordinator().post('/peer-groups/merge/preview', {
      sourceGroupId: abc.id,
      targetGroupId: hexokinase.id,
    });
    expect(noPeriod.status).toBe(400);
    expect(noPeriod.body.error.details[0].path).toBe('period');
  });
});

describe('splitting a group', () => {
  it('when the hexokinase group is split by reagent, then the preview and the stored figures follow @plumbline/stats, and undo restores them', async () => {
    const hexokinase = await groupOf('A', 'method');
    const storedBefore = await provisionalSnapshot();

    const preview = await asCoordinator().post('/peer-groups/split/preview', {
      groupId: hexokinase.id,
      by: 'reagent',
      period: PERIOD,
      level: 1,
    });
    expect(preview.status).toBe(200);
    const [level] = (preview.body as AdjustmentPreview).levels;
    expectFigures(level.before[0].figures, inputsOf(['A', 'B', 'C', 'D', 'E', 'F']));
    expect(level.after.map((g) => [g.id, g.members.length])).toEqual([
      [null, 5],
      [null, 1],
    ]);
    expectFigures(level.after[0].figures, inputsOf(['A', 'B', 'C', 'D', 'E']));
    expect(level.after[0].label).toContain('reagent Reagent kit R');
    expect(await provisionalSnapshot()).toEqual(storedBefore);

    const applied = await asCoordinator().post('/peer-groups/split', {
      groupId: hexokinase.id,
      by: 'reagent',
      reason: 'reagent S reads differently',
    });
    expect(applied.status).toBe(201);
    const reagentR = await groupOf('A', 'method');
    expect(reagentR.id).not.toBe(hexokinase.id);
    expect(reagentR.members.every((m) => m.assigned)).toBe(true);
    expectFigures(await storedFigures(reagentR.id), inputsOf(['A', 'B', 'C', 'D', 'E']));
    expect(await storedFigures(hexokinase.id)).toBeNull();
    expect(await t.db.select().from(peerGroupAssignments)).toHaveLength(6);

    const undone = await asCoordinator().post(`/peer-groups/adjustments/${applied.body.id}/undo`, {});
    expect(undone.status).toBe(200);
    expect(await t.db.select().from(peerGroupAssignments)).toHaveLength(0);
    expect(await provisionalSnapshot()).toEqual(storedBefore);
  });

  it('when every member shares the criterion, then 422 on `by`', async () => {
    const abc = await groupOf('A', 'instrument');
    const res = await asCoordinator().post('/peer-groups/split/preview', {
      groupId: abc.id,
      by: 'instrumentModel',
      period: PERIOD,
    });
    expect(res.status).toBe(422);
    expect(res.body.error.details[0]).toMatchObject({
      path: 'by',
      message: expect.stringContaining('nothing to split'),
    });
    const bad = await asCoordinator().post('/peer-groups/split', {
      groupId: abc.id,
      by: 'colour',
      reason: 'x',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('by');
  });
});

describe('moving a procedure', () => {
  it('when F is moved into the A–C group, then both groups change as @plumbline/stats predicts, and undo restores them', async () => {
    const abc = await groupOf('A', 'instrument');
    const f = await groupOf('F', 'instrument');
    const storedBefore = await provisionalSnapshot();

    const preview = await asCoordinator().post('/peer-groups/move/preview', {
      procedureId: labs.F.procedureId,
      targetGroupId: abc.id,
      period: PERIOD,
      level: 1,
    });
    expect(preview.status).toBe(200);
    const [level] = (preview.body as AdjustmentPreview).levels;
    expect(level.before.map((g) => g.id)).toEqual([f.id, abc.id]);
    expect(level.after[0].figures).toBeNull();
    expectFigures(level.after[1].figures, inputsOf(['A', 'B', 'C', 'F']));

    const applied = await asCoordinator().post('/peer-groups/move', {
      procedureId: labs.F.procedureId,
      targetGroupId: abc.id,
      reason: 'reagent S is a relabel of R',
    });
    expect(applied.status).toBe(201);
    expectFigures(await storedFigures(abc.id), inputsOf(['A', 'B', 'C', 'F']));
    const moved = (await groupOf('F', 'instrument')).members.find(
      (m) => m.procedureId === labs.F.procedureId,
    )!;
    expect(moved.assigned).toBe(true);
    const [event] = await auditOf('peer-group.move');
    expect(event.labId).toBe(labs.F.id);

    const same = await asCoordinator().post('/peer-groups/move/preview', {
      procedureId: labs.F.procedureId,
      targetGroupId: abc.id,
      period: PERIOD,
    });
    expect(same.status).toBe(422);
    expect(same.body.error.details[0].path).toBe('targetGroupId');

    await asCoordinator().post(`/peer-groups/adjustments/${applied.body.id}/undo`, {});
    expect(await provisionalSnapshot()).toEqual(storedBefore);
  });
});

describe('excluding a lab’s data', () => {
  it('when B is excluded for the period with a reason, then B leaves the peer figures, its report says why, the audit log has it, and undo brings B back', async () => {
    const storedBefore = await provisionalSnapshot();
    const reason = 'calibration fault reported by the lab';
    const abc = await groupOf('A', 'instrument');

    const preview = await asCoordinator().post('/peer-groups/exclusions/preview', {
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: PERIOD,
      level: 1,
      reason,
    });
    expect(preview.status).toBe(200);
    const [level] = (preview.body as AdjustmentPreview).levels;
    expect(level.before.map((g) => g.tier)).toEqual(['instrument', 'method', 'analyte']);
    expectFigures(level.after[0].figures, inputsOf(['A', 'B', 'C']), [labs.B.procedureId]);
    expect(level.after[0].figures!.excluded).toEqual([
      { procedureId: labs.B.procedureId, reason: 'manual', note: reason },
    ]);
    expect(level.after[0].figures!.sufficient).toBe(false);
    expect(await provisionalSnapshot()).toEqual(storedBefore);

    const applied = await asCoordinator().post('/peer-groups/exclusions', {
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: PERIOD,
      level: 1,
      reason,
    });
    expect(applied.status).toBe(201);
    expect(applied.body).toMatchObject({ kind: 'exclude', period: PERIOD, reason });
    expectFigures(await storedFigures(abc.id), inputsOf(['A', 'B', 'C']), [labs.B.procedureId]);

    // With B out, A–C has two labs; the report falls back to the hexokinase group (F is an outlier there).
    const report = await as(labs.B.auth).get(`/labs/${labs.B.id}/peer-report?period=${PERIOD}`);
    expect(report.status).toBe(200);
    const row: PeerReportRow = report.body.rows.find((r: PeerReportRow) => r.level === 1);
    const methodPeer = computePeerStatistics(inputsOf(['A', 'B', 'C', 'D', 'E', 'F']), {
      minLabs: 3,
      excludeIds: [labs.B.procedureId],
    });
    expect(row.peer).toMatchObject({ tier: 'method', labs: methodPeer.labs });
    expect(row.peer!.mean).toBeCloseTo(methodPeer.mean, 12);
    expect(row.excluded).toEqual({ reason: 'manual', note: reason });
    expect(row.flags).toContainEqual({
      kind: 'exclusion',
      severity: 'warning',
      message: expect.stringContaining(reason),
    });

    const audit = await asCoordinator().get(`/audit-events?labId=${labs.B.id}&kind=peer-group.exclude`);
    expect(audit.status).toBe(200);
    expect(audit.body.items).toHaveLength(1);
    expect(audit.body.items[0]).toMatchObject({
      actor: { id: coordinator.id },
      lab: { id: labs.B.id },
      details: expect.objectContaining({ reason }),
    });

    const groupB = await groupOf('B', 'instrument');
    expect(groupB.members.find((m) => m.procedureId === labs.B.procedureId)!.excluded).toEqual({
      reason: 'manual',
      note: reason,
    });

    const twice = await asCoordinator().post('/peer-groups/exclusions', {
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: PERIOD,
      reason: 'again, every level',
    });
    expect(twice.status).toBe(409);

    const undone = await asCoordinator().post(`/peer-groups/adjustments/${applied.body.id}/undo`, {});
    expect(undone.status).toBe(200);
    const [exclusion] = await t.db.select().from(peerExclusions);
    expect(exclusion.revokedAt).not.toBeNull();
    expect(exclusion.revokedBy).toBe(coordinator.id);
    expect(await provisionalSnapshot()).toEqual(storedBefore);
    const after = await as(labs.B.auth).get(`/labs/${labs.B.id}/peer-report?period=${PERIOD}`);
    expect(after.body.rows.find((r: PeerReportRow) => r.level === 1).excluded).toBeNull();
    expect(
      await t.db.select().from(auditEvents).where(like(auditEvents.kind, 'peer-group.undo')),
    ).not.toHaveLength(0);
  });

  it('when the exclusion has no reason, no data to exclude or an unknown level, then 400 or 422 naming the field', async () => {
    const noReason = await asCoordinator().post('/peer-groups/exclusions', {
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: PERIOD,
      reason: '  ',
    });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details).toEqual([
      { path: 'reason', message: 'say why; the reason is kept in the audit log' },
    ]);

    const noData = await asCoordinator().post('/peer-groups/exclusions/preview', {
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: '2026-04',
    });
    expect(noData.status).toBe(422);
    expect(noData.body.error.details[0]).toMatchObject({
      path: 'period',
      message: expect.stringContaining('has no data'),
    });

    const level = await asCoordinator().post('/peer-groups/exclusions/preview', {
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: PERIOD,
      level: 5,
    });
    expect(level.status).toBe(422);
    expect(level.body.error.details[0].path).toBe('level');
  });
});

describe('the participation board’s flags', () => {
  it('when a lab is left out as an outlier, then the board flags it with its SDI beyond 3', async () => {
    const res = await asCoordinator().get(`/periods/${PERIOD}/participation`);
    expect(res.status).toBe(200);
    const f = res.body.labs.find((l: { lab: { id: string } }) => l.lab.id === labs.F.id);
    const methodPeer = computePeerStatistics(inputsOf(['A', 'B', 'C', 'D', 'E', 'F']), { minLabs: 3 });
    const sdi = (february.F.mean - methodPeer.mean) / methodPeer.sd;
    expect(sdi).toBeGreaterThan(3);
    expect(f.flags).toEqual(
      expect.arrayContaining([
        {
          kind: 'sdi',
          procedureId: labs.F.procedureId,
          controlLotId: catalogue.lot.id,
          level: 1,
          value: expect.closeTo(sdi, 10),
        },
        {
          kind: 'excluded-outlier',
          procedureId: labs.F.procedureId,
          controlLotId: catalogue.lot.id,
          level: 1,
          value: null,
        },
      ]),
    );
    const a = res.body.labs.find((l: { lab: { id: string } }) => l.lab.id === labs.A.id);
    expect(a.flags).toEqual([]);
  });
});

describe('who may adjust peer groups', () => {
  it('when an analyst or a supervisor calls any peer-group route, then 403', async () => {
    const id = '00000000-0000-4000-8000-000000000000';
    const calls: [string, string, object?][] = [
      ['get', viewQuery()],
      ['get', `/peer-groups/analytes?controlLotId=${catalogue.lot.id}`],
      ['get', '/peer-groups/adjustments'],
      ['post', '/peer-groups/merge/preview', {}],
      ['post', '/peer-groups/merge', {}],
      ['post', '/peer-groups/split/preview', {}],
      ['post', '/peer-groups/split', {}],
      ['post', '/peer-groups/move/preview', {}],
      ['post', '/peer-groups/move', {}],
      ['post', '/peer-groups/exclusions/preview', {}],
      ['post', '/peer-groups/exclusions', { procedureId: id }],
      ['post', '/peer-groups/adjustments/1/undo', {}],
    ];
    for (const user of [analyst, supervisor]) {
      for (const [method, path, body] of calls) {
        const res = method === 'get' ? await as(user.auth).get(path) : await as(user.auth).post(path, body);
        expect(res.status, `${user.role} ${method} ${path}`).toBe(403);
        expect(res.body.error.code).toBe('forbidden');
      }
    }
  });

  it('when an adjustment to undo does not exist, then 404', async () => {
    expect((await asCoordinator().post('/peer-groups/adjustments/99999999/undo', {})).status).toBe(404);
    expect((await asCoordinator().post('/peer-groups/adjustments/abc/undo', {})).status).toBe(404);
  });
});

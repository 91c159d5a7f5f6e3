import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { peerGroups, peerStatistics } from '@plumbline/db';
import type { PeerStatisticsFailure } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  seedWorkspaceNetwork,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

// The group statistics, made to throw for any group holding one given lab mean while `trap.mean` is set:
// a group whose figures cannot be computed, whatever the database would accept.
const trap = vi.hoisted(() => ({ mean: null as number | null }));
vi.mock('@plumbline/stats', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@plumbline/stats')>();
  return {
    ...actual,
    peerStatistics: (...args: Parameters<typeof actual.peerStatistics>) => {
      if (trap.mean !== null && args[0].some((lab) => lab.mean === trap.mean))
        throw new Error('forced failure of the group statistics');
      return actual.peerStatistics(...args);
    },
  };
});

const PERIOD = '2026-03';
let t: TestApp;
let net: WorkspaceNetwork;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('recomputeisolation');
  net = await seedWorkspaceNetwork(t);
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

const asCoordinator = {
  get: (path: string) => request(t.app).get(`/api${path}`).set('Authorization', coordinator.auth),
  post: (path: string, body: object) =>
    request(t.app).post(`/api${path}`).set('Authorization', coordinator.auth).send(body),
};

async function creatininePeriodFigures(level: number) {
  return t.db
    .select({ peerGroupId: peerStatistics.peerGroupId, computedAt: peerStatistics.computedAt })
    .from(peerStatistics)
    .innerJoin(peerGroups, eq(peerGroups.id, peerStatistics.peerGroupId))
    .where(
      and(
        eq(peerGroups.analyteId, net.catalogue.analytes.creatinine.id),
        eq(peerStatistics.level, level),
        eq(peerStatistics.period, PERIOD),
        eq(peerStatistics.scope, 'period'),
        eq(peerStatistics.version, 0),
      ),
    );
}

describe('the recompute after a coordinator adjustment', () => {
  it('when one level’s groups cannot be computed, then the adjustment still applies, those groups are listed with the reason, the other level is recomputed, and the undo clears them', async () => {
    const before = await creatininePeriodFigures(1);
    expect(before.length).toBe(3);

    // Lab B's level-2 creatinine mean of March spoils every level-2 group it is in (all three tiers).
    trap.mean = net.table.creatinine.B[PERIOD][2].mean;
    let adjustmentId: number;
    try {
      const applied = await asCoordinator.post('/peer-groups/exclusions', {
        procedureId: net.labs.C.creatinine,
        controlLotId: net.catalogue.lot.id,
        period: PERIOD,
        reason: 'Calibration fault reported by the lab',
      });
      expect(applied.status).toBe(201);
      adjustmentId = applied.body.id;
    } finally {
      trap.mean = null;
    }

    const listed = await asCoordinator.get(`/peer-groups/failures?period=${PERIOD}`);
    expect(listed.status).toBe(200);
    const failures = listed.body as PeerStatisticsFailure[];
    expect(
      failures
        .filter((f) => f.scope === 'period')
        .map((f) => f.tier)
        .sort(),
    ).toEqual(['analyte', 'instrument', 'method']);
    for (const f of failures) {
      expect(f).toMatchObject({
        level: 2,
        analyte: { id: net.catalogue.analytes.creatinine.id },
        reason: 'forced failure of the group statistics',
      });
    }
    expect(await creatininePeriodFigures(2)).toEqual([]);

    // Level 1 was recomputed by the same pass (newer figures for the same three groups).
    const after = await creatininePeriodFigures(1);
    expect(after.map((r) => r.peerGroupId).sort()).toEqual(before.map((r) => r.peerGroupId).sort());
    for (const row of after) {
      const old = before.find((b) => b.peerGroupId === row.peerGroupId)!;
      expect(row.computedAt.getTime()).toBeGreaterThan(old.computedAt.getTime());
    }

    // The undo recomputes with the real statistics: the failures go, the figures come back.
    const undone = await asCoordinator.post(`/peer-groups/adjustments/${adjustmentId}/undo`, {});
    expect(undone.status).toBe(200);
    expect((await asCoordinator.get('/peer-groups/failures')).body).toEqual([]);
    expect((await creatininePeriodFigures(2)).length).toBe(3);
  });
});

import type pg from 'pg';
import copyStreams from 'pg-copy-streams';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { and, eq, inArray, lt } from 'drizzle-orm';
import {
  PEER_TIERS,
  loadPeerKeyParts,
  peerStatistics,
  qcSummaries,
  recordAudit,
  requestPeerStatistics,
  resolvePeerMembership,
  type Database,
  type PeerStatisticsTarget,
} from '@plumbline/db';
import type { SummaryRow } from './row-schemas.ts';
import { seriesKey, type ValuesBuffer } from './values-buffer.ts';
import {
  chooseTarget,
  evaluateGroup,
  labTargetBefore,
  seriesFigures,
  type MonthFigures,
  type Target,
} from './multirule-points.ts';

/** A monthly summary ready to store (canonical unit). */
type SummaryToStore = {
  labId: string;
  procedureId: string;
  controlLotId: string;
  analyteId: string;
  level: number;
  period: string;
  late: boolean;
  figures: MonthFigures | null;
};

export type StoreContext = {
  /** A Drizzle handle on the transaction's connection. */
  tx: Database;
  /** The same connection, for COPY. */
  client: pg.PoolClient;
  upload: { id: string; labId: string };
  actor: { actorId: string | null; actorLabel: string | null };
};

/** Data that arrives after its period was closed (or published) is marked late. */
const isLate = (state: string) => state !== 'open';

/** Stores the valid rows of a summary file: each row replaces the lab's data for its key. */
export async function storeSummaries(
  ctx: StoreContext,
  rows: readonly SummaryRow[],
): Promise<{ replaced: number }> {
  return replaceSummaries(
    ctx,
    rows.map((r) => ({
      labId: ctx.upload.labId,
      procedureId: r.procedure.id,
      controlLotId: r.lot.id,
      analyteId: r.procedure.analyteId,
      level: r.level,
      period: r.period.period,
      late: isLate(r.period.state),
      figures: { period: r.period.period, n: r.n, mean: r.mean, sd: r.sd },
    })),
    'summary',
  );
}

/**
 * Stores the valid rows of a daily-values file: the values of each lab series (procedure, lot, level,
 * period) replace the earlier ones, their monthly summaries are derived, and each value carries its
 * multirule result. Values go in with COPY.
 */
export async function storeValues(
  ctx: StoreContext,
  buffer: ValuesBuffer,
  onProgress: (fraction: number) => Promise<void>,
): Promise<{ replaced: number }> {
  const indicesBySeries = new Map<number, number[]>();
  for (let i = 0; i < buffer.length; i++) {
    const list = indicesBySeries.get(buffer.seriesOf(i));
    if (list) list.push(i);
    else indicesBySeries.set(buffer.seriesOf(i), [i]);
  }
  const figures = seriesFigures(buffer, indicesBySeries);
  const targets = await multiruleTargets(ctx.tx, buffer, figures);

  // One multirule evaluation per procedure, lot and period (levels together).
  const groups = new Map<string, number[]>();
  for (const [seriesIndex, indices] of indicesBySeries) {
    const s = buffer.series[seriesIndex];
    const key = `${s.procedure.id}|${s.lot.id}|${s.period.period}`;
    const list = groups.get(key);
    if (list) list.push(...indices);
    else groups.set(key, [...indices]);
  }

  const { replaced } = await replaceSummaries(
    ctx,
    buffer.series.map((s, index) => ({
      labId: ctx.upload.labId,
      procedureId: s.procedure.id,
      controlLotId: s.lot.id,
      analyteId: s.procedure.analyteId,
      level: s.level,
      period: s.period.period,
      late: isLate(s.period.state),
      figures: figures.get(index) ?? null,
    })),
    'values',
  );

  const copy = ctx.client.query(
    copyStreams.from(
      'COPY qc_values (lab_id, procedure_id, control_lot_id, level, period, measured_at, value, run, comment, z, rules, upload_id) FROM STDIN',
    ),
  );
  const uploadId = ctx.upload.id;
  const labId = ctx.upload.labId;
  const total = buffer.length;
  async function* lines(): AsyncGenerator<string> {
    let chunk = '';
    let written = 0;
    for (const [key, indices] of groups) {
      const results = evaluateGroup(buffer, indices, targets.get(key) ?? new Map());
      for (const i of indices) {
        const s = buffer.series[buffer.seriesOf(i)];
        const result = results.get(i);
        const run = buffer.run(i);
        const comment = buffer.comments.get(i);
        chunk +=
          `${labId}\t${s.procedure.id}\t${s.lot.id}\t${s.level}\t${s.period.period}\t` +
          `${new Date(buffer.measuredAt(i)).toISOString()}\t${buffer.value(i)}\t` +
          `${run === null ? '\\N' : copyText(run)}\t${comment === undefined ? '\\N' : copyText(comment)}\t` +
          `${result?.z === null || result?.z === undefined || !Number.isFinite(result.z) ? '\\N' : result.z}\t` +
          `{${(result?.rules ?? []).join(',')}}\t${uploadId}\n`;
        written += 1;
        if (chunk.length > 256 * 1024) {
          yield chunk;
          chunk = '';
          if (written % 50_000 < 3000) await onProgress(written / total);
        }
      }
    }
    if (chunk) yield chunk;
  }
  await pipeline(Readable.from(lines()), copy);
  return { replaced };
}

/** COPY text format: backslash, tab and line breaks are escaped. */
function copyText(value: string): string {
  return value.replace(/\\/g, '\\\\').replace(/\t/g, '\\t').replace(/\n/g, '\\n').replace(/\r/g, '\\r');
}

/**
 * Replaces the lab's data for each key: earlier daily values of the key are removed, the summary is
 * inserted or updated (or removed when the new data has too few values for one), peer statistics are
 * requested for the key, and what was replaced is audited.
 */
async function replaceSummaries(
  ctx: StoreContext,
  summaries: readonly SummaryToStore[],
  source: 'summary' | 'values',
): Promise<{ replaced: number }> {
  const { client, tx, upload } = ctx;
  const keys = {
    procedures: summaries.map((s) => s.procedureId),
    lots: summaries.map((s) => s.controlLotId),
    levels: summaries.map((s) => s.level),
    periods: summaries.map((s) => s.period),
  };
  const keyArgs = [keys.procedures, keys.lots, keys.levels, keys.periods];
  const keyTable =
    'unnest($1::uuid[], $2::uuid[], $3::int[], $4::text[]) as k(procedure_id, control_lot_id, level, period)';

  const previous = await client.query<{
    procedure_id: string;
    control_lot_id: string;
    level: number;
    period: string;
    upload_id: string | null;
  }>(
    `select s.procedure_id, s.control_lot_id, s.level, s.period, s.upload_id
       from qc_summaries s join ${keyTable}
         on s.procedure_id = k.procedure_id and s.control_lot_id = k.control_lot_id and s.level = k.level and s.period = k.period`,
    keyArgs,
  );
  const deletedValues = await client.query(
    `delete from qc_values v using ${keyTable}
      where v.procedure_id = k.procedure_id and v.control_lot_id = k.control_lot_id and v.level = k.level and v.period = k.period`,
    keyArgs,
  );

  const withFigures = summaries.filter((s) => s.figures !== null);
  const withoutFigures = summaries.filter((s) => s.figures === null);
  if (withoutFigures.length) {
    await client.query(
      `delete from qc_summaries s using ${keyTable}
        where s.procedure_id = k.procedure_id and s.control_lot_id = k.control_lot_id and s.level = k.level and s.period = k.period`,
      [
        withoutFigures.map((s) => s.procedureId),
        withoutFigures.map((s) => s.controlLotId),
        withoutFigures.map((s) => s.level),
        withoutFigures.map((s) => s.period),
      ],
    );
  }
  for (let i = 0; i < withFigures.length; i += 2000) {
    const batch = withFigures.slice(i, i + 2000);
    await client.query(
      `insert into qc_summaries (lab_id, procedure_id, control_lot_id, level, period, n, mean, sd, source, late, upload_id, updated_at)
       select $1::uuid, k.procedure_id, k.control_lot_id, k.level, k.period, k.n, k.mean, k.sd, $2, k.late, $3::uuid, now()
         from unnest($4::uuid[], $5::uuid[], $6::int[], $7::text[], $8::int[], $9::float8[], $10::float8[], $11::bool[])
           as k(procedure_id, control_lot_id, level, period, n, mean, sd, late)
       on conflict (procedure_id, control_lot_id, level, period) do update set
         lab_id = excluded.lab_id, n = excluded.n, mean = excluded.mean, sd = excluded.sd, source = excluded.source,
         late = excluded.late, upload_id = excluded.upload_id, updated_at = excluded.updated_at`,
      [
        upload.labId,
        source,
        upload.id,
        batch.map((s) => s.procedureId),
        batch.map((s) => s.controlLotId),
        batch.map((s) => s.level),
        batch.map((s) => s.period),
        batch.map((s) => s.figures!.n),
        batch.map((s) => s.figures!.mean),
        batch.map((s) => s.figures!.sd),
        batch.map((s) => s.late),
      ],
    );
  }

  const targets: PeerStatisticsTarget[] = summaries.map((s) => ({
    controlLotId: s.controlLotId,
    analyteId: s.analyteId,
    level: s.level,
    period: s.period,
  }));
  await requestPeerStatistics(tx, targets);

  const replaced = previous.rows.length;
  if (replaced > 0 || (deletedValues.rowCount ?? 0) > 0) {
    await recordAudit(tx, {
      kind: 'qc-data.replaced',
      ...ctx.actor,
      labId: upload.labId,
      entity: 'upload',
      entityId: upload.id,
      details: {
        summariesReplaced: replaced,
        valuesRemoved: deletedValues.rowCount ?? 0,
        // Enough to trace what changed without flooding the log.
        keys: previous.rows.slice(0, 200).map((r) => ({
          procedureId: r.procedure_id,
          controlLotId: r.control_lot_id,
          level: r.level,
          period: r.period,
          previousUploadId: r.upload_id,
        })),
      },
    });
  }
  return { replaced };
}

/**
 * Multirule targets for each procedure, lot and period of the buffer, per level: the lab's own figures
 * for the lot and level before the period, otherwise the peers' lot-to-date figures before the period
 * (narrowest tier with enough labs), otherwise the month's own figures.
 */
async function multiruleTargets(
  tx: Database,
  buffer: ValuesBuffer,
  figures: ReadonlyMap<number, MonthFigures>,
): Promise<Map<string, Map<number, Target>>> {
  const procedureIds = [...new Set(buffer.series.map((s) => s.procedure.id))];
  const lotIds = [...new Set(buffer.series.map((s) => s.lot.id))];
  const history = new Map<string, MonthFigures[]>();
  const rows = await historyRows(tx, procedureIds, lotIds);
  const fileKeys = new Set(
    buffer.series.map((s) => seriesKey(s.procedure.id, s.lot.id, s.level, s.period.period)),
  );
  const push = (key: string, f: MonthFigures) => {
    const list = history.get(key);
    if (list) list.push(f);
    else history.set(key, [f]);
  };
  for (const r of rows) {
    if (fileKeys.has(seriesKey(r.procedureId, r.controlLotId, r.level, r.period))) continue;
    push(`${r.procedureId}|${r.controlLotId}|${r.level}`, {
      period: r.period,
      n: r.n,
      mean: r.mean,
      sd: r.sd,
    });
  }
  buffer.series.forEach((s, index) => {
    const f = figures.get(index);
    if (f) push(`${s.procedure.id}|${s.lot.id}|${s.level}`, f);
  });

  const labTargets = buffer.series.map((s) =>
    labTargetBefore(history.get(`${s.procedure.id}|${s.lot.id}|${s.level}`) ?? [], s.period.period),
  );
  // Peer figures are looked up only for series the lab has no figures of its own for.
  const peer = await peerTargets(
    tx,
    buffer,
    buffer.series.map((_, index) => index).filter((index) => labTargets[index] === null),
  );

  const result = new Map<string, Map<number, Target>>();
  buffer.series.forEach((s, index) => {
    const groupKey = `${s.procedure.id}|${s.lot.id}|${s.period.period}`;
    const target = chooseTarget(labTargets[index], peer.get(index) ?? null, figures.get(index) ?? null);
    if (!target) return;
    const levels = result.get(groupKey) ?? new Map<number, Target>();
    levels.set(s.level, target);
    result.set(groupKey, levels);
  });
  return result;
}

async function historyRows(tx: Database, procedureIds: string[], lotIds: string[]) {
  return tx
    .select({
      procedureId: qcSummaries.procedureId,
      controlLotId: qcSummaries.controlLotId,
      level: qcSummaries.level,
      period: qcSummaries.period,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
    })
    .from(qcSummaries)
    .where(and(inArray(qcSummaries.procedureId, procedureIds), inArray(qcSummaries.controlLotId, lotIds)));
}

/** The peers' latest lot-to-date figures before each series' period, at the narrowest sufficient tier. */
async function peerTargets(
  tx: Database,
  buffer: ValuesBuffer,
  seriesIndices: readonly number[],
): Promise<Map<number, Target>> {
  const result = new Map<number, Target>();
  const byLot = new Map<string, number[]>();
  for (const index of seriesIndices) {
    const key = buffer.series[index].lot.id;
    const list = byLot.get(key);
    if (list) list.push(index);
    else byLot.set(key, [index]);
  }
  for (const indices of byLot.values()) {
    const first = buffer.series[indices[0]];
    const parts = await loadPeerKeyParts(tx, [...new Set(indices.map((i) => buffer.series[i].procedure.id))]);
    const membership = await resolvePeerMembership(tx, first.lot.id, parts, { create: false });
    const groupIds = [
      ...new Set([...membership.values()].flatMap((m) => Object.values(m).map((g) => g!.id))),
    ];
    if (groupIds.length === 0) continue;
    const latestPeriod = indices
      .map((i) => buffer.series[i].period.period)
      .sort()
      .at(-1)!;
    const stats = await tx
      .select()
      .from(peerStatistics)
      .where(
        and(
          inArray(peerStatistics.peerGroupId, groupIds),
          eq(peerStatistics.scope, 'cumulative'),
          eq(peerStatistics.version, 0),
          eq(peerStatistics.sufficient, true),
          lt(peerStatistics.period, latestPeriod),
        ),
      );
    const statsByGroup = new Map<string, (typeof stats)[number][]>();
    for (const r of stats) {
      const list = statsByGroup.get(r.peerGroupId);
      if (list) list.push(r);
      else statsByGroup.set(r.peerGroupId, [r]);
    }
    for (const index of indices) {
      const s = buffer.series[index];
      const groups = membership.get(s.procedure.id) ?? {};
      for (const tier of PEER_TIERS) {
        const group = groups[tier];
        if (!group) continue;
        const best = (statsByGroup.get(group.id) ?? [])
          .filter(
            (r) =>
              r.level === s.level &&
              r.period < s.period.period &&
              r.mean !== null &&
              r.sd !== null &&
              r.sd > 0,
          )
          .sort((a, b) => (a.period < b.period ? 1 : -1))[0];
        if (best) {
          result.set(index, { mean: best.mean!, sd: best.sd!, source: 'peer' });
          break;
        }
      }
    }
  }
  return result;
}

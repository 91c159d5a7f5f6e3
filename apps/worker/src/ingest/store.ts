import type pg from 'pg';
import copyStreams from 'pg-copy-streams';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { sql } from 'drizzle-orm';
import {
  PEER_TIERS,
  membershipFromRows,
  recordAudit,
  type Database,
  type PeerAssignmentRow,
  type PeerGroupRow,
  type PeerKeyParts,
  type PeerStatisticsTarget,
} from '@plumbline/db';
import type { SummaryRow } from './row-schemas.ts';
import { seriesKey, type ValuesBuffer } from './values-buffer.ts';
import {
  chooseTarget,
  evaluateGroupRows,
  labTargetBefore,
  rulesOfBits,
  seriesFigures,
  type MonthFigures,
  type Target,
} from './multirule-points.ts';
import { BinaryCopyWriter, textArrayBytes, uuidBytes } from './copy-binary.ts';
import { historyOfGroup, previousPeriod, storedHistory } from './multirule-history.ts';
import type { HistoryPoint } from '@plumbline/stats';

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
export async function storeSummaries(ctx: StoreContext, rows: readonly SummaryRow[]): Promise<Stored> {
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
 * multirule result. Values go in with binary COPY, each procedure, lot and period in time order (the
 * order of the table's main index, which keeps its maintenance cheap).
 */
export async function storeValues(
  ctx: StoreContext,
  buffer: ValuesBuffer,
  onProgress: (fraction: number) => Promise<void>,
): Promise<Stored> {
  const rowsOfSeries = rowsBySeries(buffer);
  const figures = seriesFigures(buffer, rowsOfSeries);
  const targets = await multiruleTargets(ctx.tx, buffer, figures);

  // One multirule evaluation per procedure, lot and period (levels together).
  const groups = new Map<string, number[]>();
  buffer.series.forEach((s, seriesIndex) => {
    const key = `${s.procedure.id}|${s.lot.id}|${s.period.period}`;
    const list = groups.get(key);
    if (list) list.push(seriesIndex);
    else groups.set(key, [seriesIndex]);
  });
  const groupKeys = [...groups.keys()].sort();
  // Multirule sequences continue from the month before: from this file when it holds that month (its
  // group comes just before in groupKeys), else from the values stored for it.
  const keyBefore = (key: string) => {
    const [procedureId, controlLotId, period] = key.split('|');
    return `${procedureId}|${controlLotId}|${previousPeriod(period)}`;
  };
  const historyFromStore = await storedHistory(
    ctx.tx,
    groupKeys
      .filter((key) => !groups.has(keyBefore(key)))
      .map((key) => {
        const [procedureId, controlLotId, period] = key.split('|');
        return { procedureId, controlLotId, period };
      }),
  );

  const stored = await replaceSummaries(
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
      'COPY qc_values (lab_id, procedure_id, control_lot_id, level, period, measured_at, value, run, comment, z, rules, upload_id) FROM STDIN (FORMAT binary)',
    ),
  );
  const uploadId = uuidBytes(ctx.upload.id);
  const labId = uuidBytes(ctx.upload.labId);
  const total = buffer.length;
  const runBytes = new Map<number, Buffer>();
  const idBytes = new Map<string, Buffer>();
  const idOf = (id: string) => {
    let bytes = idBytes.get(id);
    if (!bytes) {
      bytes = uuidBytes(id);
      idBytes.set(id, bytes);
    }
    return bytes;
  };

  async function* chunks(): AsyncGenerator<Buffer> {
    const writer = new BinaryCopyWriter();
    let written = 0;
    let reported = 0;
    let previous: { key: string; history: HistoryPoint[] } | null = null;
    for (const key of groupKeys) {
      const seriesIndices = groups.get(key)!;
      const first = buffer.series[seriesIndices[0]];
      const rows = concatRows(seriesIndices.map((index) => rowsOfSeries[index]));
      const history = previous?.key === keyBefore(key) ? previous.history : (historyFromStore.get(key) ?? []);
      const result = evaluateGroupRows(buffer, rows, targets.get(key) ?? new Map(), history);
      previous = { key, history: historyOfGroup(buffer, rows, result) };
      const { z, rules, timeOrder } = result;
      const procedureId = idOf(first.procedure.id);
      const lotId = idOf(first.lot.id);
      const period = first.period.period;
      for (let t = 0; t < timeOrder.length; t++) {
        const k = timeOrder[t];
        const i = rows[k];
        const level = buffer.series[buffer.seriesOf(i)].level;
        const runNumber = buffer.runNumber(i);
        let run: Buffer | null = null;
        if (runNumber !== -1) {
          run = runBytes.get(runNumber) ?? null;
          if (!run) {
            run = Buffer.from(buffer.runName(runNumber), 'utf8');
            runBytes.set(runNumber, run);
          }
        }
        const comment = buffer.comments.get(i);
        writer.row(12, FIXED_ROW_BYTES + (run?.length ?? 0) + 3 * (period.length + (comment?.length ?? 0)));
        writer.bytes(labId);
        writer.bytes(procedureId);
        writer.bytes(lotId);
        writer.int4(level);
        writer.text(period);
        writer.timestamptz(buffer.measuredAt(i));
        writer.float8(buffer.value(i));
        if (run) writer.bytes(run);
        else writer.null();
        if (comment === undefined) writer.null();
        else writer.text(comment);
        if (Number.isFinite(z[k])) writer.float8(z[k]);
        else writer.null();
        writer.bytes(RULES_BYTES[rules[k]]);
        writer.bytes(uploadId);
      }
      written += rows.length;
      if (writer.pendingBytes > 0) yield* writer.take();
      if (written - reported >= 50_000) {
        reported = written;
        await onProgress(written / total);
      }
    }
    yield* writer.finish();
  }
  await pipeline(Readable.from(chunks()), copy);
  return stored;
}

/** Bytes of a row apart from its period, run and comment texts: 12 field lengths and fixed-size fields. */
const FIXED_ROW_BYTES = 12 * 4 + 16 * 4 + 4 + 8 + 8 + 8 + 64;

/** The rules column (text[]) for every combination of RULE_BITS. */
const RULES_BYTES: readonly Buffer[] = Array.from({ length: 64 }, (_, bits) =>
  textArrayBytes(rulesOfBits(bits)),
);

/** Rows of each series of the buffer, in file order. */
function rowsBySeries(buffer: ValuesBuffer): Int32Array[] {
  const counts = new Int32Array(buffer.series.length);
  for (let i = 0; i < buffer.length; i++) counts[buffer.seriesOf(i)] += 1;
  const rows = Array.from(counts, (count) => new Int32Array(count));
  const filled = new Int32Array(buffer.series.length);
  for (let i = 0; i < buffer.length; i++) {
    const s = buffer.seriesOf(i);
    rows[s][filled[s]++] = i;
  }
  return rows;
}

function concatRows(parts: Int32Array[]): Int32Array {
  if (parts.length === 1) return parts[0];
  const all = new Int32Array(parts.reduce((sum, part) => sum + part.length, 0));
  let offset = 0;
  for (const part of parts) {
    all.set(part, offset);
    offset += part.length;
  }
  return all;
}

/**
 * What storing a file did: how many summaries it replaced, and the peer statistics it changes. The
 * caller requests their recompute at the end of the transaction: the request rows are shared by every
 * lab of a peer group, so holding their locks while the values go in would make concurrent uploads
 * wait for each other.
 */
export type Stored = { replaced: number; targets: PeerStatisticsTarget[] };

/**
 * Replaces the lab's data for each key: earlier daily values of the key are removed, the summary is
 * inserted or updated (or removed when the new data has too few values for one), and what was
 * replaced is audited.
 */
async function replaceSummaries(
  ctx: StoreContext,
  summaries: readonly SummaryToStore[],
  source: 'summary' | 'values',
): Promise<Stored> {
  const { client, tx, upload } = ctx;
  const withoutFigures = summaries.some((s) => s.figures === null);
  // One statement (its parts see the data as it was before it): the summaries being replaced, the
  // earlier values of the keys removed, summaries without figures removed, the others inserted or
  // updated.
  // - The summaries being replaced are selected by procedure and lot (the leading columns of the unique
  //   key) and matched to the keys here: a join on all four columns lets the planner, with statistics
  //   lagging behind a burst of uploads, walk the (lot, level, period) index through every lab.
  // - Each key's values are looked up through the values index on its own (LATERAL with OFFSET 0 keeps
  //   it a nested loop): as one join, stale statistics can turn it into a scan of the whole table.
  const result = await client.query<{
    earlier: {
      procedure_id: string;
      control_lot_id: string;
      level: number;
      period: string;
      upload_id: string | null;
    }[];
    values_removed: number;
  }>(
    `with k as (
       select * from unnest($4::uuid[], $5::uuid[], $6::int[], $7::text[], $8::bool[], $9::int[], $10::float8[],
                            $11::float8[], $12::bool[])
         as k(procedure_id, control_lot_id, level, period, has_figures, n, mean, sd, late)
     ),
     earlier as (
       select s.procedure_id, s.control_lot_id, s.level, s.period, s.upload_id
         from qc_summaries s
        where s.procedure_id = any($13::uuid[]) and s.control_lot_id = any($14::uuid[])
     ),
     removed_values as (
       delete from qc_values where ctid = any(array(
         select x.ctid from k
          cross join lateral (
            select v.ctid from qc_values v
             where v.procedure_id = k.procedure_id and v.control_lot_id = k.control_lot_id and v.period = k.period
               and v.level = k.level
            offset 0) x))
       returning 1
     ),${
       withoutFigures
         ? `
     removed_summaries as (
       delete from qc_summaries s using k
        where not k.has_figures and s.procedure_id = k.procedure_id and s.control_lot_id = k.control_lot_id
          and s.level = k.level and s.period = k.period
     ),`
         : ''
     }
     stored as (
       insert into qc_summaries (lab_id, procedure_id, control_lot_id, level, period, n, mean, sd, source, late, upload_id, updated_at)
       select $1::uuid, k.procedure_id, k.control_lot_id, k.level, k.period, k.n, k.mean, k.sd, $2, k.late, $3::uuid, now()
         from k where k.has_figures
       on conflict (procedure_id, control_lot_id, level, period) do update set
         lab_id = excluded.lab_id, n = excluded.n, mean = excluded.mean, sd = excluded.sd, source = excluded.source,
         late = excluded.late, upload_id = excluded.upload_id, updated_at = excluded.updated_at
     )
     select (select coalesce(json_agg(earlier), '[]'::json) from earlier) as earlier,
            (select count(*)::int from removed_values) as values_removed`,
    [
      upload.labId,
      source,
      upload.id,
      summaries.map((s) => s.procedureId),
      summaries.map((s) => s.controlLotId),
      summaries.map((s) => s.level),
      summaries.map((s) => s.period),
      summaries.map((s) => s.figures !== null),
      summaries.map((s) => s.figures?.n ?? null),
      summaries.map((s) => s.figures?.mean ?? null),
      summaries.map((s) => s.figures?.sd ?? null),
      summaries.map((s) => s.late),
      [...new Set(summaries.map((s) => s.procedureId))],
      [...new Set(summaries.map((s) => s.controlLotId))],
    ],
  );
  const { earlier, values_removed: valuesRemoved } = result.rows[0];
  const earlierByKey = new Map(
    earlier.map((r) => [summaryKey(r.procedure_id, r.control_lot_id, r.level, r.period), r]),
  );
  const previous = summaries.flatMap((s) => {
    const row = earlierByKey.get(summaryKey(s.procedureId, s.controlLotId, s.level, s.period));
    return row ? [row] : [];
  });

  const replaced = previous.length;
  if (replaced > 0 || valuesRemoved > 0) {
    await recordAudit(tx, {
      kind: 'qc-data.replaced',
      ...ctx.actor,
      labId: upload.labId,
      entity: 'upload',
      entityId: upload.id,
      details: {
        summariesReplaced: replaced,
        valuesRemoved,
        // Enough to trace what changed without flooding the log.
        keys: previous.slice(0, 200).map((r) => ({
          procedureId: r.procedure_id,
          controlLotId: r.control_lot_id,
          level: r.level,
          period: r.period,
          previousUploadId: r.upload_id,
        })),
      },
    });
  }
  const targets: PeerStatisticsTarget[] = summaries.map((s) => ({
    controlLotId: s.controlLotId,
    analyteId: s.analyteId,
    level: s.level,
    period: s.period,
  }));
  return { replaced, targets };
}

const summaryKey = (procedureId: string, lotId: string, level: number, period: string) =>
  `${procedureId}|${lotId}|${level}|${period}`;

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
  const result = await tx.execute<{
    procedureId: string;
    controlLotId: string;
    level: number;
    period: string;
    n: number;
    mean: number;
    sd: number;
  }>(sql`
    select procedure_id as "procedureId", control_lot_id as "controlLotId", level, period, n, mean, sd
      from qc_summaries
     where procedure_id = any(${sql.param(procedureIds)}::uuid[]) and control_lot_id = any(${sql.param(lotIds)}::uuid[])`);
  return result.rows;
}

type PeerFigures = {
  peerGroupId: string;
  level: number;
  period: string;
  mean: number | null;
  sd: number | null;
};

/**
 * In one round trip, what peer targets of a lot need: the procedures' peer key parts, the lot's peer
 * groups of their analytes and its assignments (for membershipFromRows, the rule of
 * resolvePeerMembership), and the provisional lot-to-date figures of those groups before `beforePeriod`.
 */
async function peerRows(tx: Database, lotId: string, procedureIds: string[], beforePeriod: string) {
  const result = await tx.execute<{
    parts: PeerKeyParts[];
    groups: PeerGroupRow[];
    assignments: PeerAssignmentRow[];
    stats: PeerFigures[];
  }>(sql`
    with analyte as (select distinct analyte_id from procedures where id = any(${sql.param(procedureIds)}::uuid[])),
         peer_group as (
           select id, analyte_id, tier, key, label, merged_into_id from peer_groups
            where control_lot_id = ${lotId} and analyte_id in (select analyte_id from analyte))
    select
      (select coalesce(json_agg(json_build_object(
                'id', p.id, 'analyteId', p.analyte_id, 'analyteName', a.name,
                'instrumentModelId', p.instrument_model_id, 'instrumentModelName', im.name,
                'methodId', p.method_id, 'methodName', m.name, 'reagentId', p.reagent_id, 'reagentName', r.name)), '[]'::json)
         from procedures p
         join analytes a on a.id = p.analyte_id
         join instrument_models im on im.id = p.instrument_model_id
         join methods m on m.id = p.method_id
         join reagents r on r.id = p.reagent_id
        where p.id = any(${sql.param(procedureIds)}::uuid[])) as parts,
      (select coalesce(json_agg(json_build_object(
                'id', id, 'analyteId', analyte_id, 'tier', tier, 'key', key, 'label', label, 'mergedIntoId', merged_into_id)), '[]'::json)
         from peer_group) as groups,
      (select coalesce(json_agg(json_build_object('procedureId', procedure_id, 'tier', tier, 'peerGroupId', peer_group_id)), '[]'::json)
         from peer_group_assignments where control_lot_id = ${lotId}) as assignments,
      (select coalesce(json_agg(json_build_object(
                'peerGroupId', s.peer_group_id, 'level', s.level, 'period', s.period, 'mean', s.mean, 'sd', s.sd)), '[]'::json)
         from peer_statistics s
        where s.peer_group_id in (select id from peer_group) and s.scope = 'cumulative' and s.version = 0
          and s.sufficient and s.period < ${beforePeriod}) as stats`);
  return result.rows[0];
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
    const latestPeriod = indices
      .map((i) => buffer.series[i].period.period)
      .sort()
      .at(-1)!;
    const {
      parts,
      groups: lotGroups,
      assignments,
      stats,
    } = await peerRows(
      tx,
      first.lot.id,
      [...new Set(indices.map((i) => buffer.series[i].procedure.id))],
      latestPeriod,
    );
    const membership = membershipFromRows(parts, lotGroups, assignments);
    const statsByGroup = new Map<string, PeerFigures[]>();
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

import { Router, type RequestHandler } from 'express';
import { z } from 'zod';
import { drilldownQuerySchema, toCsv } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { buildDrilldown } from './report-drilldown.service.ts';

const levelSchema = z.coerce.number().int().min(1).max(9);

/** The drill-down of one report row and its tables as CSV. */
export function reportDrilldownRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const base = '/labs/:labId/report-rows/:procedureId/:controlLotId/:level';

  async function drilldownOf(req: Parameters<RequestHandler>[0]) {
    const query = parseInput(drilldownQuerySchema, req.query, 'query');
    const level = parseInput(levelSchema, req.params.level, 'level');
    return buildDrilldown(
      deps.db,
      principalOf(req),
      String(req.params.labId),
      { procedureId: String(req.params.procedureId), controlLotId: String(req.params.controlLotId), level },
      query,
    );
  }

  router.get(base, requireUser, async (req, res) => {
    res.json(await drilldownOf(req));
  });

  router.get(`${base}/trend.csv`, requireUser, async (req, res) => {
    const d = await drilldownOf(req);
    const csv = toCsv(
      [
        'period',
        'procedure',
        'control_lot',
        'level',
        'unit',
        'lab_mean',
        'lab_sd',
        'peer_tier',
        'peer_mean',
        'peer_sd',
        'sdi',
        'cvr',
        'bias_pct',
        'published',
        'not_computable',
      ],
      d.trend.map((t) => [
        t.period,
        d.procedure.code,
        d.controlLot.lotNumber,
        d.level,
        d.unit,
        t.labMean,
        t.labSd,
        t.tier,
        t.peerMean,
        t.peerSd,
        t.sdi,
        t.cvr,
        t.biasPct,
        t.published ? 'yes' : 'no',
        t.notComputable,
      ]),
    );
    sendCsv(res, `trend-${d.procedure.code}-${d.controlLot.lotNumber}-L${d.level}-${d.period}.csv`, csv);
  });

  router.get(`${base}/levey-jennings.csv`, requireUser, async (req, res) => {
    const d = await drilldownOf(req);
    const target = d.leveyJennings.target;
    const csv = toCsv(
      [
        'measured_at',
        'run',
        'procedure',
        'control_lot',
        'level',
        'unit',
        'value',
        'target',
        'target_mean',
        'target_sd',
        'z',
        'rules',
      ],
      d.leveyJennings.points.map((p) => [
        p.measuredAt,
        p.run,
        d.procedure.code,
        d.controlLot.lotNumber,
        d.level,
        d.unit,
        p.value,
        target ? `${target.kind}:${target.basis}` : '',
        target?.mean,
        target?.sd,
        p.z,
        p.rules.join(' '),
      ]),
    );
    sendCsv(
      res,
      `levey-jennings-${d.procedure.code}-${d.controlLot.lotNumber}-L${d.level}-${d.period}.csv`,
      csv,
    );
  });

  return router;
}

export function sendCsv(res: Parameters<RequestHandler>[1], filename: string, csv: string) {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${filename.replace(/[^A-Za-z0-9._-]/g, '_')}"`);
  res.send(csv);
}

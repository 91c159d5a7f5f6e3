import { Router, type RequestHandler } from 'express';
import { z } from 'zod';
import {
  REFERENCE_INTERVAL_CAUTION,
  adoptInputSchema,
  approvalInputSchema,
  currentIntervalInputSchema,
  studyCountQuerySchema,
  studyInputSchema,
  uuidSchema,
  verificationInputSchema,
  verificationRoundInputSchema,
} from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { notFound } from '../../errors/app-error.ts';
import {
  approveStudyResult,
  countMatching,
  createStudy,
  getStudy,
  listStudies,
  rerunStudy,
} from './studies.service.ts';
import {
  addVerificationRound,
  adoptStudyResult,
  approveVerification,
  createVerification,
  getVerification,
  listCurrentIntervals,
  listVerifications,
  saveCurrentInterval,
} from './intervals.service.ts';
import { studyResultCsv } from './study-export.ts';
import { renderStudyPdf } from './study-pdf.ts';

const labQuery = z.object({ labId: uuidSchema.optional() });

/**
 * Reference intervals for lab members: studies (supervisors create, run and approve; analysts read),
 * the lab's current intervals, and verifications of transferred intervals. Another lab's study,
 * verification or interval answers 404.
 */
export function referenceIntervalsRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const base = '/reference-intervals';

  router.get(`${base}/studies`, requireUser, async (req, res) => {
    res.json(await listStudies(deps, principalOf(req), parseInput(labQuery, req.query, 'query').labId));
  });
  router.post(`${base}/studies`, requireUser, async (req, res) => {
    res.status(201).json(await createStudy(deps, principalOf(req), parseInput(studyInputSchema, req.body)));
  });
  router.post(`${base}/studies/count`, requireUser, async (req, res) => {
    res.json(await countMatching(deps, principalOf(req), parseInput(studyCountQuerySchema, req.body)));
  });
  router.get(`${base}/studies/:id`, requireUser, async (req, res) => {
    res.json(await getStudy(deps, principalOf(req), String(req.params.id)));
  });
  router.post(`${base}/studies/:id/run`, requireUser, async (req, res) => {
    res.status(202).json(await rerunStudy(deps, principalOf(req), String(req.params.id)));
  });
  router.post(`${base}/studies/:id/versions/:version/approve`, requireUser, async (req, res) => {
    const version = Number(req.params.version);
    const input = parseInput(approvalInputSchema, req.body);
    if (!Number.isInteger(version) || version < 1) throw notFound('Study result');
    res.json(
      await approveStudyResult(deps, principalOf(req), String(req.params.id), version, input.statement),
    );
  });
  router.get(`${base}/studies/:id/versions/:version/export.csv`, requireUser, async (req, res) => {
    const study = await getStudy(deps, principalOf(req), String(req.params.id));
    const result = study.results.find((r) => r.version === Number(req.params.version));
    if (!result) throw notFound('Study result');
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="study-${study.id}-v${result.version}.csv"`);
    res.send(studyResultCsv(study, result, REFERENCE_INTERVAL_CAUTION));
  });

  router.get(`${base}/studies/:id/versions/:version/export.pdf`, requireUser, async (req, res) => {
    const study = await getStudy(deps, principalOf(req), String(req.params.id));
    const result = study.results.find((r) => r.version === Number(req.params.version));
    if (!result) throw notFound('Study result');
    const pdf = await renderStudyPdf(study, result, REFERENCE_INTERVAL_CAUTION);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `attachment; filename="study-${study.id}-v${result.version}.pdf"`);
    res.send(pdf);
  });

  router.get(`${base}/current`, requireUser, async (req, res) => {
    res.json(
      await listCurrentIntervals(deps, principalOf(req), parseInput(labQuery, req.query, 'query').labId),
    );
  });
  router.put(`${base}/current`, requireUser, async (req, res) => {
    res.json(
      await saveCurrentInterval(deps, principalOf(req), parseInput(currentIntervalInputSchema, req.body)),
    );
  });
  router.post(`${base}/current/adopt`, requireUser, async (req, res) => {
    res.json(await adoptStudyResult(deps, principalOf(req), parseInput(adoptInputSchema, req.body)));
  });

  router.get(`${base}/verifications`, requireUser, async (req, res) => {
    res.json(await listVerifications(deps, principalOf(req), parseInput(labQuery, req.query, 'query').labId));
  });
  router.post(`${base}/verifications`, requireUser, async (req, res) => {
    res
      .status(201)
      .json(await createVerification(deps, principalOf(req), parseInput(verificationInputSchema, req.body)));
  });
  router.get(`${base}/verifications/:id`, requireUser, async (req, res) => {
    res.json(await getVerification(deps, principalOf(req), String(req.params.id)));
  });
  router.post(`${base}/verifications/:id/rounds`, requireUser, async (req, res) => {
    const input = parseInput(verificationRoundInputSchema, req.body);
    res.json(await addVerificationRound(deps, principalOf(req), String(req.params.id), input.values));
  });
  router.post(`${base}/verifications/:id/approve`, requireUser, async (req, res) => {
    const input = parseInput(approvalInputSchema, req.body);
    res.json(await approveVerification(deps, principalOf(req), String(req.params.id), input.statement));
  });
  return router;
}

import { Router, type RequestHandler, type Response } from 'express';
import { commentListQuerySchema, peerReportQuerySchema } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import {
  commentsCsvExport,
  monthlyReportPdf,
  peerReportCsvExport,
  testMenuCsvExport,
  uploadsCsvExport,
  type FileExport,
} from './report-export.service.ts';

function sendFile(res: Response, file: FileExport) {
  res.setHeader('Content-Type', file.contentType);
  res.setHeader(
    'Content-Disposition',
    `attachment; filename="${file.filename.replace(/[^A-Za-z0-9._-]/g, '_')}"`,
  );
  res.setHeader('Cache-Control', 'no-store');
  res.send(file.body);
}

/** Downloads of the lab workspace's tables (CSV) and the monthly report (PDF). */
export function reportExportRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const labId = (req: { params: Record<string, unknown> }) => String(req.params.labId);

  router.get('/labs/:labId/peer-report.csv', requireUser, async (req, res) => {
    const query = parseInput(peerReportQuerySchema, req.query, 'query');
    sendFile(res, await peerReportCsvExport(deps, principalOf(req), labId(req), query.period, query.units));
  });

  router.get('/labs/:labId/peer-report.pdf', requireUser, async (req, res) => {
    const query = parseInput(peerReportQuerySchema, req.query, 'query');
    sendFile(res, await monthlyReportPdf(deps, principalOf(req), labId(req), query.period, query.units));
  });

  router.get('/labs/:labId/comments.csv', requireUser, async (req, res) => {
    const query = parseInput(commentListQuerySchema, req.query, 'query');
    sendFile(res, await commentsCsvExport(deps, principalOf(req), labId(req), query.period));
  });

  router.get('/labs/:labId/test-menu.csv', requireUser, async (req, res) => {
    sendFile(res, await testMenuCsvExport(deps, principalOf(req), labId(req)));
  });

  router.get('/labs/:labId/uploads.csv', requireUser, async (req, res) => {
    sendFile(res, await uploadsCsvExport(deps, principalOf(req), labId(req)));
  });

  return router;
}

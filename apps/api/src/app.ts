import express, { Router, type Express } from 'express';
import cookieParser from 'cookie-parser';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { AppDeps } from './deps.ts';
import { configurePassport, authenticate } from './auth/authenticate.ts';
import { errorHandler, notFoundHandler, requestId } from './http/error-handler.ts';
import { corsForPublicUrl, securityHeaders } from './http/security-headers.ts';
import { requestLog } from './http/request-log.ts';
import { createLogger } from '@plumbline/db/logging';
import { requireCsrf } from './auth/session-cookie.ts';
import { authRouter } from './modules/auth/auth.router.ts';
import { healthRouter } from './modules/health/health.router.ts';
import { openApiRouter } from './openapi/openapi.router.ts';
import { labsRouter } from './modules/labs/labs.router.ts';
import { uploadsRouter } from './modules/uploads/uploads.router.ts';
import { labTokensRouter } from './modules/lab-tokens/lab-tokens.router.ts';
import { lookupsRouter } from './modules/lookups/lookups.router.ts';
import { peerReportRouter } from './modules/peer-report/peer-report.router.ts';
import { auditRouter } from './modules/audit/audit.router.ts';
import { catalogueAdminRouter } from './modules/catalogue-admin/catalogue-admin.router.ts';
import { networkLabsRouter } from './modules/network-labs/network-labs.router.ts';
import { cyclesRouter } from './modules/cycles/cycles.router.ts';
import { peerGroupsRouter } from './modules/peer-groups/peer-groups.router.ts';
import { lotComparisonsRouter } from './modules/lot-comparisons/lot-comparisons.router.ts';
import { recomputeFailuresRouter } from './modules/recompute-failures/recompute-failures.router.ts';
import { publishingRouter } from './modules/publishing/publishing.router.ts';
import { labOverviewRouter } from './modules/lab-overview/lab-overview.router.ts';
import { labReviewRouter } from './modules/lab-review/lab-review.router.ts';
import { labProceduresRouter } from './modules/lab-procedures/lab-procedures.router.ts';
import { reportDrilldownRouter } from './modules/report-drilldown/report-drilldown.router.ts';
import { procedureEventsRouter } from './modules/procedure-events/procedure-events.router.ts';
import { reportExportRouter } from './modules/report-export/report-export.router.ts';
import { referenceIntervalsRouter } from './modules/reference-intervals/reference-intervals.router.ts';

/** Builds the HTTP app (never listens, so tests drive it in-process). */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  const passportInstance = configurePassport(deps.db, deps.env.JWT_SECRET);
  const requireUser = authenticate(deps.db, passportInstance);
  // Lab API tokens are accepted on the upload routes (POST /uploads, GET /uploads/:id) and for recording
  // procedure events (POST /labs/:labId/procedure-events and .../procedures/:procedureId/events).
  const requireUploader = authenticate(deps.db, passportInstance, { allowLabTokens: true });

  app.use(securityHeaders(deps.env.PUBLIC_URL));
  const api = Router();
  api.use(requestId);
  api.use(requestLog(deps.logger ?? createLogger('api')));
  api.use(corsForPublicUrl(deps.env.PUBLIC_URL));
  api.use(cookieParser());
  api.use(requireCsrf(deps.env.JWT_SECRET));
  api.use(express.json({ limit: '2mb' }));
  api.use(passportInstance.initialize());
  api.use(healthRouter(deps));
  api.use(openApiRouter(deps));
  api.use(authRouter(deps, passportInstance));
  api.use(labsRouter(deps, requireUser));
  api.use(uploadsRouter(deps, { requireUser, requireUploader }));
  api.use(labTokensRouter(deps, requireUser));
  api.use(lookupsRouter(deps, requireUser));
  api.use(peerReportRouter(deps, requireUser));
  api.use(auditRouter(deps, requireUser));
  api.use(catalogueAdminRouter(deps, requireUser));
  api.use(networkLabsRouter(deps, requireUser));
  api.use(cyclesRouter(deps, requireUser));
  api.use(recomputeFailuresRouter(deps, requireUser));
  api.use(peerGroupsRouter(deps, requireUser));
  api.use(lotComparisonsRouter(deps, requireUser));
  api.use(publishingRouter(deps, requireUser));
  api.use(labOverviewRouter(deps, requireUser));
  api.use(labReviewRouter(deps, requireUser));
  api.use(labProceduresRouter(deps, requireUser));
  api.use(reportDrilldownRouter(deps, requireUser));
  api.use(reportExportRouter(deps, requireUser));
  api.use(referenceIntervalsRouter(deps, requireUser));
  api.use(procedureEventsRouter(deps, { requireUser, requireUserOrToken: requireUploader }));
  api.use(notFoundHandler);
  api.use(errorHandler);
  app.use('/api', api);

  serveWebApp(app, deps.env.WEB_DIST_DIR);
  return app;
}

/** Serves the built single-page app, falling back to index.html for client-side routes. */
function serveWebApp(app: Express, distDir?: string) {
  const dir = resolve(distDir ?? join(import.meta.dirname, '../../web/dist'));
  if (!existsSync(join(dir, 'index.html'))) return;
  app.use(express.static(dir, { index: false, maxAge: '1h' }));
  app.get(/^(?!\/api\/).*/, (_req, res) => res.sendFile(join(dir, 'index.html')));
}

import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { principalOf, requireRole } from '../../auth/authenticate.ts';
import * as service from './peer-groups.service.ts';

/**
 * Peer groups for the coordinator: the groups of a control lot and analyte at each tier with their
 * members and figures; merge, split, move and exclude, each with a preview (nothing written) and an
 * apply (audited, recomputed); the list of adjustments and their undo. Coordinator only.
 */
export function peerGroupsRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const coordinatorOnly = [requireUser, requireRole('coordinator')];

  router.get('/peer-groups', ...coordinatorOnly, async (req, res) => {
    res.json(await service.peerGroupsView(deps.db, req.query));
  });
  router.get('/peer-groups/analytes', ...coordinatorOnly, async (req, res) => {
    res.json(await service.listAnalytes(deps.db, req.query));
  });

  router.post('/peer-groups/merge/preview', ...coordinatorOnly, async (req, res) => {
    res.json(await service.previewMerge(deps.db, req.body));
  });
  router.post('/peer-groups/merge', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await service.applyMerge(deps.db, principalOf(req), req.body));
  });

  router.post('/peer-groups/split/preview', ...coordinatorOnly, async (req, res) => {
    res.json(await service.previewSplit(deps.db, req.body));
  });
  router.post('/peer-groups/split', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await service.applySplit(deps.db, principalOf(req), req.body));
  });

  router.post('/peer-groups/move/preview', ...coordinatorOnly, async (req, res) => {
    res.json(await service.previewMove(deps.db, req.body));
  });
  router.post('/peer-groups/move', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await service.applyMove(deps.db, principalOf(req), req.body));
  });

  router.post('/peer-groups/exclusions/preview', ...coordinatorOnly, async (req, res) => {
    res.json(await service.previewExclusion(deps.db, req.body));
  });
  router.post('/peer-groups/exclusions', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await service.applyExclusion(deps.db, principalOf(req), req.body));
  });

  router.get('/peer-groups/adjustments', ...coordinatorOnly, async (req, res) => {
    res.json(await service.listAdjustments(deps.db, req.query));
  });
  router.post('/peer-groups/adjustments/:id/undo', ...coordinatorOnly, async (req, res) => {
    res.json(await service.undoAdjustment(deps.db, principalOf(req), String(req.params.id), req.body));
  });

  return router;
}

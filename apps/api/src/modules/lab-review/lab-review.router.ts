import { Router, type RequestHandler } from 'express';
import {
  commentCreateSchema,
  commentListQuerySchema,
  commentUpdateSchema,
  periodKeySchema,
  signoffCreateSchema,
} from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import {
  addComment,
  editComment,
  getPeriodSignoff,
  listComments,
  listSignoffs,
  removeComment,
  signPeriod,
} from './lab-review.service.ts';

/** Corrective-action comments on report rows and the supervisor's sign-off of a period. */
export function labReviewRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();

  router.get('/labs/:labId/comments', requireUser, async (req, res) => {
    const query = parseInput(commentListQuerySchema, req.query, 'query');
    res.json(await listComments(deps.db, principalOf(req), String(req.params.labId), query.period));
  });

  router.post('/labs/:labId/comments', requireUser, async (req, res) => {
    const input = parseInput(commentCreateSchema, req.body);
    res.status(201).json(await addComment(deps.db, principalOf(req), String(req.params.labId), input));
  });

  router.patch('/labs/:labId/comments/:commentId', requireUser, async (req, res) => {
    const input = parseInput(commentUpdateSchema, req.body);
    res.json(
      await editComment(
        deps.db,
        principalOf(req),
        String(req.params.labId),
        String(req.params.commentId),
        input.body,
      ),
    );
  });

  router.delete('/labs/:labId/comments/:commentId', requireUser, async (req, res) => {
    await removeComment(deps.db, principalOf(req), String(req.params.labId), String(req.params.commentId));
    res.status(204).end();
  });

  router.get('/labs/:labId/signoffs', requireUser, async (req, res) => {
    res.json(await listSignoffs(deps.db, principalOf(req), String(req.params.labId)));
  });

  router.get('/labs/:labId/signoffs/:period', requireUser, async (req, res) => {
    const period = parseInput(periodKeySchema, req.params.period, 'period');
    res.json(await getPeriodSignoff(deps.db, principalOf(req), String(req.params.labId), period));
  });

  router.post('/labs/:labId/signoffs', requireUser, async (req, res) => {
    const input = parseInput(signoffCreateSchema, req.body);
    res.status(201).json(await signPeriod(deps.db, principalOf(req), String(req.params.labId), input));
  });

  return router;
}

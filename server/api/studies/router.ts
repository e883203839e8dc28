import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser, requireUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { pageQuerySchema } from '../../../shared/model/teams.ts';
import { createStudySchema, studyIdSchema } from '../../../shared/model/study.ts';
import * as service from './service.ts';
import { idSchema } from '../../../shared/model/ids.ts';

const sketchParams = z.object({ sketchId: idSchema('sketch') });
const studyParams = z.object({ studyId: studyIdSchema });

/** Studies of a sketch: list, run-and-save, open, delete. Mounted at /api; every route needs a signed-in user. */
export function studiesRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/sketches/:sketchId/studies', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await service.listStudies(ctx, currentUser(req).id, sketchId, parseOr400(pageQuerySchema, req.query, 'query')));
  });
  router.post('/sketches/:sketchId/studies', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    const body = parseOr400(createStudySchema, req.body);
    // Someone who closes the tab or cancels the request no longer waits for the study: it stops
    // at its next slice, saves nothing and frees its heavy slot [H1].
    const closed = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) closed.abort();
    });
    res.status(201).json(await service.createStudy(ctx, currentUser(req).id, sketchId, body, closed.signal));
  });
  router.get('/studies/:studyId', requireUser, async (req, res) => {
    const { studyId } = parseOr400(studyParams, req.params, 'params');
    res.json(await service.getStudy(ctx, currentUser(req).id, studyId));
  });
  router.delete('/studies/:studyId', requireUser, async (req, res) => {
    const { studyId } = parseOr400(studyParams, req.params, 'params');
    await service.deleteStudy(ctx, currentUser(req).id, studyId);
    res.status(204).end();
  });
  return router;
}

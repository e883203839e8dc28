import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { createSketchSchema, renameSketchSchema, saveDocumentSchema } from '../../../shared/model/sketchApi.ts';
import * as service from './service.ts';
import { idSchema } from '../../../shared/model/ids.ts';

const teamParams = z.object({ teamId: idSchema('team') });
const sketchParams = z.object({ sketchId: idSchema('sketch') });

/** Team-scoped list/create: mounted at /api/teams/:teamId/sketches. */
export function teamSketchesRouter(ctx: AppContext): Router {
  const { db } = ctx;
  const router = Router({ mergeParams: true });
  router.get('/', async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    res.json(await service.listTeamSketches(db, currentUser(req).id, teamId));
  });
  router.post('/', async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    const body = parseOr400(createSketchSchema, req.body);
    res.status(201).json(await service.createSketch(ctx, currentUser(req).id, teamId, body));
  });
  return router;
}

/** One sketch: mounted at /api/sketches. */
export function sketchesRouter(ctx: AppContext): Router {
  const { db } = ctx;
  const router = Router();
  router.get('/:sketchId', async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await service.getSketch(db, currentUser(req).id, sketchId));
  });
  router.patch('/:sketchId', async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    const { title } = parseOr400(renameSketchSchema, req.body);
    res.json(await service.renameSketch(ctx, currentUser(req).id, sketchId, title));
  });
  router.put('/:sketchId/document', async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    const body = parseOr400(saveDocumentSchema, req.body);
    res.json(await service.saveDocument(ctx, currentUser(req).id, sketchId, body));
  });
  router.post('/:sketchId/duplicate', async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.status(201).json(await service.duplicateSketch(ctx, currentUser(req).id, sketchId));
  });
  router.delete('/:sketchId', async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    await service.deleteSketch(ctx, currentUser(req).id, sketchId);
    res.status(204).end();
  });
  return router;
}

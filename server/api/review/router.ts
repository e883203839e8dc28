import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser, requireUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { pageQuerySchema } from '../../../shared/model/teams.ts';
import { createPinSchema, createSnapshotSchema, importSectionSchema, pinListQuerySchema, replySchema, reviewRequestSchema, setStatusSchema } from '../../../shared/model/review.ts';
import * as pins from '../pins/service.ts';
import * as snapshots from '../snapshots/service.ts';
import * as activity from '../activity/service.ts';
import * as review from './service.ts';

const sketchParams = z.object({ sketchId: z.string().regex(/^sketch_[a-z0-9]{20}$/, 'must be a sketch id') });
const pinParams = z.object({ pinId: z.string().regex(/^pin_[a-z0-9]{20}$/, 'must be a pin id') });
const snapshotParams = z.object({ snapshotId: z.string().regex(/^snap_[a-z0-9]{20}$/, 'must be a snapshot id') });

/** Review workflow: pins and threads, snapshots, imports, activity, status. Mounted at /api; every route needs a signed-in user. */
export function reviewRouter(ctx: AppContext): Router {
  const router = Router();

  router.get('/sketches/:sketchId/pins', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await pins.listPins(ctx, currentUser(req).id, sketchId, parseOr400(pinListQuerySchema, req.query, 'query')));
  });
  router.post('/sketches/:sketchId/pins', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.status(201).json(await pins.createPin(ctx, currentUser(req), sketchId, parseOr400(createPinSchema, req.body)));
  });
  router.get('/pins/:pinId', requireUser, async (req, res) => {
    const { pinId } = parseOr400(pinParams, req.params, 'params');
    res.json(await pins.getPin(ctx, currentUser(req).id, pinId));
  });
  router.post('/pins/:pinId/replies', requireUser, async (req, res) => {
    const { pinId } = parseOr400(pinParams, req.params, 'params');
    res.status(201).json(await pins.reply(ctx, currentUser(req), pinId, parseOr400(replySchema, req.body)));
  });
  router.post('/pins/:pinId/resolve', requireUser, async (req, res) => {
    const { pinId } = parseOr400(pinParams, req.params, 'params');
    res.json(await pins.setStatus(ctx, currentUser(req).id, pinId, 'resolved'));
  });
  router.post('/pins/:pinId/reopen', requireUser, async (req, res) => {
    const { pinId } = parseOr400(pinParams, req.params, 'params');
    res.json(await pins.setStatus(ctx, currentUser(req).id, pinId, 'open'));
  });

  router.get('/sketches/:sketchId/snapshots', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await snapshots.listSnapshots(ctx, currentUser(req).id, sketchId, parseOr400(pageQuerySchema, req.query, 'query')));
  });
  router.post('/sketches/:sketchId/snapshots', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.status(201).json(await snapshots.createSnapshot(ctx, currentUser(req).id, sketchId, parseOr400(createSnapshotSchema, req.body)));
  });
  router.get('/snapshots/:snapshotId', requireUser, async (req, res) => {
    const { snapshotId } = parseOr400(snapshotParams, req.params, 'params');
    res.json(await snapshots.getSnapshot(ctx, currentUser(req).id, snapshotId));
  });
  router.post('/snapshots/:snapshotId/restore', requireUser, async (req, res) => {
    const { snapshotId } = parseOr400(snapshotParams, req.params, 'params');
    res.json(await snapshots.restoreSnapshot(ctx, currentUser(req).id, snapshotId));
  });
  router.post('/sketches/:sketchId/import', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await snapshots.importSection(ctx, currentUser(req).id, sketchId, parseOr400(importSectionSchema, req.body)));
  });

  router.get('/sketches/:sketchId/activity', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await activity.listActivity(ctx, currentUser(req).id, sketchId, parseOr400(pageQuerySchema, req.query, 'query')));
  });
  router.put('/sketches/:sketchId/status', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await review.setReviewStatus(ctx, currentUser(req), sketchId, parseOr400(setStatusSchema, req.body).status));
  });
  router.post('/sketches/:sketchId/review-requests', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await review.requestReview(ctx, currentUser(req), sketchId, parseOr400(reviewRequestSchema, req.body)));
  });

  return router;
}

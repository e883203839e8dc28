import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser, requireUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { pageQuerySchema } from '../../../shared/model/teams.ts';
import { idSchema } from '../../../shared/model/ids.ts';
import { approveSchema, createPinSchema, createSnapshotSchema, importSectionSchema, pinListQuerySchema, replySchema, requestChangesSchema, resetReviewSchema, reviewRequestSchema } from '../../../shared/model/review.ts';
import * as pins from '../pins/service.ts';
import * as snapshots from '../snapshots/service.ts';
import * as activity from '../activity/service.ts';
import * as review from './service.ts';

const sketchParams = z.object({ sketchId: idSchema('sketch') });
const pinParams = z.object({ pinId: idSchema('pin') });
const snapshotParams = z.object({ snapshotId: idSchema('snap', 'snapshot') });

/** Review workflow: pins and threads, snapshots, imports, activity, review requests and outcomes. Mounted at /api; every route needs a signed-in user. */
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
  // Review outcomes [A1]–[A5]: each names the revision it was given to.
  router.post('/sketches/:sketchId/approvals', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await review.approve(ctx, currentUser(req), sketchId, parseOr400(approveSchema, req.body)));
  });
  router.post('/sketches/:sketchId/change-requests', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await review.requestChanges(ctx, currentUser(req), sketchId, parseOr400(requestChangesSchema, req.body)));
  });
  router.post('/sketches/:sketchId/review-reset', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    // [A7] Destructive: only with `confirm: true` in the body.
    parseOr400(resetReviewSchema, req.body);
    res.json(await review.resetReview(ctx, currentUser(req), sketchId));
  });
  router.get('/sketches/:sketchId/review-history', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await review.listReviewHistory(ctx, currentUser(req).id, sketchId, parseOr400(pageQuerySchema, req.query, 'query')));
  });
  router.post('/sketches/:sketchId/review-requests', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    res.json(await review.requestReview(ctx, currentUser(req), sketchId, parseOr400(reviewRequestSchema, req.body)));
  });

  return router;
}

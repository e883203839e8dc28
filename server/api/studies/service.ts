import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import { authorizeSketch } from '../sketches/service.ts';
import { findSketch } from '../sketches/repository.ts';
import { newId } from '../../../shared/model/ids.ts';
import { findDesignPoint, normalizeDocument, sketchCase } from '../../../shared/model/sketch.ts';
import type { CreateStudy, StudyDetail, StudyPage } from '../../../shared/model/study.ts';
import { runStudySliced } from '../../../shared/flight/study.ts';
import type { HeavySlot } from '../../http/heavyWork.ts';
import * as repo from './repository.ts';

/** Time the server computes before letting other requests in (see runStudySliced). */
export const STUDY_SLICE_MS = 25;

/**
 * Runs a study on the server from the sketch as stored now, and keeps it. The server computes
 * the numbers itself (the browser worker's run is a preview), so what is stored can be trusted
 * and is tied to the revision it was computed on. The work is done in slices of
 * STUDY_SLICE_MS between which the event loop serves other requests.
 */
export async function createStudy(ctx: AppContext, userId: string, sketchId: string, input: CreateStudy, signal?: AbortSignal): Promise<StudyDetail> {
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'run and save studies');
  // [H1] one of the person's (and the instance's) few heavy slots, for the run and the save.
  return ctx.heavy.run(userId, 'this study', (slot) => computeAndSave(ctx, userId, sketchId, input, slot, signal));
}

async function computeAndSave(ctx: AppContext, userId: string, sketchId: string, input: CreateStudy, slot: HeavySlot, signal?: AbortSignal): Promise<StudyDetail> {
  const sketch = await findSketch(ctx.db, sketchId);
  if (!sketch) throw new HttpError(404, 'not_found', 'No such sketch.');
  const document = normalizeDocument(sketch.document);
  const pointId = input.definition.designPointId;
  if (pointId !== undefined && !findDesignPoint(document, pointId)) {
    throw new HttpError(400, 'invalid_study', 'definition.designPointId: that design point is not in the sketch (perhaps someone removed it).');
  }
  const outcome = await runStudySliced(sketchCase(document, pointId), input.definition, {
    pause: () => new Promise((r) => (ctx.studyPauseMs > 0 ? setTimeout(r, ctx.studyPauseMs) : setImmediate(r))),
    sliceMs: STUDY_SLICE_MS,
    slicePoints: ctx.studySlicePoints,
    isCancelled: () => (signal?.aborted ?? false) || slot.signal.aborted,
  });
  if (outcome.status === 'invalid') throw new HttpError(400, 'invalid_study', outcome.reason);
  // A slot lost meanwhile (this instance hung past its lease): stop, say so, save nothing.
  if (slot.signal.aborted) throw slot.signal.reason;
  // Only a closed request cancels a study; nobody is left to read the answer.
  if (outcome.status === 'cancelled') throw new HttpError(409, 'study_cancelled', `The study was cancelled after ${outcome.done} of ${outcome.total} points: the request was closed. Nothing was saved.`);
  // Still holding the slot right before the save: an instance that woke after its lease ran out
  // (someone may hold that place now) never stores what it computed.
  await slot.confirm();
  const id = newId('study');
  await repo.insertStudy(ctx.db, {
    id,
    sketchId,
    name: input.name,
    definition: input.definition,
    results: outcome.results,
    revision: sketch.revision,
    points: outcome.results.rows.length,
    counts: outcome.results.counts,
    elapsedMs: Math.round(outcome.elapsedMs),
    createdBy: userId,
  });
  ctx.events.emit('sketchNotice', sketchId, 'studies');
  return getStudy(ctx, userId, id);
}

export async function listStudies(ctx: AppContext, userId: string, sketchId: string, page: { limit: number; offset: number }): Promise<StudyPage> {
  await authorizeSketch(ctx.db, userId, sketchId, 'viewer', 'see studies');
  const { rows, total } = await repo.listStudies(ctx.db, sketchId, page.limit, page.offset);
  return { items: rows, total, ...page };
}

export async function getStudy(ctx: AppContext, userId: string, studyId: string): Promise<StudyDetail> {
  const sketchId = await repo.findStudySketch(ctx.db, studyId);
  if (!sketchId) throw new HttpError(404, 'not_found', 'No such study.');
  await authorizeSketch(ctx.db, userId, sketchId, 'viewer', 'see studies');
  const row = await repo.findStudy(ctx.db, studyId);
  if (!row) throw new HttpError(404, 'not_found', 'No such study.');
  return row;
}

/** For the report: a study of this sketch (404 when it belongs to another one). */
export async function getStudyOfSketch(ctx: AppContext, userId: string, sketchId: string, studyId: string): Promise<StudyDetail> {
  const study = await getStudy(ctx, userId, studyId);
  if (study.sketchId !== sketchId) throw new HttpError(404, 'not_found', 'No such study on this sketch.');
  return study;
}

export async function deleteStudy(ctx: AppContext, userId: string, studyId: string): Promise<void> {
  const sketchId = await repo.findStudySketch(ctx.db, studyId);
  if (!sketchId) throw new HttpError(404, 'not_found', 'No such study.');
  await authorizeSketch(ctx.db, userId, sketchId, 'editor', 'delete studies');
  await repo.deleteStudy(ctx.db, studyId);
  ctx.events.emit('sketchNotice', sketchId, 'studies');
}

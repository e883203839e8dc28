import type { AppContext } from '../../context.ts';
import { HttpError } from '../../http/errors.ts';
import type { SessionUser } from '../../auth/passport.ts';
import { authorizeSketch } from '../sketches/service.ts';
import { findSketch } from '../sketches/repository.ts';
import { solveDocument } from '../sketches/solveDocument.ts';
import { getStudyOfSketch } from '../studies/service.ts';
import { getPreferences } from '../preferences/service.ts';
import type { UnitSystem } from '../../../shared/flight/units.ts';
import { normalizeDocument } from '../../../shared/model/sketch.ts';
import { fileSafeName } from '../../../shared/model/sketchExport.ts';
import { readStoredAnalysis, selectedAnalysis } from '../../../shared/flight/storedAnalysis.ts';
import { renderReport } from './renderReport.ts';
import type { ReportData } from './reportData.ts';
import { findTeamName } from './repository.ts';
import { reviewOf } from '../sketches/service.ts';
import { reviewHistoryPage } from '../review/repository.ts';
import type { ReportReview } from './pdfApproval.ts';

/** The approval record of the report [A6]: the approval in force, or the newest request for changes. */
async function reportReview(ctx: AppContext, sketchId: string, row: Parameters<typeof reviewOf>[0]): Promise<ReportReview> {
  const { approval, reviewState } = reviewOf(row);
  const newest = reviewState === 'changes_requested' ? (await reviewHistoryPage(ctx.db, sketchId, 1, 0)).rows[0] : undefined;
  return { state: reviewState, approval, changesRequested: newest ? { ...newest, at: newest.at.toISOString() } : null };
}

/** "HD-7 Tern fin, root" at revision 12 → "HD-7-Tern-fin-root-r12-report.pdf" ([M3]). */
export function reportFileName(title: string, revision: number): string {
  return `${fileSafeName(title)}-r${revision}-report.pdf`;
}

/**
 * The PDF report of a sketch as stored now: its stored analysis (the server's own solve of the
 * current revision; solved again when an older row lacks one), in the requester's units unless
 * the query names others, with a study of the same sketch when asked.
 */
export async function sketchReport(ctx: AppContext, user: SessionUser, sketchId: string, query: { study?: string; units?: UnitSystem }): Promise<{ pdf: Buffer; fileName: string }> {
  const { teamId } = await authorizeSketch(ctx.db, user.id, sketchId, 'viewer', 'download reports');
  // [H1] drawing a report is heavy work: one of the person's (and the instance's) few slots.
  return ctx.heavy.run(user.id, 'this report', () => drawReport(ctx, user, sketchId, teamId, query));
}

async function drawReport(ctx: AppContext, user: SessionUser, sketchId: string, teamId: string, query: { study?: string; units?: UnitSystem }): Promise<{ pdf: Buffer; fileName: string }> {
  const row = await findSketch(ctx.db, sketchId);
  if (!row) throw new HttpError(404, 'not_found', 'No such sketch.');
  const document = normalizeDocument(row.document);
  // The stored result is used only when it belongs to this very revision (the solve after an
  // edit may still be running); otherwise the document is solved here.
  const stored = row.resultRevision === row.revision ? readStoredAnalysis(row.lastResult) : null;
  const points = stored && stored.selectedPointId === document.selectedPointId && stored.points.length === document.designPoints.length ? stored : solveDocument(document).result;
  const analysis = selectedAnalysis(points)!;
  const study = query.study ? await getStudyOfSketch(ctx, user.id, sketchId, query.study) : null;
  const data: ReportData = {
    title: row.title,
    teamName: await findTeamName(ctx.db, teamId),
    revision: row.revision,
    generatedAt: new Date(),
    generatedBy: user.name,
    units: query.units ?? (await getPreferences(ctx.db, user.id)).unitSystem,
    document,
    analysis,
    points,
    review: await reportReview(ctx, sketchId, row),
    study: study && { id: study.id, name: study.name, revision: study.revision, definition: study.definition, results: study.results, createdByName: study.createdByName, createdAt: study.createdAt },
  };
  return { pdf: await renderReport(data), fileName: reportFileName(row.title, row.revision) };
}

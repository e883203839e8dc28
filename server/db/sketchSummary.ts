import { and, asc, gt, isNull, ne, or, sql } from 'drizzle-orm';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import { normalizeDocument, type SketchDocument } from '../../shared/model/sketch.ts';
import { summarizeDocument, type DocumentSummary } from '../../shared/flight/sketchSummary.ts';
import { sketches } from './schema.ts';

/** The summary columns of `sketches` as Drizzle writes them. */
export interface SketchSummaryColumns {
  vertexCount: number;
  thicknessRatio: number | null;
  selectedMach: number;
  selectedAlphaDeg: number;
  designPointCount: number;
  selectedPointName: string;
  summaryRevision: number;
}

/** A stored summary in the columns' names (what `summarizeDocument` says, at a revision). */
export function summaryToColumns(summary: DocumentSummary, revision: number): SketchSummaryColumns {
  return {
    vertexCount: summary.vertexCount,
    thicknessRatio: summary.thicknessRatio,
    selectedMach: summary.mach,
    selectedAlphaDeg: summary.alphaDeg,
    designPointCount: summary.designPointCount,
    selectedPointName: summary.selectedPointName,
    summaryRevision: revision,
  };
}

/**
 * The summary columns for `document` stored at `revision`: every writer of `sketches.document`
 * (or of `revision`) spreads these into the same insert or update, so the team's list reads
 * the columns and never the document. The database refuses a write of this version whose
 * `summary_revision` is not the revision it writes (trigger `sketches_summary_written`,
 * migrations 0011 and 0012; an instance of the version before may write without it during an
 * upgrade, and the list then reads that row's document until the row is filled).
 */
export function sketchSummaryColumns(document: SketchDocument, revision: number): SketchSummaryColumns {
  return summaryToColumns(summarizeDocument(document), revision);
}

/** A stored row's summary back in the API's names (null while the row has none for its revision). */
export function columnsToSummary(row: {
  vertexCount: number | null;
  thicknessRatio: number | null;
  selectedMach: number | null;
  selectedAlphaDeg: number | null;
  designPointCount: number | null;
  selectedPointName: string | null;
  summaryRevision: number | null;
  revision: number;
}): DocumentSummary | null {
  if (row.summaryRevision !== row.revision) return null;
  if (row.vertexCount === null || row.selectedMach === null || row.selectedAlphaDeg === null || row.designPointCount === null || row.selectedPointName === null) return null;
  return {
    vertexCount: row.vertexCount,
    thicknessRatio: row.thicknessRatio,
    mach: row.selectedMach,
    alphaDeg: row.selectedAlphaDeg,
    designPointCount: row.designPointCount,
    selectedPointName: row.selectedPointName,
  };
}

const BACKFILL_BATCH = 200;

/**
 * Fills the summary of every sketch that has none for its revision — rows stored before
 * migration 0011 (the demo sketches of an existing install among them), and rows an instance of
 * the version before wrote during an upgrade. Run after the
 * migrations, under their lock; idempotent, so every later start finds nothing to do (one scan of
 * the table's summary columns). A row edited meanwhile is left to its writer (the update
 * names the revision it read). A document that does not parse keeps no summary and is counted.
 */
export async function backfillSketchSummaries(db: NodePgDatabase<Record<string, unknown>>): Promise<{ filled: number; unreadable: number }> {
  let filled = 0;
  let unreadable = 0;
  let after = '';
  for (;;) {
    const rows = await db
      .select({ id: sketches.id, revision: sketches.revision, document: sketches.document })
      .from(sketches)
      .where(and(gt(sketches.id, after), or(isNull(sketches.summaryRevision), ne(sketches.summaryRevision, sketches.revision))))
      .orderBy(asc(sketches.id))
      .limit(BACKFILL_BATCH);
    const last = rows.at(-1);
    if (!last) break;
    after = last.id;
    const values: (SketchSummaryColumns & { id: string })[] = [];
    for (const row of rows) {
      let document: SketchDocument;
      try {
        document = normalizeDocument(row.document);
      } catch {
        unreadable += 1;
        continue;
      }
      values.push({ id: row.id, ...sketchSummaryColumns(document, row.revision) });
    }
    if (values.length === 0) continue;
    const { rowCount } = await db.execute(sql`
      update sketches s
         set vertex_count = r.vertex_count, thickness_ratio = r.thickness_ratio, selected_mach = r.selected_mach,
             selected_alpha_deg = r.selected_alpha_deg, design_point_count = r.design_point_count,
             selected_point_name = r.selected_point_name, summary_revision = r.summary_revision
        from jsonb_to_recordset(${JSON.stringify(
          values.map((v) => ({
            id: v.id,
            vertex_count: v.vertexCount,
            thickness_ratio: v.thicknessRatio,
            selected_mach: v.selectedMach,
            selected_alpha_deg: v.selectedAlphaDeg,
            design_point_count: v.designPointCount,
            selected_point_name: v.selectedPointName,
            summary_revision: v.summaryRevision,
          })),
        )}::jsonb)
          as r(id text, vertex_count int, thickness_ratio double precision, selected_mach double precision, selected_alpha_deg double precision,
               design_point_count int, selected_point_name text, summary_revision int)
       where s.id = r.id and s.revision = r.summary_revision`);
    filled += rowCount ?? 0;
  }
  return { filled, unreadable };
}

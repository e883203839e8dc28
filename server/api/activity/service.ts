import type { AppContext } from '../../context.ts';
import { authorizeSketch } from '../sketches/service.ts';
import type { ActivityEntry } from '../../../shared/model/review.ts';
import { activityPage, type ActivityRow } from './repository.ts';

const OP_WORDS: Record<string, string> = {
  moveVertices: 'moved vertices',
  setVertexCoordinate: 'moved vertices',
  insertVertex: 'added vertices',
  deleteVertex: 'deleted vertices',
  replaceSection: 'replaced the section',
  replaceDocument: 'replaced the whole sketch',
  setCondition: 'changed the condition',
  setFlap: 'changed the flap',
  setMomentPoint: 'moved the moment point',
  setLoads: 'changed the loads settings',
  setField: 'changed the flap, moment point or loads settings',
  rename: 'renamed the sketch',
};

function describe(row: ActivityRow): string {
  const who = row.actor_name ?? 'Someone';
  const d = row.detail;
  switch (row.kind) {
    case 'edits': {
      const what = (row.op_types ?? []).map((t) => OP_WORDS[t] ?? t).join(', ');
      return `${who} made ${row.edit_count === 1 ? 'an edit' : `${row.edit_count} edits`} (revision ${row.first_revision === row.last_revision ? row.first_revision : `${row.first_revision}–${row.last_revision}`}): ${what}.`;
    }
    case 'pin.created':
      return `${who} pinned a comment on ${String(d.targetLabel ?? 'the sketch')}: “${String(d.excerpt ?? '')}”`;
    case 'pin.replied':
      return `${who} replied on a pin: “${String(d.excerpt ?? '')}”`;
    case 'pin.resolved':
      return `${who} resolved a pin.`;
    case 'pin.reopened':
      return `${who} reopened a pin.`;
    case 'snapshot.created':
      return d.kind === 'manual' ? `${who} saved snapshot “${String(d.name)}” at revision ${String(d.revision)}.` : `Automatic snapshot “${String(d.name)}” at revision ${String(d.revision)}.`;
    case 'snapshot.restored':
      return `${who} restored snapshot “${String(d.name)}” (new revision ${String(d.revision)}).`;
    case 'section.imported':
      return `${who} imported ${String(d.vertexCount)} vertices from ${String(d.fileName)} (new revision ${String(d.revision)}).`;
    case 'review.requested':
      return `${who} asked ${String(d.reviewerNames)} to review.`;
    case 'review.approved':
      return `${who} approved revision ${String(d.revision)}${d.note ? `: “${String(d.note)}”` : '.'}`;
    case 'review.changes_requested':
      return `${who} requested changes at revision ${String(d.revision)}: “${String(d.note ?? '')}”`;
    case 'review.reset':
      return `${who} reset the review to draft (revision ${String(d.revision)}).`;
    case 'status.changed':
      return `${who} set the status to ${String(d.to).replace('_', ' ')}.`;
  }
}

export async function listActivity(ctx: AppContext, userId: string, sketchId: string, page: { limit: number; offset: number }) {
  await authorizeSketch(ctx.db, userId, sketchId, 'viewer', 'see this sketch’s activity');
  const { rows, total } = await activityPage(ctx.db, sketchId, page.limit, page.offset);
  const items: ActivityEntry[] = rows.map((r) => ({
    id: r.id,
    kind: r.kind,
    actorName: r.actor_name,
    summary: describe(r),
    at: r.at.toISOString(),
    revisions: r.first_revision !== null && r.last_revision !== null ? [r.first_revision, r.last_revision] : null,
    detail: r.detail ?? {},
  }));
  return { items, total, ...page };
}

import { sql } from 'drizzle-orm';
import type { Db } from '../../db/client.ts';
import { sketchEvents } from '../../db/schema.ts';
import { newId } from '../../../shared/model/ids.ts';
import type { ActivityKind, SketchEventKind } from '../../../shared/model/review.ts';

type DbLike = Pick<Db, 'insert' | 'execute'>;

export async function recordSketchEvent(db: DbLike, event: { sketchId: string; actorId: string | null; kind: SketchEventKind; detail?: Record<string, unknown> }) {
  await db.insert(sketchEvents).values({ id: newId('act'), sketchId: event.sketchId, actorId: event.actorId, kind: event.kind, detail: event.detail ?? {} });
}

export interface ActivityRow extends Record<string, unknown> {
  id: string;
  kind: ActivityKind;
  actor_name: string | null;
  at: Date;
  detail: Record<string, unknown>;
  first_revision: number | null;
  last_revision: number | null;
  edit_count: number | null;
  op_types: string[] | null;
}

/**
 * The feed, newest first: events, plus applied edits grouped into runs — consecutive edits by
 * one person with less than five minutes between them become one entry (gaps-and-islands over
 * the edit log). One query, so pagination is exact.
 */
export async function activityPage(db: Db, sketchId: string, limit: number, offset: number): Promise<{ rows: ActivityRow[]; total: number }> {
  const result = await db.execute<ActivityRow & { total: string }>(feedQuery(sketchId, limit, offset));
  let total = result.rows[0] ? Number(result.rows[0].total) : 0;
  if (result.rows.length === 0 && offset > 0) {
    // Past the end: the window count came back with no rows, ask for the first row's count.
    const first = await db.execute<{ total: string }>(feedQuery(sketchId, 1, 0));
    total = first.rows[0] ? Number(first.rows[0].total) : 0;
  }
  return { rows: result.rows.map((r) => ({ ...r, at: new Date(r.at) })), total };
}

function feedQuery(sketchId: string, limit: number, offset: number) {
  return sql`
    with edits as (
      select e.revision, e.user_id, e.created_at, e.op->>'type' as op_type,
             case when lag(e.user_id) over w is distinct from e.user_id
                    or e.created_at - lag(e.created_at) over w > interval '5 minutes'
                  then 1 else 0 end as starts
        from sketch_edits e
       where e.sketch_id = ${sketchId} and e.revision is not null
      window w as (order by e.revision)
    ), runs as (
      select *, sum(starts) over (order by revision) as run from edits
    ), grouped as (
      select 'edits-' || min(revision) as id, 'edits' as kind, max(user_id) as actor_id, max(created_at) as at,
             '{}'::jsonb as detail, min(revision) as first_revision, max(revision) as last_revision,
             count(*)::int as edit_count, array_agg(distinct op_type) as op_types
        from runs group by run
    ), feed as (
      select id, kind, actor_id, at, detail, first_revision, last_revision, edit_count, op_types from grouped
      union all
      select id, kind::text, actor_id, created_at, detail, null, null, null, null from sketch_events where sketch_id = ${sketchId}
    )
    select f.id, f.kind, u.name as actor_name, f.at, f.detail, f.first_revision, f.last_revision, f.edit_count, f.op_types,
           count(*) over () as total
      from feed f left join users u on u.id = f.actor_id
     order by f.at desc, f.id desc
     limit ${limit} offset ${offset}`;
}

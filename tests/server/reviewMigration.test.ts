import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { inject } from 'vitest';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { ensureDatabase } from '../../server/db/admin.ts';
import { MIGRATIONS_FOLDER, applyMigrations } from '../../server/db/migrate.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';

/**
 * Upgrading an install whose sketches were approved before an approval named its revision
 * (migration 0007) [A1][A2]: the approval is rebuilt from the activity feed's last "approved"
 * event at the revision the sketch had then, so a sketch edited since reads "changed since
 * approval"; an approval nobody can date goes back to "in review".
 */
describe('migration 0007: approvals given before they named a revision', () => {
  const adminUrl = inject('pgAdminUrl');
  const name = `sw_mig_${Date.now().toString(36)}_${Math.random().toString(36).slice(2, 8)}`;
  const url = adminUrl.replace(/\/[^/]*$/, `/${name}`);
  let folder: string;
  let client: pg.Client;

  beforeAll(async () => {
    await ensureDatabase(adminUrl, name);
    // The migrations as an install had them before 0007.
    folder = mkdtempSync(path.join(tmpdir(), 'sw-mig-'));
    cpSync(MIGRATIONS_FOLDER, folder, { recursive: true });
    const journalFile = path.join(folder, 'meta', '_journal.json');
    const journal = JSON.parse(readFileSync(journalFile, 'utf8')) as { entries: { idx: number }[] };
    journal.entries = journal.entries.filter((e) => e.idx <= 6);
    writeFileSync(journalFile, JSON.stringify(journal));
    const before = new pg.Client({ connectionString: url });
    await before.connect();
    await migrate(drizzle(before), { migrationsFolder: folder });
    await before.end();
    client = new pg.Client({ connectionString: url });
    await client.connect();
  });
  afterAll(async () => {
    await client?.end();
    if (folder) rmSync(folder, { recursive: true, force: true });
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    await admin.query(`drop database if exists "${name}" with (force)`);
    await admin.end();
  });

  it('rebuilds each dated approval at its revision; an undated one goes back to review', async () => {
    const q = (text: string, values: unknown[] = []) => client.query(text, values);
    const doc = JSON.stringify(defaultSketchDocument());
    await q(`insert into users (id, email, name, password_hash) values ('user_priya', 'priya@harrowgate.example', 'Priya Vance', 'x'), ('user_tomasz', 'tomasz@harrowgate.example', 'Tomasz Reyes', 'x')`);
    await q(`insert into teams (id, name) values ('team_fins', 'Fins group')`);
    // Approved at revision 2, edited to revision 4 since.
    await q(`insert into sketches (id, team_id, title, document, revision, review_status) values ('sketch_edited', 'team_fins', 'Root', $1, 4, 'approved')`, [doc]);
    // Approved at its current revision 1.
    await q(`insert into sketches (id, team_id, title, document, revision, review_status) values ('sketch_current', 'team_fins', 'Tip', $1, 1, 'approved')`, [doc]);
    // Approved with no event to date it.
    await q(`insert into sketches (id, team_id, title, document, revision, review_status) values ('sketch_undated', 'team_fins', 'Canard', $1, 3, 'approved')`, [doc]);
    await q(`insert into sketches (id, team_id, title, document, revision, review_status) values ('sketch_draft', 'team_fins', 'Strake', $1, 2, 'draft')`, [doc]);
    const at = (minutes: number) => new Date(Date.UTC(2030, 2, 4, 9, minutes)).toISOString();
    for (const [sketch, revision, minute] of [
      ['sketch_edited', 1, 0],
      ['sketch_edited', 2, 5],
      ['sketch_edited', 3, 20],
      ['sketch_edited', 4, 25],
      ['sketch_current', 1, 0],
    ] as const) {
      await q(`insert into sketch_edits (id, sketch_id, op_id, revision, user_id, op, status, created_at) values ($1, $2, $3, $4, 'user_tomasz', '{"type":"rename","title":"x"}', 'applied', $5)`, [
        `edit_${sketch}_${revision}`,
        sketch,
        `op_${sketch}_${revision}`,
        revision,
        at(minute),
      ]);
    }
    const approvedEvent = (id: string, sketch: string, minute: number) =>
      q(`insert into sketch_events (id, sketch_id, actor_id, kind, detail, created_at) values ($1, $2, 'user_priya', 'status.changed', '{"from":"in_review","to":"approved"}', $3)`, [id, sketch, at(minute)]);
    await approvedEvent('act_old', 'sketch_edited', 1); // an earlier approval, superseded
    await approvedEvent('act_new', 'sketch_edited', 10);
    await approvedEvent('act_tip', 'sketch_current', 30);

    await applyMigrations(url);

    const rows = (
      await q(`select s.id, s.review_status, s.revision, o.revision as approved_revision, o.actor_name, o.outcome, o.created_at
                 from sketches s left join review_outcomes o on o.id = s.approval_id order by s.id`)
    ).rows;
    const byId = Object.fromEntries(rows.map((r) => [r.id, r]));
    expect(byId.sketch_edited).toMatchObject({ review_status: 'approved', revision: 4, approved_revision: 2, actor_name: 'Priya Vance', outcome: 'approved' });
    expect((byId.sketch_edited.created_at as Date).toISOString()).toBe(at(10));
    expect(byId.sketch_current).toMatchObject({ review_status: 'approved', revision: 1, approved_revision: 1, actor_name: 'Priya Vance' });
    expect(byId.sketch_undated).toMatchObject({ review_status: 'in_review', approved_revision: null });
    expect(byId.sketch_draft).toMatchObject({ review_status: 'draft', approved_revision: null });
    // The history holds exactly the rebuilt approvals, and the new status is usable.
    expect((await q(`select count(*)::int as n from review_outcomes`)).rows[0].n).toBe(2);
    await q(`update sketches set review_status = 'changes_requested' where id = 'sketch_draft'`);
  });
});

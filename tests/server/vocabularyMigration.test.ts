import { afterAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { inject } from 'vitest';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { ensureDatabase } from '../../server/db/admin.ts';
import { MIGRATIONS_FOLDER, applyMigrations, readJournal } from '../../server/db/migrate.ts';
import { DEMO_SKETCHES } from '../../server/db/seed.ts';
import { seedDemoAsBefore } from '../helpers/legacyDemo.ts';
import { solveDocument } from '../../server/api/sketches/solveDocument.ts';
import { SKETCH_EVENT_KINDS } from '../../shared/model/review.ts';
import { AUDIT_ACTIONS } from '../../shared/model/teams.ts';

/**
 * Upgrading to migration 0009, which turns the audit actions, the activity kinds, the edit
 * outcomes and the solve status into enums [M1]: a demo install (`npm start`'s seed) holding
 * every word the code ever wrote — the feed's legacy `status.changed` included — converts whole;
 * a solve status or an edit outcome outside the lists is mapped (unknown; from the edit's
 * revision); an audit action or an activity kind outside them stops the upgrade with a message
 * naming the word, and nothing is changed.
 */
const TAG = '0009_vocabulary_enums';

describe('migration 0009: closed vocabularies become enums', () => {
  const adminUrl = inject('pgAdminUrl');
  const folders: string[] = [];
  const names: string[] = [];

  /** A database at the migrations an install had before 0009. */
  async function databaseBefore0009(): Promise<{ url: string; client: pg.Client }> {
    const index = readJournal().find((e) => e.tag === TAG)?.idx;
    if (index === undefined) throw new Error(`${TAG} is not in the journal`);
    const name = `sw_mig_${Date.now().toString(36)}_${Math.random().toString(36).slice(2, 8)}`;
    names.push(name);
    await ensureDatabase(adminUrl, name);
    const url = adminUrl.replace(/\/[^/]*$/, `/${name}`);
    const folder = mkdtempSync(path.join(tmpdir(), 'sw-mig-'));
    folders.push(folder);
    cpSync(MIGRATIONS_FOLDER, folder, { recursive: true });
    const journalFile = path.join(folder, 'meta', '_journal.json');
    const journal = JSON.parse(readFileSync(journalFile, 'utf8')) as { entries: { idx: number }[] };
    journal.entries = journal.entries.filter((e) => e.idx < index);
    writeFileSync(journalFile, JSON.stringify(journal));
    const client = new pg.Client({ connectionString: url });
    await client.connect();
    await migrate(drizzle(client), { migrationsFolder: folder });
    return { url, client };
  }

  /** Rows every install can hold: one of each audit action and activity kind, and edits of each outcome. */
  async function addHistory(client: pg.Client, teamId: string, sketchId: string) {
    const q = (text: string, values: unknown[] = []) => client.query(text, values);
    for (const [i, action] of AUDIT_ACTIONS.entries()) {
      await q(`insert into audit_events (id, team_id, action, target_email, detail) values ($1, $2, $3, 'tomasz@harrowgate.example', '{"role":"editor"}')`, [`audit_h${i}`, teamId, action]);
    }
    for (const [i, kind] of SKETCH_EVENT_KINDS.entries()) {
      await q(`insert into sketch_events (id, sketch_id, kind, detail) values ($1, $2, $3, '{}')`, [`act_h${i}`, sketchId, kind]);
    }
    const edit = (id: string, revision: number | null, status: string) =>
      q(`insert into sketch_edits (id, sketch_id, op_id, revision, op, status, reason) values ($1, $2, $1, $3, '{"type":"rename","title":"x"}', $4, $5)`, [
        id,
        sketchId,
        revision,
        status,
        revision === null ? 'refused' : null,
      ]);
    await edit('op_applied', 1, 'applied');
    await edit('op_rebased', 2, 'rebased');
    await edit('op_rejected', null, 'rejected');
    return { edit };
  }

  afterAll(async () => {
    for (const folder of folders) rmSync(folder, { recursive: true, force: true });
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    for (const name of names) await admin.query(`drop database if exists "${name}" with (force)`);
    await admin.end();
  });

  it('a seeded demo install with every word ever written converts whole; stray outcomes and statuses are mapped', async () => {
    const { url, client } = await databaseBefore0009();
    const q = (text: string, values: unknown[] = []) => client.query(text, values);
    // The demo as `npm start` seeded it then (the seed of today writes columns 0009 lacks).
    await seedDemoAsBefore(client);
    const team = (await q(`select id from teams`)).rows[0].id as string;
    const sketch = (await q(`select id from sketches order by title limit 1`)).rows[0].id as string;
    const { edit } = await addHistory(client, team, sketch);
    // Words no code wrote, by hand: an edit outcome (applied: it has a revision; rejected: none)
    // and a solve status.
    await edit('op_stray_applied', 3, 'done');
    await edit('op_stray_rejected', null, 'failed');
    await q(`insert into sketches (id, team_id, title, document, last_solve_status) values ('sketch_stray', $1, 'Stray', '{}', 'error')`, [team]);
    const statusesBefore = (await q(`select id, last_solve_status from sketches where id <> 'sketch_stray' order by id`)).rows;

    await applyMigrations(url);

    const types = (await q(`select table_name || '.' || column_name as col, udt_name from information_schema.columns
                              where table_schema = 'public' and (table_name, column_name) in
                                (('audit_events','action'), ('sketch_events','kind'), ('sketch_edits','status'), ('sketches','last_solve_status'))`)).rows;
    expect(Object.fromEntries(types.map((r) => [r.col, r.udt_name]))).toEqual({
      'audit_events.action': 'audit_action',
      'sketch_events.kind': 'sketch_event_kind',
      'sketch_edits.status': 'edit_status',
      'sketches.last_solve_status': 'analysis_status',
    });
    expect((await q(`select action::text from audit_events order by id`)).rows.map((r) => r.action).sort()).toEqual([...AUDIT_ACTIONS].sort());
    expect((await q(`select kind::text from sketch_events order by id`)).rows.map((r) => r.kind).sort()).toEqual([...SKETCH_EVENT_KINDS].sort());
    const edits = Object.fromEntries((await q(`select id, status::text from sketch_edits`)).rows.map((r) => [r.id, r.status]));
    expect(edits).toEqual({ op_applied: 'applied', op_rebased: 'rebased', op_rejected: 'rejected', op_stray_applied: 'applied', op_stray_rejected: 'rejected' });
    // The demo's statuses are the seed's own solves, kept as they were.
    const statusesAfter = (await q(`select id, last_solve_status::text from sketches where id <> 'sketch_stray' order by id`)).rows;
    expect(statusesAfter).toEqual(statusesBefore);
    expect(statusesAfter.map((r) => r.last_solve_status).sort()).toEqual(DEMO_SKETCHES.map((s) => solveDocument(s.document).status).sort());
    expect((await q(`select last_solve_status from sketches where id = 'sketch_stray'`)).rows[0].last_solve_status).toBeNull();
    await client.end();
  });

  it.each([
    ['audit_events.action', 'AUDIT_ACTIONS', (team: string) => [`insert into audit_events (id, team_id, action) values ('audit_odd', $1, 'member.promoted')`, [team]] as const, 'member.promoted'],
    ['sketch_events.kind', 'SKETCH_EVENT_KINDS', (_team: string, sketch: string) => [`insert into sketch_events (id, sketch_id, kind) values ('act_odd', $1, 'pin.moved')`, [sketch]] as const, 'pin.moved'],
  ])('a word outside the list in %s stops the upgrade naming it and %s; nothing is changed', async (column, listName, stray, word) => {
    const { url, client } = await databaseBefore0009();
    const q = (text: string, values: unknown[] = []) => client.query(text, values);
    await q(`insert into teams (id, name) values ('team_fins', 'Fins group')`);
    await q(`insert into sketches (id, team_id, title, document, last_solve_status) values ('sketch_root', 'team_fins', 'Root', '{}', 'ok')`);
    await addHistory(client, 'team_fins', 'sketch_root');
    const [text, values] = stray('team_fins', 'sketch_root');
    await q(text, [...values]);

    const failure = await applyMigrations(url).then(
      () => null,
      (e: unknown) => e as Error,
    );
    expect(failure).not.toBeNull();
    const message = `${failure?.message} ${String((failure as { cause?: { message?: string } } | null)?.cause?.message ?? '')}`;
    expect(message).toContain(`${column} holds words outside ${listName}`);
    expect(message).toContain(`'${word}'`);
    // The upgrade is one transaction: no enum, no column changed, 0009 not recorded.
    expect((await q(`select count(*)::int as n from pg_type where typname in ('audit_action', 'sketch_event_kind', 'edit_status', 'analysis_status')`)).rows[0].n).toBe(0);
    expect((await q(`select data_type from information_schema.columns where table_name = 'audit_events' and column_name = 'action'`)).rows[0].data_type).toBe('text');
    expect((await q(`select count(*)::int as n from drizzle.__drizzle_migrations`)).rows[0].n).toBe(readJournal().findIndex((e) => e.tag === TAG));
    // Once the row is changed, the upgrade goes through.
    await q(column.startsWith('audit') ? `delete from audit_events where id = 'audit_odd'` : `delete from sketch_events where id = 'act_odd'`);
    await applyMigrations(url);
    expect((await q(`select udt_name from information_schema.columns where table_name = 'audit_events' and column_name = 'action'`)).rows[0].udt_name).toBe('audit_action');
    await client.end();
  });
});

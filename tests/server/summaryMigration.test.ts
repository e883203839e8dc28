import { afterAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { inject } from 'vitest';
import pg from 'pg';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { ensureDatabase } from '../../server/db/admin.ts';
import { openDatabase } from '../../server/db/client.ts';
import { MIGRATIONS_FOLDER, applyMigrations, readJournal } from '../../server/db/migrate.ts';
import { DEMO_SKETCHES } from '../../server/db/seed.ts';
import { listTeamSketches } from '../../server/api/sketches/service.ts';
import { normalizeDocument } from '../../shared/model/sketch.ts';
import { summarizeDocument } from '../../shared/flight/sketchSummary.ts';
import { firstItem } from '../../shared/util/invariant.ts';
import { expectClose } from '../helpers/expectClose.ts';
import { seedDemoAsBefore } from '../helpers/legacyDemo.ts';

/**
 * [T6] Upgrading an install to migration 0011, which keeps the sketches table's summary in
 * columns: rows written the old way (the demo `npm start` seeded, an old-format document, a
 * sketch edited to a later revision) list correctly at once — from their documents, before the
 * data step — and get their summary when migrations run (`applyMigrations`' data step), equal
 * to the summary of their document at their revision; a document that does not parse is left
 * alone; a second run changes nothing.
 */
const TAG = '0011_sketch_summaries';

describe('migration 0011: the sketches table’s summary in columns, filled for existing rows', () => {
  const adminUrl = inject('pgAdminUrl');
  const folders: string[] = [];
  const names: string[] = [];

  /** A database at the migrations in `keep` (the journal's entries it names). */
  async function databaseAt(keep: (idx: number, index: number) => boolean): Promise<{ url: string; client: pg.Client }> {
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
    journal.entries = journal.entries.filter((e) => keep(e.idx, index));
    writeFileSync(journalFile, JSON.stringify(journal));
    const client = new pg.Client({ connectionString: url });
    await client.connect();
    await migrate(drizzle(client), { migrationsFolder: folder });
    return { url, client };
  }

  afterAll(async () => {
    for (const folder of folders) rmSync(folder, { recursive: true, force: true });
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    for (const name of names) await admin.query(`drop database if exists "${name}" with (force)`);
    await admin.end();
  });

  it('the demo and older rows list correctly before the data step and hold their summary after it; a second run changes nothing', async () => {
    const { url, client } = await databaseAt((idx, index) => idx < index);
    const q = (text: string, values: unknown[] = []) => client.query(text, values);
    const demo = await seedDemoAsBefore(client);
    const owner = firstItem(demo.userIds);
    // A version 1 document (one condition), edited to revision 3 before the upgrade.
    await q(
      `insert into sketches (id, team_id, title, document, revision) values ('sketch_v1', $1, 'Old format', $2, 3)`,
      [demo.teamId, JSON.stringify({ version: 1, section: { points: [[0, 0], [0.5, 0.04], [1, 0], [0.5, -0.04]] }, condition: { mach: 1.8, alphaDeg: -1 } })],
    );
    // A document that does not parse, in a team of its own (no list could show it, before or after).
    await q(`insert into teams (id, name) values ('team_stray', 'Stray')`);
    await q(`insert into sketches (id, team_id, title, document) values ('sketch_unreadable', 'team_stray', 'Unreadable', '{}')`);

    // The schema of 0011 without its data step: nothing filled yet, and the list is right anyway.
    await migrate(drizzle(client), { migrationsFolder: MIGRATIONS_FOLDER });
    expect((await q(`select count(*)::int as n from sketches where summary_revision is not null`)).rows[0].n).toBe(0);
    const opened = openDatabase(url, { max: 1 });
    try {
      const before = await listTeamSketches(opened.db, owner, demo.teamId);
      expect(before).toHaveLength(DEMO_SKETCHES.length + 1);

      await applyMigrations(url);

      const rows = (await q(`select * from sketches where team_id = $1 order by id`, [demo.teamId])).rows;
      expect(rows).toHaveLength(DEMO_SKETCHES.length + 1);
      for (const r of rows) {
        expect(r.summary_revision, r.title).toBe(r.revision);
        expect({
          vertexCount: r.vertex_count,
          thicknessRatio: r.thickness_ratio,
          mach: r.selected_mach,
          alphaDeg: r.selected_alpha_deg,
          designPointCount: r.design_point_count,
          selectedPointName: r.selected_point_name,
        }).toEqual(summarizeDocument(normalizeDocument(r.document)));
      }
      // Hand values: the demo's 5 % double wedge (thickness 0.05 over chord 1) at its first
      // point, and the old-format row (0.08 over 1) as the one point it becomes.
      const wedge = rows.find((r) => r.title.startsWith('Tern fin root — double wedge, 5% thick'));
      expect(wedge).toMatchObject({ vertex_count: 4, selected_mach: 2.6, selected_alpha_deg: 4, design_point_count: 3, selected_point_name: 'Burnout' });
      expectClose(wedge.thickness_ratio, 0.05, 1e-12);
      const v1 = rows.find((r) => r.id === 'sketch_v1');
      expect(v1).toMatchObject({ revision: 3, summary_revision: 3, vertex_count: 4, selected_mach: 1.8, selected_alpha_deg: -1, design_point_count: 1, selected_point_name: 'Design point 1' });
      expectClose(v1.thickness_ratio, 0.08, 1e-12);
      // A document that does not parse keeps no summary (and stops nothing).
      expect((await q(`select summary_revision from sketches where id = 'sketch_unreadable'`)).rows[0]).toEqual({ summary_revision: null });

      // The list now answers from the columns, and says what it said from the documents.
      const after = await listTeamSketches(opened.db, owner, demo.teamId);
      expect(after).toEqual(before);

      // Every later start: nothing to fill, nothing changed.
      const stamp = (await q(`select id, updated_at, summary_revision from sketches order by id`)).rows;
      await applyMigrations(url);
      expect((await q(`select id, updated_at, summary_revision from sketches order by id`)).rows).toEqual(stamp);
    } finally {
      await opened.close();
      await client.end();
    }
  });
});

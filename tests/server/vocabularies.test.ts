import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { is } from 'drizzle-orm';
import { getTableConfig, isPgEnum, PgTable } from 'drizzle-orm/pg-core';
import * as schema from '../../server/db/schema.ts';
import { UNIT_SYSTEMS } from '../../shared/flight/units.ts';
import { ANALYSIS_STATUSES } from '../../shared/model/analysis.ts';
import { PIN_STATUSES, REVIEW_OUTCOMES, REVIEW_STATUSES, SKETCH_EVENT_KINDS, SNAPSHOT_KINDS } from '../../shared/model/review.ts';
import { ROLES } from '../../shared/model/roles.ts';
import { AUDIT_ACTIONS } from '../../shared/model/teams.ts';
import { EDIT_STATUSES } from '../../shared/protocol/messages.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/database.ts';
import { defaultSketchDocument } from '../../shared/model/sketch.ts';
import { summarizeDocument } from '../../shared/flight/sketchSummary.ts';

/**
 * [M1] Each closed vocabulary the database stores is one list in shared/, and the column is a
 * PostgreSQL enum built from that list: the migrated database holds exactly the list's words in
 * the list's order, and refuses any other word whoever writes it (a raw query included).
 */
const VOCABULARIES: { list: readonly string[]; listName: string; dbEnum: { enumName: string; enumValues: readonly string[] }; columns: [table: string, column: string][] }[] = [
  { list: ROLES, listName: 'ROLES', dbEnum: schema.roleEnum, columns: [['memberships', 'role'], ['invitations', 'role']] },
  { list: UNIT_SYSTEMS, listName: 'UNIT_SYSTEMS', dbEnum: schema.unitSystemEnum, columns: [['users', 'unit_system']] },
  { list: REVIEW_STATUSES, listName: 'REVIEW_STATUSES', dbEnum: schema.reviewStatusEnum, columns: [['sketches', 'review_status']] },
  { list: REVIEW_OUTCOMES, listName: 'REVIEW_OUTCOMES', dbEnum: schema.reviewOutcomeEnum, columns: [['review_outcomes', 'outcome']] },
  { list: PIN_STATUSES, listName: 'PIN_STATUSES', dbEnum: schema.pinStatusEnum, columns: [['pins', 'status']] },
  { list: SNAPSHOT_KINDS, listName: 'SNAPSHOT_KINDS', dbEnum: schema.snapshotKindEnum, columns: [['snapshots', 'kind']] },
  { list: ANALYSIS_STATUSES, listName: 'ANALYSIS_STATUSES', dbEnum: schema.analysisStatusEnum, columns: [['sketches', 'last_solve_status']] },
  { list: AUDIT_ACTIONS, listName: 'AUDIT_ACTIONS', dbEnum: schema.auditActionEnum, columns: [['audit_events', 'action']] },
  { list: EDIT_STATUSES, listName: 'EDIT_STATUSES', dbEnum: schema.editStatusEnum, columns: [['sketch_edits', 'status']] },
  { list: SKETCH_EVENT_KINDS, listName: 'SKETCH_EVENT_KINDS', dbEnum: schema.sketchEventKindEnum, columns: [['sketch_events', 'kind']] },
];

describe('vocabularies: one list in shared/, one enum in the database [M1]', () => {
  let database: TestDatabase;
  const q = (text: string, values: unknown[] = []) => database.pool.query(text, values);

  beforeAll(async () => {
    database = await createTestDatabase();
  });
  afterAll(async () => database?.drop());

  it('every enum the schema declares is listed here, built from its shared list', () => {
    const declared = Object.values(schema)
      .filter((v) => isPgEnum(v))
      .map((e) => e.enumName)
      .sort();
    expect(declared).toEqual(VOCABULARIES.map((v) => v.dbEnum.enumName).sort());
    for (const v of VOCABULARIES) expect(v.dbEnum.enumValues, v.listName).toEqual([...v.list]);
  });

  it('the migrated database holds exactly each list, in order, and no other enum', async () => {
    const types = await q(`select t.typname as name, array_agg(e.enumlabel order by e.enumsortorder)::text[] as labels
                             from pg_type t join pg_enum e on e.enumtypid = t.oid join pg_namespace n on n.oid = t.typnamespace
                            where n.nspname = 'public' group by t.typname order by t.typname`);
    const inDatabase = Object.fromEntries(types.rows.map((r: { name: string; labels: string[] }) => [r.name, r.labels]));
    expect(Object.keys(inDatabase).sort()).toEqual(VOCABULARIES.map((v) => v.dbEnum.enumName).sort());
    for (const v of VOCABULARIES) expect(inDatabase[v.dbEnum.enumName], `${v.listName} = enum ${v.dbEnum.enumName}`).toEqual([...v.list]);
  });

  it('each column holding a vocabulary is of its enum type, in the schema and in the database', async () => {
    const byColumn = new Map<string, string>();
    for (const table of Object.values(schema)) {
      if (!is(table, PgTable)) continue;
      const config = getTableConfig(table);
      for (const c of config.columns) if (c.columnType === 'PgEnumColumn') byColumn.set(`${config.name}.${c.name}`, c.getSQLType());
    }
    const expected = VOCABULARIES.flatMap((v) => v.columns.map(([t, c]) => [`${t}.${c}`, v.dbEnum.enumName] as const));
    expect(Object.fromEntries(byColumn)).toEqual(Object.fromEntries(expected));
    for (const [column, enumName] of expected) {
      const [table, name] = column.split('.');
      const { rows } = await q(`select udt_name from information_schema.columns where table_schema = 'public' and table_name = $1 and column_name = $2`, [table, name]);
      expect(rows[0]?.udt_name, column).toBe(enumName);
    }
  });

  it('the database refuses a word outside the list in every converted column, naming the enum; the list’s own words go in', async () => {
    await q(`insert into users (id, email, name, password_hash) values ('user_ines', 'ines@harrowgate.example', 'Ines Marlow', 'x')`);
    await q(`insert into teams (id, name) values ('team_fins', 'Fins group')`);
    const summary = summarizeDocument(defaultSketchDocument());
    // A sketch row carries its document's summary (the trigger of migration 0011 holds it).
    await q(
      `insert into sketches (id, team_id, title, document, vertex_count, thickness_ratio, selected_mach, selected_alpha_deg, design_point_count, selected_point_name, summary_revision)
       values ('sketch_root', 'team_fins', 'Root', $1, $2, $3, $4, $5, $6, $7, 0)`,
      [JSON.stringify(defaultSketchDocument()), summary.vertexCount, summary.thicknessRatio, summary.mach, summary.alphaDeg, summary.designPointCount, summary.selectedPointName],
    );
    const refused = async (text: string, values: unknown[], enumName: string) => {
      const err = (await q(text, values).then(
        () => null,
        (e: unknown) => e,
      )) as { code?: string; message?: string } | null;
      expect(err, text).not.toBeNull();
      expect(err?.code).toBe('22P02'); // invalid_text_representation
      expect(err?.message).toContain(`invalid input value for enum ${enumName}`);
    };
    const writes: [list: readonly string[], enumName: string, write: (word: string, i: number) => [string, unknown[]]][] = [
      [ANALYSIS_STATUSES, 'analysis_status', (w) => [`update sketches set last_solve_status = $1 where id = 'sketch_root'`, [w]]],
      [AUDIT_ACTIONS, 'audit_action', (w, i) => [`insert into audit_events (id, team_id, action) values ($1, 'team_fins', $2)`, [`audit_${i}`, w]]],
      [EDIT_STATUSES, 'edit_status', (w, i) => [`insert into sketch_edits (id, sketch_id, op_id, op, status) values ($1, 'sketch_root', $1, '{}', $2)`, [`op_${i}`, w]]],
      [SKETCH_EVENT_KINDS, 'sketch_event_kind', (w, i) => [`insert into sketch_events (id, sketch_id, kind) values ($1, 'sketch_root', $2)`, [`act_${i}`, w]]],
    ];
    let i = 0;
    for (const [list, enumName, write] of writes) {
      for (const word of ['done', '', 'OK', `${list[0]} `]) await refused(...write(word, i++), enumName);
      for (const word of list) await q(...write(word, i++));
    }
    expect((await q(`select count(*)::int as n from audit_events`)).rows[0].n).toBe(AUDIT_ACTIONS.length);
    expect((await q(`select count(*)::int as n from sketch_edits`)).rows[0].n).toBe(EDIT_STATUSES.length);
    expect((await q(`select count(*)::int as n from sketch_events`)).rows[0].n).toBe(SKETCH_EVENT_KINDS.length);
    expect((await q(`select last_solve_status from sketches`)).rows[0].last_solve_status).toBe(ANALYSIS_STATUSES.at(-1));
  });
});

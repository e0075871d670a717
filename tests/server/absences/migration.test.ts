import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createTestDb, type TestDb } from '../helpers/test-db';
import * as m0007 from '../../../server/db/migrations/0007-absences-terms';

let db: TestDb;
beforeAll(async () => {
  db = await createTestDb();
});
afterAll(async () => {
  await db?.drop();
});

const columns = async (table: string) =>
  (await db.sequelize.query<{ Field: string; Type: string; Null: string; Default: string | null }>(`SHOW COLUMNS FROM \`${table}\``, { type: QueryTypes.SELECT })).map(
    (c) => c.Field,
  );

describe('migration 0007-absences-terms', () => {
  it('creates absences, absence_settings and person_terms, and wishes.entered_by_user_id', async () => {
    expect(await columns('absences')).toEqual(
      expect.arrayContaining(['workspace_id', 'person_id', 'kind', 'start_date', 'end_date', 'start_time', 'end_time', 'credit_hours', 'note', 'status', 'requested_by_user_id', 'decided_by_user_id', 'decided_at', 'decline_reason', 'version']),
    );
    expect(await columns('person_terms')).toEqual(['id', 'workspace_id', 'person_id', 'term', 'effective_from', 'version', 'created_at', 'updated_at']);
    expect(await columns('absence_settings')).toContain('credits');
    expect(await columns('wishes')).toContain('entered_by_user_id');
  });

  it('people referenced by absences or terms cannot be deleted (RESTRICT)', async () => {
    const q = db.sequelize;
    await q.query("INSERT INTO workspaces (name, time_zone, created_at, updated_at) VALUES ('W', 'UTC', NOW(), NOW())");
    const [[w]] = (await q.query('SELECT MAX(id) AS id FROM workspaces')) as [{ id: number }[], unknown];
    await q.query(`INSERT INTO people (workspace_id, name, contracted_hours, skills, created_at, updated_at) VALUES (${w.id}, 'Odile Brack', 30, '[]', NOW(), NOW())`);
    const [[p]] = (await q.query('SELECT MAX(id) AS id FROM people')) as [{ id: number }[], unknown];
    await q.query(`INSERT INTO person_terms (workspace_id, person_id, term, effective_from, created_at, updated_at) VALUES (${w.id}, ${p.id}, '{}', '2027-01-01', NOW(), NOW())`);
    await expect(q.query(`DELETE FROM people WHERE id = ${p.id}`)).rejects.toThrow(/foreign key/i);
    await q.query(`DELETE FROM person_terms WHERE person_id = ${p.id}`);
    await q.query(`INSERT INTO absences (workspace_id, person_id, kind, start_date, end_date, status, created_at, updated_at) VALUES (${w.id}, ${p.id}, 'sick', '2027-01-01', '2027-01-02', 'approved', NOW(), NOW())`);
    await expect(q.query(`DELETE FROM people WHERE id = ${p.id}`)).rejects.toThrow(/foreign key/i);
  });

  // Only this migration's own down and up: later migrations belong to others and are tested there.
  it('goes down and up again', async () => {
    const q = db.sequelize.getQueryInterface();
    await db.sequelize.query('DELETE FROM absences');
    await db.sequelize.query('DELETE FROM person_terms');
    await m0007.down(q);
    const tables = (await db.sequelize.query<Record<string, string>>('SHOW TABLES', { type: QueryTypes.SELECT })).map((t) => Object.values(t)[0]);
    expect(tables).not.toContain('absences');
    expect(tables).not.toContain('person_terms');
    expect(tables).not.toContain('absence_settings');
    expect(await columns('wishes')).not.toContain('entered_by_user_id');
    await m0007.up(q);
    expect(await columns('wishes')).toContain('entered_by_user_id');
    expect(await columns('absences')).toContain('decline_reason');
  });
});

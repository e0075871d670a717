import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';

/** The name MariaDB gave the foreign key on `table.column`, so it can be replaced. */
async function foreignKeyName(q: QueryInterface, table: string, column: string): Promise<string> {
  const rows = await q.sequelize.query<{ name: string }>(
    `SELECT CONSTRAINT_NAME AS name FROM information_schema.KEY_COLUMN_USAGE
      WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = ? AND COLUMN_NAME = ? AND REFERENCED_TABLE_NAME IS NOT NULL`,
    { replacements: [table, column], type: QueryTypes.SELECT },
  );
  if (rows.length !== 1) throw new Error(`expected one foreign key on ${table}.${column}, found ${rows.length}`);
  return rows[0].name;
}

async function setOnDelete(q: QueryInterface, table: string, column: string, refTable: string, onDelete: 'RESTRICT' | 'CASCADE'): Promise<void> {
  const name = await foreignKeyName(q, table, column);
  await q.sequelize.query(`ALTER TABLE \`${table}\` DROP FOREIGN KEY \`${name}\``);
  await q.sequelize.query(`ALTER TABLE \`${table}\` ADD CONSTRAINT \`${table}_${column}_fk\` FOREIGN KEY (\`${column}\`) REFERENCES \`${refTable}\` (\`id\`) ON DELETE ${onDelete} ON UPDATE CASCADE`);
}

/**
 * Nothing lost (issue 13):
 * - people can be archived: a person who was ever rostered stays as a row (hidden from lists)
 *   so solved and published rosters keep their names;
 * - a run's assignments hold on to their people (RESTRICT): deleting a person can no longer take
 *   rows out of a published roster (it took a CSV from 56 rows to 51);
 * - a published roster keeps a snapshot of what was published (names, times, labels), which its
 *   CSV and iCalendar exports are written from;
 * - a roster's pattern labels are unique, so simultaneous creates cannot make every shift twice.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.addColumn('people', 'archived_at', { type: DataTypes.DATE, allowNull: true });
  await q.addIndex('people', ['workspace_id', 'archived_at']);
  await setOnDelete(q, 'assignments', 'person_id', 'people', 'RESTRICT');
  await q.addColumn('rosters', 'published_snapshot', { type: DataTypes.JSON, allowNull: true });
  // Labels made twice by the old race get a number, so the unique index can be built.
  await q.sequelize.query(
    `UPDATE shift_patterns p JOIN (
        SELECT id, ROW_NUMBER() OVER (PARTITION BY roster_id, label ORDER BY id) AS n FROM shift_patterns
      ) d ON d.id = p.id
      SET p.label = LEFT(CONCAT(p.label, ' (', d.n, ')'), 60) WHERE d.n > 1`,
  );
  await q.addIndex('shift_patterns', ['roster_id', 'label'], { unique: true, name: 'shift_patterns_roster_label_unique' });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeIndex('shift_patterns', 'shift_patterns_roster_label_unique');
  await q.removeColumn('rosters', 'published_snapshot');
  await setOnDelete(q, 'assignments', 'person_id', 'people', 'CASCADE');
  await q.removeIndex('people', ['workspace_id', 'archived_at']);
  await q.removeColumn('people', 'archived_at');
}

import { DataTypes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const ref = (model: string, allowNull = false, onDelete = 'CASCADE') => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model, key: 'id' },
  onDelete,
});
const version = { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 };

/**
 * Absences (approved time away, requests from staff) with the per-kind credit defaults of a
 * workspace; per-person terms (server/terms); who entered a wish (a coordinator on someone's behalf).
 *
 * People are referenced with RESTRICT from absences and terms: both are records of what was agreed
 * with a person (hours credited, contract terms), so deleting the person must not silently erase
 * them; the people service has to deal with them first.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('absences', {
    id,
    workspace_id: ref('workspaces'),
    person_id: ref('people', false, 'RESTRICT'),
    kind: { type: DataTypes.ENUM('annual', 'sick', 'training', 'parental', 'other'), allowNull: false },
    start_date: { type: DataTypes.DATEONLY, allowNull: false },
    end_date: { type: DataTypes.DATEONLY, allowNull: false },
    // Part day: null = from the start of start_date / to the end of end_date.
    start_time: { type: DataTypes.STRING(5), allowNull: true },
    end_time: { type: DataTypes.STRING(5), allowNull: true },
    // null = the workspace's default for the kind, worked out when read.
    credit_hours: { type: DataTypes.DECIMAL(7, 2), allowNull: true },
    note: { type: DataTypes.STRING(500), allowNull: true },
    status: { type: DataTypes.ENUM('requested', 'approved', 'declined'), allowNull: false, defaultValue: 'approved' },
    requested_by_user_id: ref('users', true, 'SET NULL'),
    decided_by_user_id: ref('users', true, 'SET NULL'),
    decided_at: { type: DataTypes.DATE, allowNull: true },
    decline_reason: { type: DataTypes.STRING(500), allowNull: true },
    version,
    ...timestamps,
  });
  await q.addIndex('absences', ['workspace_id', 'person_id', 'start_date']);

  await q.createTable('absence_settings', {
    id,
    workspace_id: ref('workspaces'),
    // shared/api/absences.ts absenceSettingsBody.credits; no row = DEFAULT_ABSENCE_CREDITS.
    credits: { type: DataTypes.JSON, allowNull: false },
    version,
    ...timestamps,
  });
  await q.addIndex('absence_settings', ['workspace_id'], { unique: true });

  await q.createTable('person_terms', {
    id,
    workspace_id: ref('workspaces'),
    person_id: ref('people', false, 'RESTRICT'),
    term: { type: DataTypes.JSON, allowNull: false },
    effective_from: { type: DataTypes.DATEONLY, allowNull: false },
    version,
    ...timestamps,
  });
  await q.addIndex('person_terms', ['workspace_id', 'person_id', 'effective_from']);

  await q.addColumn('wishes', 'entered_by_user_id', ref('users', true, 'SET NULL'));
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeColumn('wishes', 'entered_by_user_id');
  for (const table of ['person_terms', 'absence_settings', 'absences']) await q.dropTable(table);
}

import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Staff on their phones: a private calendar feed per person (only a SHA-256 of its token is kept,
 * so a copy of the database does not open anyone's calendar), and who asked for a pairing, so a
 * staff member sees their own requests and nobody else's.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('calendar_feeds', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    workspace_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'workspaces', key: 'id' }, onDelete: 'CASCADE' },
    person_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'people', key: 'id' }, onDelete: 'CASCADE' },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('calendar_feeds', ['token_hash'], { unique: true });
  await q.addIndex('calendar_feeds', ['workspace_id', 'person_id'], { unique: true });

  await q.addColumn('pairings', 'requested_by_person_id', {
    type: DataTypes.INTEGER.UNSIGNED,
    allowNull: true,
    references: { model: 'people', key: 'id' },
    onDelete: 'SET NULL',
  });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeColumn('pairings', 'requested_by_person_id');
  await q.dropTable('calendar_feeds');
}

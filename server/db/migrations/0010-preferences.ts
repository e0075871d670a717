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

/**
 * Coordinators' edits as preferences (the roster kept over the one proposed), and the weight
 * suggestions learned from them (server/learning). A preference keeps the roster JSON as it was
 * when the edit was made, so later changes to shifts or people do not change what the edit said.
 * Runs are referenced with SET NULL: deleting a run must not erase what the coordinator chose.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('preferences', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    // 'manual': a hand-edited save; 'alternative': a seat alternative pinned from a run.
    source: { type: DataTypes.ENUM('manual', 'alternative'), allowNull: false },
    kept_run_id: ref('runs', true, 'SET NULL'),
    proposed_run_id: ref('runs', true, 'SET NULL'),
    roster_json: { type: DataTypes.JSON, allowNull: false },
    kept: { type: DataTypes.JSON, allowNull: false },
    proposed: { type: DataTypes.JSON, allowNull: false },
    seats_changed: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    created_by_user_id: ref('users', true, 'SET NULL'),
    ...timestamps,
  });
  await q.addIndex('preferences', ['workspace_id', 'id']);

  await q.createTable('weight_suggestions', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    status: { type: DataTypes.ENUM('open', 'adopted', 'dismissed'), allowNull: false, defaultValue: 'open' },
    // { key: { from, to } } for every learned rule, and the report shown on the screen.
    weights: { type: DataTypes.JSON, allowNull: false },
    report: { type: DataTypes.JSON, allowNull: false },
    edit_count: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    roster_count: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    // the roster version the suggestion was learned against: adopting a stale one is a 409
    roster_version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    created_by_user_id: ref('users', true, 'SET NULL'),
    decided_by_user_id: ref('users', true, 'SET NULL'),
    decided_at: { type: DataTypes.DATE, allowNull: true },
    // the rules before adoption, so the change is on record and can be undone by hand
    rules_before: { type: DataTypes.JSON, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('weight_suggestions', ['workspace_id', 'roster_id', 'id']);
}

export async function down(q: QueryInterface): Promise<void> {
  for (const table of ['weight_suggestions', 'preferences']) await q.dropTable(table);
}

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
 * The team's side of a published roster (issue 17): swaps and giveaways between staff, seats a
 * coordinator offers to eligible staff, and the workspace's holiday calendar the ledger counts
 * public holidays from. An approved change makes a new finished run that becomes the published
 * one, so `result_run_id` points at the run the change produced (SET NULL: deleting a run must
 * not erase that the change happened). People are RESTRICT, like assignments (migration 0008).
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('swaps', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    kind: { type: DataTypes.ENUM('swap', 'giveaway'), allowNull: false },
    proposer_person_id: ref('people', false, 'RESTRICT'),
    proposer_seat_id: ref('seats'),
    colleague_person_id: ref('people', false, 'RESTRICT'),
    // null for a giveaway: the colleague only takes the proposer's seat
    colleague_seat_id: ref('seats', true),
    status: { type: DataTypes.ENUM('proposed', 'accepted', 'approved', 'refused', 'declined', 'withdrawn'), allowNull: false, defaultValue: 'proposed' },
    // the check against the published run when proposed (scores, breaches and words)
    check_result: { type: DataTypes.JSON, allowNull: false },
    base_run_id: ref('runs', true, 'SET NULL'),
    result_run_id: ref('runs', true, 'SET NULL'),
    decided_by_user_id: ref('users', true, 'SET NULL'),
    decided_at: { type: DataTypes.DATE, allowNull: true },
    version,
    ...timestamps,
  });
  await q.addIndex('swaps', ['workspace_id', 'status']);
  await q.addIndex('swaps', ['workspace_id', 'roster_id']);

  await q.createTable('offers', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    seat_id: ref('seats'),
    status: { type: DataTypes.ENUM('open', 'taken', 'approved', 'refused', 'withdrawn'), allowNull: false, defaultValue: 'open' },
    // person ids the offer went to, each checked against every hard rule when it was made
    eligible: { type: DataTypes.JSON, allowNull: false },
    taker_person_id: ref('people', true, 'RESTRICT'),
    taken_at: { type: DataTypes.DATE, allowNull: true },
    check_result: { type: DataTypes.JSON, allowNull: true },
    base_run_id: ref('runs', true, 'SET NULL'),
    result_run_id: ref('runs', true, 'SET NULL'),
    created_by_user_id: ref('users', true, 'SET NULL'),
    decided_at: { type: DataTypes.DATE, allowNull: true },
    version,
    ...timestamps,
  });
  await q.addIndex('offers', ['workspace_id', 'status']);
  await q.addIndex('offers', ['workspace_id', 'roster_id']);

  // One row per workspace: where public holidays come from, and how much the next roster's
  // fairness leans on what the ledger counted before it (points per night or weekend shift over).
  await q.createTable('ledger_settings', {
    id,
    workspace_id: { ...ref('workspaces'), unique: true },
    // a date-holidays region ("GB-ENG", "DE-BY", "FR"); null = only the dates entered
    region: { type: DataTypes.STRING(20), allowNull: true },
    night_weight: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 3 },
    weekend_weight: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 3 },
    lookback_days: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 91 },
    version,
    ...timestamps,
  });
  await q.createTable('holidays', {
    id,
    workspace_id: ref('workspaces'),
    date: { type: DataTypes.DATEONLY, allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('holidays', ['workspace_id', 'date'], { unique: true, name: 'holidays_workspace_date_unique' });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.dropTable('holidays');
  await q.dropTable('ledger_settings');
  await q.dropTable('offers');
  await q.dropTable('swaps');
}

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

export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('rosters', {
    id,
    workspace_id: ref('workspaces'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    period_start: { type: DataTypes.DATEONLY, allowNull: false },
    period_end: { type: DataTypes.DATEONLY, allowNull: false },
    time_zone: { type: DataTypes.STRING(64), allowNull: false },
    status: { type: DataTypes.ENUM('draft', 'solved', 'published'), allowNull: false, defaultValue: 'draft' },
    // Working-time and fairness rules (shared/roster ruleSetSchema), one set per roster.
    rules: { type: DataTypes.JSON, allowNull: false },
    wish_deadline: { type: DataTypes.DATE, allowNull: true },
    max_cannot_days: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    published_run_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    published_at: { type: DataTypes.DATE, allowNull: true },
    version,
    ...timestamps,
  });
  await q.addIndex('rosters', ['workspace_id', 'period_start']);

  await q.createTable('shift_patterns', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    label: { type: DataTypes.STRING(60), allowNull: false },
    weekdays: { type: DataTypes.JSON, allowNull: false },
    start_time: { type: DataTypes.STRING(5), allowNull: false },
    end_time: { type: DataTypes.STRING(5), allowNull: false },
    seats: { type: DataTypes.JSON, allowNull: false },
    night: { type: DataTypes.BOOLEAN, allowNull: true },
    version,
    ...timestamps,
  });

  await q.createTable('shifts', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    pattern_id: ref('shift_patterns', true, 'SET NULL'),
    label: { type: DataTypes.STRING(60), allowNull: false },
    // Local date-times in the roster's time zone ("2027-01-04T07:00"), as a coordinator reads them.
    starts_local: { type: DataTypes.STRING(19), allowNull: false },
    ends_local: { type: DataTypes.STRING(19), allowNull: false },
    night: { type: DataTypes.BOOLEAN, allowNull: true },
    version,
    ...timestamps,
  });
  await q.addIndex('shifts', ['roster_id', 'starts_local']);

  await q.createTable('seats', {
    id,
    workspace_id: ref('workspaces'),
    shift_id: ref('shifts'),
    skill_id: ref('skills', true, 'SET NULL'),
    position: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    ...timestamps,
  });
  await q.addIndex('seats', ['shift_id', 'position'], { unique: true });

  await q.createTable('wishes', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    person_id: ref('people'),
    date: { type: DataTypes.DATEONLY, allowNull: true },
    shift_id: ref('shifts', true),
    kind: { type: DataTypes.ENUM('prefer', 'avoid', 'cannot'), allowNull: false },
    strength: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 1 },
    note: { type: DataTypes.STRING(500), allowNull: true },
    ...timestamps,
  });
  await q.addIndex('wishes', ['roster_id', 'person_id']);

  await q.createTable('pairings', {
    id,
    workspace_id: ref('workspaces'),
    person_a_id: ref('people'),
    person_b_id: ref('people'),
    score: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    never_together: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    // Staff requests wait for a coordinator; only approved pairings reach the solver.
    status: { type: DataTypes.ENUM('approved', 'requested', 'declined'), allowNull: false, defaultValue: 'approved' },
    reason: { type: DataTypes.STRING(500), allowNull: true },
    version,
    ...timestamps,
  });
  await q.addIndex('pairings', ['workspace_id', 'person_a_id', 'person_b_id'], { unique: true });

  await q.createTable('pins', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    seat_id: ref('seats'),
    person_id: ref('people', true),
    ...timestamps,
  });
  await q.addIndex('pins', ['seat_id'], { unique: true });

  await q.createTable('runs', {
    id,
    workspace_id: ref('workspaces'),
    roster_id: ref('rosters'),
    status: { type: DataTypes.ENUM('queued', 'running', 'done', 'failed', 'cancelled'), allowNull: false, defaultValue: 'queued' },
    parameters: { type: DataTypes.JSON, allowNull: false },
    progress: { type: DataTypes.JSON, allowNull: true },
    score: { type: DataTypes.DOUBLE, allowNull: true },
    bound: { type: DataTypes.DOUBLE, allowNull: true },
    gap: { type: DataTypes.DOUBLE, allowNull: true },
    roster_version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    cancel_requested: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    claimed_by: { type: DataTypes.STRING(80), allowNull: true },
    heartbeat_at: { type: DataTypes.DATE, allowNull: true },
    started_at: { type: DataTypes.DATE, allowNull: true },
    finished_at: { type: DataTypes.DATE, allowNull: true },
    time_ms: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    // Decoded result: concessions, per-rule terms and violations, per-person hours.
    result: { type: DataTypes.JSON, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('runs', ['status', 'id']);
  await q.addIndex('runs', ['roster_id', 'id']);

  await q.createTable('assignments', {
    id,
    workspace_id: ref('workspaces'),
    run_id: ref('runs'),
    seat_id: ref('seats'),
    person_id: ref('people', true),
    pinned: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await q.addIndex('assignments', ['run_id', 'seat_id'], { unique: true });
}

export async function down(q: QueryInterface): Promise<void> {
  for (const table of ['assignments', 'runs', 'pins', 'pairings', 'wishes', 'seats', 'shifts', 'shift_patterns', 'rosters']) {
    await q.dropTable(table);
  }
}

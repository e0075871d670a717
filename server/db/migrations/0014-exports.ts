import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Large exports (issue 15): a file the compute worker prepares while the browser waits on a 202.
 * The row is written first, its job added after the commit (job id `export-<id>`), and the worker
 * writes the bytes here, so every API process can hand the file over whichever worker made it.
 * Rows are deleted when `expires_at` passes (the worker's reconciler).
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('exports', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    workspace_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'workspaces', key: 'id' }, onDelete: 'CASCADE' },
    // roster-pdf, roster-csv, roster-ics, people-csv
    kind: { type: DataTypes.STRING(20), allowNull: false },
    // the validated query the file is made from, as JSON text: equal requests share one job
    params: { type: DataTypes.STRING(500), allowNull: false },
    status: { type: DataTypes.ENUM('queued', 'running', 'done', 'failed'), allowNull: false, defaultValue: 'queued' },
    filename: { type: DataTypes.STRING(200), allowNull: true },
    content_type: { type: DataTypes.STRING(80), allowNull: true },
    body: { type: DataTypes.BLOB('long'), allowNull: true },
    bytes: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    // what the person is told when the file could not be made, and the status it came with (404, 409, …)
    error: { type: DataTypes.TEXT, allowNull: true },
    error_status: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: true },
    claimed_by: { type: DataTypes.STRING(80), allowNull: true },
    started_at: { type: DataTypes.DATE(3), allowNull: true },
    finished_at: { type: DataTypes.DATE(3), allowNull: true },
    time_ms: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    expires_at: { type: DataTypes.DATE(3), allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('exports', ['workspace_id', 'status']);
  await q.addIndex('exports', ['status']);
  await q.addIndex('exports', ['expires_at']);
}

export async function down(q: QueryInterface): Promise<void> {
  await q.dropTable('exports');
}

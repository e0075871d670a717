import { DataTypes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const workspaceRef = {
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull: false,
  references: { model: 'workspaces', key: 'id' },
  onDelete: 'CASCADE',
};

export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('workspaces', {
    id,
    name: { type: DataTypes.STRING(120), allowNull: false },
    time_zone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'UTC' },
    ...timestamps,
  });
  await q.createTable('users', {
    id,
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    display_name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: true },
    google_id: { type: DataTypes.STRING(64), allowNull: true, unique: true },
    email_verified: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...timestamps,
  });
  await q.createTable('memberships', {
    id,
    workspace_id: workspaceRef,
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    role: { type: DataTypes.ENUM('admin', 'coordinator', 'staff'), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('memberships', ['workspace_id', 'user_id'], { unique: true });
  await q.createTable('skills', {
    id,
    workspace_id: workspaceRef,
    name: { type: DataTypes.STRING(80), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('skills', ['workspace_id', 'name'], { unique: true });
  await q.createTable('people', {
    id,
    workspace_id: workspaceRef,
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    name: { type: DataTypes.STRING(120), allowNull: false },
    email: { type: DataTypes.STRING(254), allowNull: true },
    contracted_hours: { type: DataTypes.DECIMAL(5, 2), allowNull: false, defaultValue: 0 },
    skills: { type: DataTypes.JSON, allowNull: false },
    version: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 1 },
    ...timestamps,
  });
  await q.addIndex('people', ['workspace_id', 'name']);
  // The session store's table (express-session through connect-session-sequelize).
  await q.createTable('sessions', {
    sid: { type: DataTypes.STRING(36), primaryKey: true },
    expires: { type: DataTypes.DATE, allowNull: true },
    data: { type: DataTypes.TEXT, allowNull: true },
    ...timestamps,
  });
}

export async function down(q: QueryInterface): Promise<void> {
  for (const table of ['sessions', 'people', 'skills', 'memberships', 'users', 'workspaces']) {
    await q.dropTable(table);
  }
}

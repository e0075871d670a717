import { DataTypes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};
const userRef = (onDelete: 'CASCADE' | 'SET NULL', allowNull: boolean) => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull,
  references: { model: 'users', key: 'id' },
  onDelete,
});

/** Accounts: single-use e-mailed tokens, invitations, sign-in attempts, and sessions findable by user. */
export async function up(q: QueryInterface): Promise<void> {
  // Sessions carry their user so a password reset can end every other session of that user;
  // expiry is indexed because the store deletes expired rows on a timer.
  await q.addColumn('sessions', 'user_id', { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await q.addIndex('sessions', ['user_id']);
  await q.addIndex('sessions', ['expires']);

  // Only a SHA-256 of each token is kept: a leaked table cannot be turned into working links.
  await q.createTable('account_tokens', {
    id,
    user_id: userRef('CASCADE', false),
    purpose: { type: DataTypes.ENUM('password-reset', 'confirm-email'), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    email: { type: DataTypes.STRING(254), allowNull: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('account_tokens', ['user_id', 'purpose']);

  await q.createTable('invitations', {
    id,
    workspace_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'workspaces', key: 'id' }, onDelete: 'CASCADE' },
    email: { type: DataTypes.STRING(254), allowNull: false },
    role: { type: DataTypes.ENUM('admin', 'coordinator', 'staff'), allowNull: false },
    person_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'people', key: 'id' }, onDelete: 'SET NULL' },
    invited_by: userRef('SET NULL', true),
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_by: userRef('SET NULL', true),
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  });
  await q.addIndex('invitations', ['workspace_id', 'email']);

  await q.createTable('sign_in_attempts', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    address: { type: DataTypes.STRING(64), allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('sign_in_attempts', ['email', 'created_at']);
  await q.addIndex('sign_in_attempts', ['address', 'created_at']);
}

export async function down(q: QueryInterface): Promise<void> {
  for (const table of ['sign_in_attempts', 'invitations', 'account_tokens']) await q.dropTable(table);
  await q.removeIndex('sessions', ['expires']);
  await q.removeIndex('sessions', ['user_id']);
  await q.removeColumn('sessions', 'user_id');
}

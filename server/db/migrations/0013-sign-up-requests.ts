import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Sign-up waits for the e-mailed link (issue 13 item 6), so what was typed is kept here until the
 * link is opened. A request for an address that already has an account gets a row too (no link
 * is ever sent for it): both answers then cost the same work, and the rows cap the mail one inbox
 * gets. Only a SHA-256 of each link's token and a bcrypt hash of the password are stored.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('sign_up_requests', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    // Set when the address already had an account: the owner was told, nothing can be finished.
    existing_user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    display_name: { type: DataTypes.STRING(120), allowNull: true },
    workspace_name: { type: DataTypes.STRING(120), allowNull: true },
    time_zone: { type: DataTypes.STRING(64), allowNull: true },
    // Cleared once the link is used: the account has its own copy by then.
    password_hash: { type: DataTypes.STRING(100), allowNull: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    user_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  });
  await q.addIndex('sign_up_requests', ['email', 'created_at']);
  await q.addIndex('sign_up_requests', ['expires_at']);
}

export async function down(q: QueryInterface): Promise<void> {
  await q.dropTable('sign_up_requests');
}

import { DataTypes, type QueryInterface } from 'sequelize';

const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
};

export async function up(q: QueryInterface): Promise<void> {
  // One row per paying (or once-paying) workspace; a workspace without a row is on the free plan.
  await q.createTable('billing_accounts', {
    workspace_id: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true, references: { model: 'workspaces', key: 'id' }, onDelete: 'CASCADE' },
    customer_id: { type: DataTypes.STRING(255), allowNull: true, unique: true },
    // Unique: one subscription belongs to one workspace, and a replayed event cannot attach it twice.
    subscription_id: { type: DataTypes.STRING(255), allowNull: true, unique: true },
    subscription_item_id: { type: DataTypes.STRING(255), allowNull: true },
    status: { type: DataTypes.STRING(32), allowNull: false, defaultValue: 'none' },
    quantity: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    cancel_at_period_end: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    current_period_end: { type: DataTypes.DATE, allowNull: true },
    trial_end: { type: DataTypes.DATE, allowNull: true },
    // An open checkout, reused while it lasts so two admins upgrading at once get one subscription.
    checkout_session_id: { type: DataTypes.STRING(255), allowNull: true },
    checkout_url: { type: DataTypes.STRING(1000), allowNull: true },
    checkout_expires_at: { type: DataTypes.DATE, allowNull: true },
    last_payment_error: { type: DataTypes.STRING(500), allowNull: true },
    // The `created` time of the newest subscription event applied, so an older one arriving late is ignored.
    subscription_event_at: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    ...timestamps,
  });
  // Every webhook event received, keyed by its id: a replayed event hits the primary key and changes nothing.
  await q.createTable('billing_events', {
    id: { type: DataTypes.STRING(255), primaryKey: true },
    workspace_id: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'workspaces', key: 'id' }, onDelete: 'SET NULL' },
    type: { type: DataTypes.STRING(100), allowNull: false },
    event_created: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    outcome: { type: DataTypes.STRING(255), allowNull: false },
    payload: { type: DataTypes.TEXT('medium'), allowNull: false },
    ...timestamps,
  });
  await q.addIndex('billing_events', ['workspace_id', 'created_at']);
  // Workspaces that existed before plans did keep working as they were: the team plan, with no
  // subscription at the payment service (an admin can see this on Plan & billing).
  await q.sequelize.query(
    `INSERT INTO billing_accounts (workspace_id, status, quantity, cancel_at_period_end, created_at, updated_at)
     SELECT w.id, 'active', (SELECT COUNT(*) FROM people p WHERE p.workspace_id = w.id), false, NOW(), NOW() FROM workspaces w`,
  );
}

export async function down(q: QueryInterface): Promise<void> {
  await q.dropTable('billing_events');
  await q.dropTable('billing_accounts');
}

import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Failed sign-ins counted in one row per (account, address) pair and per address. A counter row
 * is locked while it is read and raised, so a burst of simultaneous wrong passwords cannot pass
 * the limit together (issue 13 item 6); `sign_in_attempts` stays as the history, and a success
 * recorded there lets an address that signed in before past its own address's limit.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.createTable('sign_in_counters', {
    // SHA-256 of the scope and key ('pair\n<email>\n<address>', 'address\n<address>')
    key_hash: { type: DataTypes.CHAR(64), primaryKey: true },
    failures: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    window_ends: { type: DataTypes.DATE(3), allowNull: false },
  });
  await q.addIndex('sign_in_counters', ['window_ends']);
  await q.addIndex('sign_in_attempts', ['email', 'address', 'succeeded', 'created_at'], { name: 'sign_in_attempts_pair_success' });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeIndex('sign_in_attempts', 'sign_in_attempts_pair_success');
  await q.dropTable('sign_in_counters');
}

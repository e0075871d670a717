import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * The roster JSON a run solves, assembled and validated once when the run is started
 * (server/runs/start.ts); the worker solves exactly that instead of assembling it again. Kept
 * beside the run rather than in the model's attributes, so reads of runs do not carry it.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.addColumn('runs', 'roster', { type: DataTypes.JSON, allowNull: true });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeColumn('runs', 'roster');
}

import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * How contested each seat of a finished run is (sum-product marginals, server/runs/contest.ts),
 * kept beside the run rather than in `result`, which every read of the run sends to the screen.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.addColumn('runs', 'contest', { type: DataTypes.JSON, allowNull: true });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeColumn('runs', 'contest');
}

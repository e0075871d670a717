import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * The person-decomposition multipliers a run ended with (solveRoster's `dual`: μ by shift and
 * person, ν by period factor), so the next run of the same roster starts its bound there. Kept
 * beside the run rather than in the model's attributes (like `roster`, 0015), so reads of runs
 * do not carry it.
 */
export async function up(q: QueryInterface): Promise<void> {
  await q.addColumn('runs', 'dual', { type: DataTypes.JSON, allowNull: true });
}

export async function down(q: QueryInterface): Promise<void> {
  await q.removeColumn('runs', 'dual');
}

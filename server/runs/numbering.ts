import { Op } from 'sequelize';
import { RunRow } from '../rosters/models';

/**
 * Runs are numbered within their roster (1, 2, 3 …) in the order they were made, so a new
 * workspace's first solve is "Run 1", not its database id. Runs are never deleted, so the
 * count of earlier runs of the same roster is stable and needs no stored column.
 */
export async function runNumbers(workspaceId: number, rosterId: number): Promise<Map<number, number>> {
  const rows = await RunRow.findAll({ where: { workspaceId, rosterId }, attributes: ['id'], order: [['id', 'ASC']], raw: true });
  return new Map(rows.map((r, i) => [r.id, i + 1]));
}

export async function runNumber(run: Pick<RunRow, 'id' | 'workspaceId' | 'rosterId'>): Promise<number> {
  return RunRow.count({ where: { workspaceId: run.workspaceId, rosterId: run.rosterId, id: { [Op.lte]: run.id } } });
}

import { Op, QueryTypes, type Sequelize } from 'sequelize';
import { RunRow } from '../rosters/models';
import { activeRunCap } from '../billing/limits';

/**
 * Marks a run running if its workspace is under its plan's cap of runs solved at once. Count and
 * mark happen under a MariaDB named lock per workspace, so two workers (in any processes) taking
 * two runs of one workspace at the same moment cannot both pass a cap of one. A run that is
 * already 'running' (its last worker died and BullMQ gave it to this one) does not count against itself.
 */
export async function admitRun(sequelize: Sequelize, run: RunRow, workerName: string): Promise<boolean> {
  const cap = await activeRunCap(run.workspaceId);
  const name = `rotaloom.runs.${run.workspaceId}`;
  const t = await sequelize.transaction();
  try {
    const [got] = await sequelize.query<{ got: number | null }>('SELECT GET_LOCK(?, 10) AS got', { replacements: [name], type: QueryTypes.SELECT, transaction: t });
    if (got?.got !== 1) return false;
    try {
      const active = await RunRow.count({ where: { workspaceId: run.workspaceId, status: 'running', id: { [Op.ne]: run.id } } });
      if (active >= cap) return false;
      const now = new Date();
      const [changed] = await RunRow.update(
        { status: 'running', claimedBy: workerName.slice(0, 80), startedAt: run.startedAt ?? now, heartbeatAt: now },
        // outside the lock's transaction: committed before the lock is let go, so the next worker counts it
        { where: { id: run.id, status: { [Op.in]: ['queued', 'running'] } } },
      );
      return changed === 1;
    } finally {
      await sequelize.query('SELECT RELEASE_LOCK(?)', { replacements: [name], type: QueryTypes.SELECT, transaction: t });
    }
  } finally {
    await t.commit();
  }
}

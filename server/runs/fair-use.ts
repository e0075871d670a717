import { Op, type CreationAttributes, type Transaction } from 'sequelize';
import { Workspace } from '../db/models';
import { HttpError } from '../http/errors';
import { transactionWithRetry } from '../db/sequelize';
import { RunRow } from '../rosters/models';
import { standingOf } from '../billing/limits';
import type { PlanId } from '../../shared/billing/plans';
import type { Roster as RosterJson } from '../../shared/roster/schema';
import { saveRunRoster } from './repository';

/**
 * Fair use of the solve workers, by plan: how many runs a workspace may have waiting or solving
 * (admission.ts caps how many of them solve at once) and how long one run may think. Without them
 * one Starter workspace queued 20 runs of 600 s, and every other workspace waited behind them.
 */
export const RUN_ALLOWANCE: Record<PlanId, { waitingOrSolving: number; maxSeconds: number }> = {
  free: { waitingOrSolving: 3, maxSeconds: 60 },
  team: { waitingOrSolving: 30, maxSeconds: 600 },
};

/** A run's time limit within the plan's: 402 naming `body.timeLimitSeconds`, since a bigger plan allows more. */
export async function requireTimeLimitWithinPlan(workspaceId: number, seconds: number): Promise<void> {
  const { plan } = await standingOf(workspaceId);
  const max = RUN_ALLOWANCE[plan].maxSeconds;
  if (seconds <= max) return;
  const message = `Runs on this plan think for at most ${max} s`;
  throw new HttpError(402, 'plan_limit', `${message}; choose ${max} s or less${plan === 'free' ? ', or move to the Team plan for up to 600 s' : ''}.`, [{ path: 'body.timeLimitSeconds', message }]);
}

/**
 * Creates the run row unless the workspace already has its plan's number of runs waiting or
 * solving: then 429 with Retry-After. The workspace row is locked while counting and creating, so
 * simultaneous starts cannot pass the cap together. The roster the run solves is stored with it.
 */
export async function createRunWithinAllowance(workspaceId: number, values: CreationAttributes<RunRow>, roster: RosterJson): Promise<RunRow> {
  const { plan } = await standingOf(workspaceId);
  const { waitingOrSolving } = RUN_ALLOWANCE[plan];
  return transactionWithRetry(RunRow.sequelize!, async (transaction: Transaction) => {
    await Workspace.findByPk(workspaceId, { attributes: ['id'], lock: transaction.LOCK.UPDATE, transaction });
    const busy = await RunRow.count({ where: { workspaceId, status: { [Op.in]: ['queued', 'running'] } }, transaction });
    if (busy >= waitingOrSolving) {
      throw new HttpError(
        429,
        'rate_limited',
        `This workspace already has ${busy} run${busy === 1 ? '' : 's'} waiting or solving, the most its plan allows at once. Wait for one to finish, or cancel one.`,
        [{ path: 'roster.runs', message: `at most ${waitingOrSolving} waiting or solving` }],
        { 'Retry-After': '30' },
      );
    }
    const run = await RunRow.create(values, { transaction });
    await saveRunRoster(run.id, roster, transaction);
    return run;
  });
}

import { Op, QueryTypes, type Transaction } from 'sequelize';
import { HttpError } from '../http/errors';
import type { RequestHandler } from 'express';
import { Person } from '../db/models';
import { Roster } from '../rosters/models';
import { BillingAccount } from './models';
import { PAYMENT_OVERDUE_CODE, PLAN_LIMIT_CODE, PLANS, planForStatus, type LimitName, type PlanId, type SubscriptionStatus } from '../../shared/billing/plans';

export interface Usage {
  people: number;
  activeRosters: number;
}

export interface Standing {
  plan: PlanId;
  status: SubscriptionStatus;
  account: BillingAccount | null;
}

/** The plan a workspace is on now: no billing row, or a subscription that is not live, means the free plan. */
export async function standingOf(workspaceId: number, transaction?: Transaction): Promise<Standing> {
  const account = await BillingAccount.findByPk(workspaceId, { transaction });
  const status = (account?.status ?? 'none') as SubscriptionStatus;
  return { plan: planForStatus(status), status, account };
}

/** People count as seats; a roster is active until it is published (draft or solved). */
export async function usageOf(workspaceId: number, transaction?: Transaction): Promise<Usage> {
  const [people, activeRosters] = await Promise.all([
    // Archived people (kept only for roster history) are not seats.
    Person.count({ where: { workspaceId, archivedAt: null }, transaction }),
    Roster.count({ where: { workspaceId, status: { [Op.ne]: 'published' } }, transaction }),
  ]);
  return { people, activeRosters };
}

const LIMIT_WORDS: Record<LimitName, { noun: (n: number) => string; what: string }> = {
  people: { noun: (n) => `${n} ${n === 1 ? 'person' : 'people'}`, what: 'add more people' },
  activeRosters: { noun: (n) => `${n} roster${n === 1 ? '' : 's'} in progress (not yet published)`, what: 'start another roster, or publish the one in progress first' },
};

/**
 * Refuses to create one more of `limit` when the workspace's plan is full: 402 with a JSON body
 * naming the limit, its size and the current count, and the hint where to upgrade. Used by the
 * people and roster create routes, so the limit holds whatever client calls the API.
 */
export function enforcePlanLimit(limit: LimitName, adding: (req: Parameters<RequestHandler>[0]) => Promise<number> = async () => 1): RequestHandler {
  return async (req, res, next) => {
    const workspaceId = req.auth?.workspaceId;
    if (!workspaceId) return next();
    const { plan } = await standingOf(workspaceId);
    const max = PLANS[plan].limits[limit];
    if (max === null) return next();
    // Count and create must not interleave with another request of the same workspace, or two
    // creates at 11 of 12 would both pass: the lock is held until this request's answer is sent.
    const release = await lockLimit(workspaceId, limit);
    let current: number, more: number;
    try {
      current = (await usageOf(workspaceId))[limit];
      // Bulk creates (a CSV import) say how many they would add; a plain create adds one.
      more = await adding(req);
    } catch (err) {
      await release();
      throw err;
    }
    if (more === 0 || current + more <= max) {
      res.once('close', () => void release());
      return next();
    }
    await release();
    const words = LIMIT_WORDS[limit];
    const hint = req.auth?.role === 'admin' ? `Move to the ${PLANS.team.name} plan under Plan & billing to ${words.what}.` : `An admin of this workspace can move it to the ${PLANS.team.name} plan to ${words.what}.`;
    res.status(402).json({
      error: {
        code: PLAN_LIMIT_CODE,
        message: `The ${PLANS[plan].name} plan allows ${words.noun(max)}, and this workspace has ${current}${more > 1 ? `; this would add ${more}` : ''}. ${hint}`,
        fields: [{ path: `plan.${limit}`, message: `limit of ${max} reached` }],
        limit: { name: limit, max, current, adding: more, plan },
        upgrade: { plan: 'team', path: '/billing' },
      },
    });
  };
}

const LOCK_WAIT_SECONDS = 10;

/**
 * A MariaDB named lock per workspace and limit (GET_LOCK), so it holds across server processes.
 * Named locks belong to a connection, so a transaction keeps one connection for the lock's life;
 * a row lock on the workspace would instead block the create's own foreign-key check.
 */
async function lockLimit(workspaceId: number, limit: LimitName): Promise<() => Promise<void>> {
  const sequelize = Person.sequelize!;
  const name = `rotaloom.limit.${workspaceId}.${limit}`;
  const t = await sequelize.transaction();
  const [row] = await sequelize.query<{ got: number | null }>('SELECT GET_LOCK(?, ?) AS got', { replacements: [name, LOCK_WAIT_SECONDS], type: QueryTypes.SELECT, transaction: t });
  if (row?.got !== 1) {
    await t.rollback();
    throw new HttpError(409, 'conflict', 'Another change to this workspace is still being saved. Please try again in a moment.');
  }
  let released = false;
  return async () => {
    if (released) return;
    released = true;
    try {
      await sequelize.query('SELECT RELEASE_LOCK(?)', { replacements: [name], type: QueryTypes.SELECT, transaction: t });
    } finally {
      await t.commit();
    }
  };
}

/** Overdue payment: everything stays readable, but no new solver runs until it is settled. */
export const requireRunsAllowed: RequestHandler = async (req, res, next) => {
  const workspaceId = req.auth?.workspaceId;
  if (!workspaceId) return next();
  const { status } = await standingOf(workspaceId);
  if (status !== 'past_due') return next();
  res.status(402).json({
    error: {
      code: PAYMENT_OVERDUE_CODE,
      message:
        req.auth?.role === 'admin'
          ? 'The last payment for this workspace failed, so new runs are paused. Rosters and results stay readable. Update the card under Plan & billing to carry on.'
          : 'The last payment for this workspace failed, so new runs are paused. Rosters and results stay readable. An admin can settle it under Plan & billing.',
      fields: [{ path: 'plan.status', message: 'past_due' }],
      upgrade: { plan: 'team', path: '/billing' },
    },
  });
};

/**
 * Runs of one workspace solved at the same time, by plan: more waiting runs stay queued until one
 * ends (server/runs/admission.ts), so one workspace cannot hold every worker. Pricing a concession
 * and seat alternatives are short answers a person waits for, and are not counted.
 */
export const ACTIVE_RUN_CAPS: Record<PlanId, number> = { free: 1, team: 3 };

export async function activeRunCap(workspaceId: number): Promise<number> {
  return ACTIVE_RUN_CAPS[(await standingOf(workspaceId)).plan];
}

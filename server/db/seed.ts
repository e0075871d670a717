import bcrypt from 'bcryptjs';
import type { Sequelize } from 'sequelize';
import { Membership, Person, User, Workspace, type Role } from './models';
import { makeWillowmereRoster, WILLOWMERE_PATTERNS } from '../../shared/demo/willowmere';
import { shiftPatternSchema } from '../../shared/roster/schema';
import { importRosterJson } from '../rosters/import';
import { grantTeamPlan } from '../billing/service';

/** Shown by `npm start` and used by the browser tests; an invented workspace with invented people. */
export const DEMO_PASSWORD = 'willowmere-demo';
export const DEMO_ACCOUNTS: Array<{ email: string; displayName: string; role: Role }> = [
  { email: 'admin@willowmere.example', displayName: 'Tamsin Oakridge', role: 'admin' },
  { email: 'coordinator@willowmere.example', displayName: 'Idris Penhallow', role: 'coordinator' },
  // The staff account is one of the rostered people (linked below), so it has shifts to see.
  { email: 'staff@willowmere.example', displayName: 'Hattie Lowther', role: 'staff' },
];

/** Seeds the Willowmere House demo when the database has no workspace yet; returns whether it did. */
export async function seedDemoIfEmpty(sequelize: Sequelize): Promise<boolean> {
  if ((await Workspace.count()) > 0) return false;
  await sequelize.transaction(async (transaction) => {
    const workspace = await Workspace.create({ name: 'Willowmere House', timeZone: 'Europe/London' }, { transaction });
    const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
    const users = new Map<string, number>();
    for (const account of DEMO_ACCOUNTS) {
      const user = await User.create({ email: account.email, displayName: account.displayName, passwordHash, emailVerified: true }, { transaction });
      await Membership.create({ workspaceId: workspace.id, userId: user.id, role: account.role }, { transaction });
      users.set(account.displayName, user.id);
    }
    // Four weeks of early, late and night shifts with wishes, pairings and every rule on.
    await importRosterJson(workspace.id, makeWillowmereRoster(), {
      name: 'Willowmere House, January 2027',
      patterns: WILLOWMERE_PATTERNS.map((p) => shiftPatternSchema.parse(p)),
      transaction,
    });
    for (const [name, userId] of users) {
      await Person.update({ userId }, { where: { workspaceId: workspace.id, name }, transaction });
    }
    // 18 people are more than the free plan allows: the demo runs on the team plan (without a subscription at the payment service).
    await grantTeamPlan(workspace.id, await Person.count({ where: { workspaceId: workspace.id }, transaction }), transaction);
  });
  return true;
}

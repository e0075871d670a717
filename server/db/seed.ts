import bcrypt from 'bcryptjs';
import type { Sequelize } from 'sequelize';
import { Membership, User, Workspace, type Role } from './models';

/** Shown by `npm start` and used by the browser tests; an invented workspace with invented people. */
export const DEMO_PASSWORD = 'willowmere-demo';
export const DEMO_ACCOUNTS: Array<{ email: string; displayName: string; role: Role }> = [
  { email: 'admin@willowmere.example', displayName: 'Tamsin Oakridge', role: 'admin' },
  { email: 'coordinator@willowmere.example', displayName: 'Idris Penhallow', role: 'coordinator' },
  { email: 'staff@willowmere.example', displayName: 'Nell Abernethy', role: 'staff' },
];

/** Seeds the Willowmere House demo when the database has no workspace yet; returns whether it did. */
export async function seedDemoIfEmpty(sequelize: Sequelize): Promise<boolean> {
  if ((await Workspace.count()) > 0) return false;
  await sequelize.transaction(async (transaction) => {
    const workspace = await Workspace.create({ name: 'Willowmere House', timeZone: 'Europe/London' }, { transaction });
    const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
    for (const account of DEMO_ACCOUNTS) {
      const user = await User.create({ email: account.email, displayName: account.displayName, passwordHash, emailVerified: true }, { transaction });
      await Membership.create({ workspaceId: workspace.id, userId: user.id, role: account.role }, { transaction });
    }
  });
  return true;
}

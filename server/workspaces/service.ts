import { Membership, Workspace } from '../db/models';
import { createWorkspaceFor } from '../auth/service';

/** A new workspace with the user as its admin, in one transaction. */
export function createWorkspace(userId: number, name: string, timeZone: string): Promise<Workspace> {
  return Workspace.sequelize!.transaction((transaction) => createWorkspaceFor(userId, name, timeZone, transaction));
}

export async function renameWorkspace(workspaceId: number, name: string): Promise<void> {
  await Workspace.update({ name }, { where: { id: workspaceId } });
}

export async function isMember(userId: number, workspaceId: number): Promise<boolean> {
  return (await Membership.findOne({ where: { userId, workspaceId }, attributes: ['id'] })) !== null;
}

/** The workspace's IANA time zone ('UTC' when the workspace is gone), for "today" where the workspace is. */
export async function workspaceTimeZone(workspaceId: number): Promise<string> {
  return (await Workspace.findByPk(workspaceId, { attributes: ['timeZone'] }))?.timeZone ?? 'UTC';
}

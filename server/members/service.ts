import { Op, type Transaction } from 'sequelize';
import { Membership, Person, User, Workspace, type Role } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import type { AuthContext } from '../auth/context';
import { Invitation } from '../auth/models';
import { hashToken, newToken } from '../auth/tokens';
import { normalizeEmail } from '../auth/service';
import { CalendarFeedRow } from '../staff/models';
import { transactionWithRetry } from '../db/sequelize';
import { standingOf } from '../billing/limits';
import type { PlanId } from '../../shared/billing/plans';

export const INVITATION_VALID_MS = 7 * 24 * 60 * 60 * 1000;

export interface MemberView {
  userId: number;
  displayName: string;
  email: string;
  role: Role;
  personId: number | null;
  personName: string | null;
  joinedAt: string;
}

/** Every query here is scoped by the caller's workspace id from the session, never by client input. */
export async function listMembers(workspaceId: number): Promise<MemberView[]> {
  const memberships = await Membership.findAll({ where: { workspaceId }, include: [{ model: User, required: true }], order: [['id', 'ASC']] });
  const people = await Person.findAll({ where: { workspaceId, userId: { [Op.ne]: null } }, attributes: ['id', 'name', 'userId'] });
  return memberships.map((m) => {
    const user = (m as Membership & { User: User }).User;
    const person = people.find((p) => p.userId === m.userId);
    return { userId: m.userId, displayName: user.displayName, email: user.email, role: m.role, personId: person?.id ?? null, personName: person?.name ?? null, joinedAt: m.createdAt.toISOString() };
  });
}

async function findMember(workspaceId: number, userId: number): Promise<Membership> {
  const membership = await Membership.findOne({ where: { workspaceId, userId } });
  if (!membership) throw notFound('Member');
  return membership;
}

const lastAdmin = () =>
  new HttpError(409, 'conflict', 'A workspace needs at least one admin: make someone else admin first', [{ path: 'params.id', message: 'This is the last admin' }]);

/**
 * Role changes and removals lock the workspace's admin rows, so two admins demoting each other at
 * the same moment cannot leave the workspace with none.
 */
async function withAdminCheck(workspaceId: number, userId: number, change: (m: Membership, t: Transaction) => Promise<void>, leavesAdmin: (m: Membership) => boolean): Promise<void> {
  await Membership.sequelize!.transaction(async (transaction) => {
    const admins = await Membership.findAll({ where: { workspaceId, role: 'admin' }, lock: transaction.LOCK.UPDATE, transaction });
    const membership = await Membership.findOne({ where: { workspaceId, userId }, transaction });
    if (!membership) throw notFound('Member');
    if (membership.role === 'admin' && !leavesAdmin(membership) && admins.length <= 1) throw lastAdmin();
    await change(membership, transaction);
  });
}

export async function changeRole(auth: AuthContext, userId: number, role: Role): Promise<void> {
  await withAdminCheck(auth.workspaceId, userId, async (m, transaction) => void (await m.update({ role }, { transaction })), () => role === 'admin');
}

export async function removeMember(auth: AuthContext, userId: number): Promise<void> {
  await withAdminCheck(
    auth.workspaceId,
    userId,
    async (m, transaction) => {
      // The person record stays (their shifts are history) but no longer belongs to the login;
      // their calendar feeds and their sessions in this workspace end with the membership, so
      // neither an old feed address nor an open tab keeps showing colleagues' shifts.
      await revokeAccessOf(auth.workspaceId, userId, transaction);
      await Person.update({ userId: null }, { where: { workspaceId: auth.workspaceId, userId }, transaction });
      await m.destroy({ transaction });
    },
    () => false,
  );
}

/** Ends the member's calendar feeds and every session of theirs that works in this workspace. */
async function revokeAccessOf(workspaceId: number, userId: number, transaction: Transaction): Promise<void> {
  const people = await Person.findAll({ where: { workspaceId, userId }, attributes: ['id'], transaction });
  if (people.length) await CalendarFeedRow.destroy({ where: { workspaceId, personId: people.map((p) => p.id) }, transaction });
  // A session without a chosen workspace falls back to the first membership, which may be this one.
  await Membership.sequelize!.query(
    `DELETE FROM sessions WHERE user_id = ? AND (JSON_VALUE(data, '$.workspaceId') = ? OR JSON_VALUE(data, '$.workspaceId') IS NULL)`,
    { replacements: [userId, workspaceId], transaction },
  );
}

/** Links a member to a person record of the same workspace (or unlinks with null); one person per member. */
export async function linkPerson(auth: AuthContext, userId: number, personId: number | null): Promise<void> {
  await findMember(auth.workspaceId, userId);
  await Person.sequelize!.transaction(async (transaction) => {
    if (personId !== null) {
      const person = await Person.findOne({ where: { id: personId, workspaceId: auth.workspaceId }, transaction, lock: transaction.LOCK.UPDATE });
      if (!person) throw new HttpError(404, 'not_found', 'Person not found', [{ path: 'body.personId', message: 'No such person in this workspace' }]);
      if (person.userId !== null && person.userId !== userId) {
        throw new HttpError(409, 'conflict', 'This person is already linked to another member', [{ path: 'body.personId', message: 'Already linked to another member' }]);
      }
    }
    // A feed belongs to the person as the member saw it: unlinking ends it.
    const unlinked = await Person.findAll({ where: { workspaceId: auth.workspaceId, userId, ...(personId !== null ? { id: { [Op.ne]: personId } } : {}) }, attributes: ['id'], transaction });
    if (unlinked.length) await CalendarFeedRow.destroy({ where: { workspaceId: auth.workspaceId, personId: unlinked.map((p) => p.id) }, transaction });
    await Person.update({ userId: null }, { where: { workspaceId: auth.workspaceId, userId }, transaction });
    if (personId !== null) await Person.update({ userId }, { where: { id: personId, workspaceId: auth.workspaceId }, transaction });
  });
}

// ---------------------------------------------------------------- invitations

export type InvitationStatus = 'pending' | 'accepted' | 'revoked' | 'expired';

export interface InvitationView {
  id: number;
  email: string;
  role: Role;
  personId: number | null;
  status: InvitationStatus;
  expiresAt: string;
  createdAt: string;
}

const statusOf = (i: Invitation): InvitationStatus =>
  i.acceptedAt ? 'accepted' : i.revokedAt ? 'revoked' : i.expiresAt.getTime() < Date.now() ? 'expired' : 'pending';

const invitationView = (i: Invitation): InvitationView => ({
  id: i.id,
  email: i.email,
  role: i.role,
  personId: i.personId ?? null,
  status: statusOf(i),
  expiresAt: i.expiresAt.toISOString(),
  createdAt: i.createdAt.toISOString(),
});

/** Open invitations (pending or expired; accepted ones show up as members, revoked ones are gone). */
export async function listInvitations(workspaceId: number): Promise<InvitationView[]> {
  const rows = await Invitation.findAll({ where: { workspaceId, acceptedAt: null, revokedAt: null }, order: [['id', 'DESC']] });
  return rows.map(invitationView);
}

export async function createInvitation(auth: AuthContext, input: { email: string; role: Role; personId?: number | null }): Promise<{ invitation: InvitationView; token: string; workspaceName: string }> {
  const email = normalizeEmail(input.email);
  const existing = await User.findOne({ where: { email }, attributes: ['id'] });
  if (existing && (await Membership.count({ where: { workspaceId: auth.workspaceId, userId: existing.id } })) > 0) {
    throw new HttpError(409, 'conflict', 'This person is already a member', [{ path: 'body.email', message: 'Already a member of this workspace' }]);
  }
  if (input.personId) {
    const person = await Person.findOne({ where: { id: input.personId, workspaceId: auth.workspaceId }, attributes: ['id', 'userId'] });
    if (!person) throw new HttpError(404, 'not_found', 'Person not found', [{ path: 'body.personId', message: 'No such person in this workspace' }]);
    if (person.userId) throw new HttpError(409, 'conflict', 'This person already has a login', [{ path: 'body.personId', message: 'Already linked to a member' }]);
  }
  const workspace = await Workspace.findByPk(auth.workspaceId);
  if (!workspace) throw notFound('Workspace');
  const { token, hash } = newToken();
  const invitation = await transactionWithRetry(Invitation.sequelize!, async (transaction) => {
    await requireInvitationAllowance(auth.workspaceId, transaction);
    // A new invitation to the same address replaces the earlier one, whose link stops working.
    await Invitation.update({ revokedAt: new Date() }, { where: { workspaceId: auth.workspaceId, email, acceptedAt: null, revokedAt: null }, transaction });
    return Invitation.create(
      { workspaceId: auth.workspaceId, email, role: input.role, personId: input.personId ?? null, invitedBy: auth.userId, tokenHash: hash, expiresAt: new Date(Date.now() + INVITATION_VALID_MS) },
      { transaction },
    );
  });
  return { invitation: invitationView(invitation), token, workspaceName: workspace.name };
}

/**
 * Invitations one workspace may send in 24 hours, by plan. Each is an e-mail from us to any
 * address, carrying names the sender chose, so a new workspace must not become a mail cannon.
 */
export const INVITATIONS_PER_DAY: Record<PlanId, number> = { free: 20, team: 200 };
const DAY_MS = 24 * 60 * 60 * 1000;

/** 429 with Retry-After once the day's invitations are used; the workspace row is locked so simultaneous sends count one by one. */
async function requireInvitationAllowance(workspaceId: number, transaction: Transaction): Promise<void> {
  await Workspace.findByPk(workspaceId, { attributes: ['id'], lock: transaction.LOCK.UPDATE, transaction });
  const limit = INVITATIONS_PER_DAY[(await standingOf(workspaceId, transaction)).plan];
  const recent = await Invitation.findAll({
    where: { workspaceId, createdAt: { [Op.gte]: new Date(Date.now() - DAY_MS) } },
    attributes: ['createdAt'],
    order: [['createdAt', 'DESC']],
    limit,
    transaction,
  });
  if (recent.length < limit) return;
  const retryAfter = Math.max(1, Math.ceil((recent[recent.length - 1].createdAt.getTime() + DAY_MS - Date.now()) / 1000));
  const hours = Math.ceil(retryAfter / 3600);
  throw new HttpError(429, 'rate_limited', `This workspace has sent ${limit} invitations in the last 24 hours, the most its plan allows; more can go out in about ${hours} hour${hours === 1 ? '' : 's'}.`, [{ path: 'body.email', message: `at most ${limit} invitations a day` }], { 'Retry-After': String(retryAfter) });
}

export async function revokeInvitation(workspaceId: number, id: number): Promise<void> {
  const [changed] = await Invitation.update({ revokedAt: new Date() }, { where: { id, workspaceId, acceptedAt: null, revokedAt: null } });
  if (changed !== 1) throw notFound('Invitation');
}

const invitationError = (status: number, code: 'validation_failed' | 'gone', message: string, path: string) => new HttpError(status, code, message, [{ path, message }]);

/** A usable invitation for this token, or a 4xx naming the token field. */
export async function findUsableInvitation(token: string, path: string): Promise<Invitation> {
  const invitation = await Invitation.findOne({ where: { tokenHash: hashToken(token) } });
  if (!invitation) throw invitationError(400, 'validation_failed', 'This invitation link is not valid', path);
  const status = statusOf(invitation);
  if (status === 'accepted') throw invitationError(410, 'gone', 'This invitation was already used', path);
  if (status === 'revoked') throw invitationError(410, 'gone', 'This invitation was withdrawn or replaced by a newer one', path);
  if (status === 'expired') throw invitationError(410, 'gone', 'This invitation has expired; ask for a new one', path);
  return invitation;
}

export async function previewInvitation(token: string) {
  const invitation = await findUsableInvitation(token, 'query.token');
  const [workspace, inviter, account] = await Promise.all([
    Workspace.findByPk(invitation.workspaceId),
    invitation.invitedBy ? User.findByPk(invitation.invitedBy) : null,
    User.findOne({ where: { email: invitation.email }, attributes: ['id'] }),
  ]);
  return {
    email: invitation.email,
    role: invitation.role,
    workspace: { name: workspace?.name ?? '' },
    invitedBy: inviter?.displayName ?? null,
    expiresAt: invitation.expiresAt.toISOString(),
    // Lets the screen offer "sign in" or "make an account"; only someone holding the link learns it.
    accountExists: Boolean(account),
  };
}

/**
 * Joins `userId` to the invitation's workspace, once: the conditional update means a link used
 * twice (or twice at the same moment) joins only one account. A matching person record (the
 * one named in the invitation, else an unlinked one with the same e-mail) is linked.
 */
export async function joinByInvitation(invitation: Invitation, who: number | ((transaction: Transaction) => Promise<number>)): Promise<number> {
  return Invitation.sequelize!.transaction(async (transaction) => {
    // A new account is made inside the same transaction, so a refused join leaves no account behind.
    const userId = typeof who === 'number' ? who : await who(transaction);
    const [changed] = await Invitation.update(
      { acceptedAt: new Date(), acceptedBy: userId },
      { where: { id: invitation.id, acceptedAt: null, revokedAt: null }, transaction },
    );
    if (changed !== 1) throw invitationError(410, 'gone', 'This invitation was already used', 'body.token');
    const existing = await Membership.findOne({ where: { workspaceId: invitation.workspaceId, userId }, transaction });
    if (!existing) await Membership.create({ workspaceId: invitation.workspaceId, userId, role: invitation.role }, { transaction });
    const alreadyLinked = await Person.count({ where: { workspaceId: invitation.workspaceId, userId }, transaction });
    if (alreadyLinked) return userId;
    const person =
      (invitation.personId ? await Person.findOne({ where: { id: invitation.personId, workspaceId: invitation.workspaceId, userId: null }, transaction }) : null) ??
      (await Person.findOne({ where: { workspaceId: invitation.workspaceId, email: invitation.email, userId: null }, transaction }));
    if (person) await person.update({ userId }, { transaction });
    return userId;
  });
}

/** Whether an account already uses this (normalised) address: its owner must sign in to accept. */
export async function accountExists(email: string): Promise<boolean> {
  return (await User.findOne({ where: { email }, attributes: ['id'] })) !== null;
}

/**
 * A new account made by accepting an invitation, inside the join's transaction (joinByInvitation);
 * the invitee proved the address by opening the e-mailed link.
 */
export async function joinAsNewAccount(invitation: Invitation, account: { displayName: string; passwordHash: string }): Promise<number> {
  return joinByInvitation(invitation, async (transaction) => (await User.create({ email: invitation.email, displayName: account.displayName, passwordHash: account.passwordHash, emailVerified: true }, { transaction })).id);
}

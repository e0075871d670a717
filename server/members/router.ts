import type { Router } from 'express';
import type { Env } from '../env';
import { ADMIN_ONLY, ApiRoutes } from '../http/routes';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import type { Mailer } from '../mail/mailer';
import { invitationMail } from '../mail/templates';
import { acceptInvitationSchema, idParamsSchema, invitationTokenQuerySchema, inviteSchema, linkPersonSchema, updateMemberSchema } from '../../shared/auth/schemas';
import { hashPassword } from '../auth/passwords';
import { requireStrongPassword } from '../auth/strength';
import { normalizeEmail } from '../auth/service';
import { currentSession, logIn, sendLater } from '../auth/router';
import {
  INVITATION_VALID_MS,
  accountExists,
  changeRole,
  createInvitation,
  findUsableInvitation,
  joinByInvitation,
  joinAsNewAccount,
  linkPerson,
  listInvitations,
  listMembers,
  previewInvitation,
  removeMember,
  revokeInvitation,
} from './service';

/** `/api/members` (admins): who is in the workspace, their roles and linked person records. */
export function membersRouter(): Router {
  const routes = new ApiRoutes('/members');

  routes.get('/', ADMIN_ONLY, async (req, res) => {
    res.json({ members: await listMembers(req.auth!.workspaceId) });
  });

  routes.patch('/:id', ADMIN_ONLY, validate({ params: idParamsSchema, body: updateMemberSchema }), async (req, res) => {
    await changeRole(req.auth!, Number(req.params.id), req.body.role);
    res.json({ members: await listMembers(req.auth!.workspaceId) });
  });

  routes.delete('/:id', ADMIN_ONLY, validate({ params: idParamsSchema }), async (req, res) => {
    await removeMember(req.auth!, Number(req.params.id));
    res.status(204).end();
  });

  routes.put('/:id/person', ADMIN_ONLY, validate({ params: idParamsSchema, body: linkPersonSchema }), async (req, res) => {
    await linkPerson(req.auth!, Number(req.params.id), req.body.personId);
    res.json({ members: await listMembers(req.auth!.workspaceId) });
  });

  return routes.router;
}

/** `/api/invitations`: admins invite by e-mail; the e-mailed link (public routes) joins the invitee. */
export function invitationsRouter({ env, mailer }: { env: Env; mailer: Mailer }): Router {
  const routes = new ApiRoutes('/invitations');

  routes.get('/', ADMIN_ONLY, async (req, res) => {
    res.json({ invitations: await listInvitations(req.auth!.workspaceId) });
  });

  routes.post('/', ADMIN_ONLY, validate({ body: inviteSchema }), async (req, res) => {
    const { invitation, token, workspaceName } = await createInvitation(req.auth!, req.body);
    const mail = invitationMail({
      to: invitation.email,
      inviterName: req.user!.displayName,
      workspaceName,
      role: invitation.role,
      url: `${env.publicUrl}/invitation?token=${token}`,
      validForMs: INVITATION_VALID_MS,
    });
    // The admin should know at once if the mail could not go out, so this one is awaited.
    let mailSent = true;
    try {
      await mailer.send(mail);
    } catch (err) {
      mailSent = false;
      console.error(`Could not send the invitation e-mail: ${err instanceof Error ? err.message : String(err)}`);
    }
    res.status(201).json({ invitation, mailSent });
  });

  routes.delete('/:id', ADMIN_ONLY, validate({ params: idParamsSchema }), async (req, res) => {
    await revokeInvitation(req.auth!.workspaceId, Number(req.params.id));
    res.status(204).end();
  });

  routes.get('/preview', 'public', validate({ query: invitationTokenQuerySchema }), async (req, res) => {
    res.json(await previewInvitation((req.query as unknown as { token: string }).token));
  });

  routes.post('/accept', 'public', validate({ body: acceptInvitationSchema }), async (req, res) => {
    const { token, displayName, password } = req.body as { token: string; displayName?: string; password?: string };
    const invitation = await findUsableInvitation(token, 'body.token');
    if (req.user) {
      // The link was sent to one address; joining another account with it would let a forwarded mail add anyone.
      if (normalizeEmail(req.user.email) !== invitation.email) {
        throw new HttpError(409, 'conflict', `This invitation is for ${invitation.email}; sign out, then open the link again`, [{ path: 'body.token', message: `For ${invitation.email}` }]);
      }
      await joinByInvitation(invitation, req.user.id);
      req.session.workspaceId = invitation.workspaceId;
      await logIn(req, req.user, invitation.workspaceId);
      res.json(await currentSession(req));
      return;
    }
    if (await accountExists(invitation.email)) {
      throw new HttpError(401, 'unauthenticated', `Sign in as ${invitation.email} to accept this invitation`, [{ path: 'body.password', message: 'Sign in first' }]);
    }
    const missing = [
      ...(displayName ? [] : [{ path: 'body.displayName', message: 'Enter your name' }]),
      ...(password ? [] : [{ path: 'body.password', message: 'Choose a password' }]),
    ];
    if (missing.length) throw new HttpError(400, 'validation_failed', 'Please enter your name and choose a password', missing);
    await requireStrongPassword(password!, 'body.password', [invitation.email, displayName]);
    const passwordHash = await hashPassword(password!);
    let userId: number;
    try {
      userId = await joinAsNewAccount(invitation, { displayName: displayName!, passwordHash });
    } catch (err) {
      if ((err as { name?: string }).name === 'SequelizeUniqueConstraintError') {
        throw new HttpError(409, 'conflict', `An account for ${invitation.email} was just made; sign in to accept`, [{ path: 'body.token', message: 'Sign in first' }]);
      }
      throw err;
    }
    await logIn(req, { id: userId, email: invitation.email, displayName: displayName! }, invitation.workspaceId);
    res.status(201).json(await currentSession(req));
  });

  return routes.router;
}

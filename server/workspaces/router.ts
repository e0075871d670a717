import type { Request, Router } from 'express';
import { ADMIN_ONLY, ApiRoutes } from '../http/routes';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import { createWorkspaceSchema, renameWorkspaceSchema, switchWorkspaceSchema } from '../../shared/auth/schemas';
import { listUserWorkspaces, resolveMembership } from '../auth/service';
import { createWorkspace, isMember, renameWorkspace } from './service';
import { currentSession } from '../auth/router';

/** `/api/workspaces`: the user's workspaces, making a new one, switching, and renaming the current one. */
export function workspacesRouter(): Router {
  const routes = new ApiRoutes('/workspaces');

  routes.get('/', 'signed-in', async (req, res) => {
    const workspaces = await listUserWorkspaces(req.user!.id);
    res.json({ workspaces, currentId: req.auth?.workspaceId ?? null });
  });

  routes.post('/', 'signed-in', validate({ body: createWorkspaceSchema }), async (req, res) => {
    const workspace = await createWorkspace(req.user!.id, req.body.name, req.body.timeZone);
    await switchTo(req, workspace.id);
    res.status(201).json(await currentSession(req));
  });

  // Switching: the session only ever names a workspace the user is a member of; any other id is "not found".
  routes.put('/current', 'signed-in', validate({ body: switchWorkspaceSchema }), async (req, res) => {
    await switchTo(req, req.body.workspaceId);
    res.json(await currentSession(req));
  });

  routes.patch('/current', ADMIN_ONLY, validate({ body: renameWorkspaceSchema }), async (req, res) => {
    await renameWorkspace(req.auth!.workspaceId, req.body.name);
    res.json(await currentSession(req));
  });

  return routes.router;
}

async function switchTo(req: Request, workspaceId: number): Promise<void> {
  if (!(await isMember(req.user!.id, workspaceId))) throw new HttpError(404, 'not_found', 'Workspace not found', [{ path: 'body.workspaceId', message: 'You are not a member of this workspace' }]);
  const membership = await resolveMembership(req.user!.id, workspaceId);
  req.session.workspaceId = workspaceId;
  if (membership) req.auth = { userId: req.user!.id, ...membership };
}

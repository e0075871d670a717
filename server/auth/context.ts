import type { Role } from '../db/models';

/** Who is asking, resolved once per request from the session (see server/auth). */
export interface AuthContext {
  userId: number;
  /** The workspace the user is working in; every query is scoped by this, never by client input. */
  workspaceId: number;
  role: Role;
  /** The person record linked to this user in this workspace, if any (staff see their own shifts through it). */
  personId: number | null;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      auth?: AuthContext;
    }
  }
}

export type { Role };

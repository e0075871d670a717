import bcrypt from 'bcryptjs';
import request from 'supertest';
import type { Express } from 'express';
import { createApp } from '../../../server/app';
import { Membership, Person, User, Workspace, type Role } from '../../../server/db/models';
import type { Mailer, OutgoingMail } from '../../../server/mail/mailer';
import type { TestDb } from '../helpers/test-db';
import { grantTeamPlan } from '../../../server/billing/service';

export const PASSWORD = 'correct horse battery';
// One hash for every fixture user: bcrypt is slow on purpose, fixtures need not be.
const passwordHash = bcrypt.hashSync(PASSWORD, 10);

/** An in-memory mailer the test can read. */
export function memoryMailer(): Mailer & { last(to?: string): OutgoingMail | undefined } {
  const outbox: OutgoingMail[] = [];
  return {
    outbox,
    async send(mail) {
      outbox.push(mail);
    },
    last(to?: string) {
      return [...outbox].reverse().find((m) => !to || m.to === to);
    },
  };
}

export function makeApp(db: TestDb, overrides: Partial<Parameters<typeof createApp>[0]> = {}) {
  const mailer = memoryMailer();
  const app = createApp({ env: db.env, sequelize: db.sequelize, mailer, ...overrides });
  return { app, mailer };
}

/** A supertest agent keeping cookies, sending the CSRF header on every request as our client does. */
export function agent(app: Express | import('node:http').Server) {
  return request.agent(app).set('X-Rotaloom-CSRF', '1');
}

let counter = 0;
export const uniqueEmail = (prefix = 'user') => `${prefix}.${Date.now().toString(36)}.${++counter}@example.test`;

/** Fixture workspaces are on the team plan (no plan limits) unless a test asks for the free one; tests/server/billing checks the limits. */
export async function makeWorkspace(name = `Workspace ${++counter}`, options: { plan?: 'free' | 'team' } = {}) {
  const workspace = await Workspace.create({ name, timeZone: 'Europe/London' });
  if ((options.plan ?? 'team') === 'team') await grantTeamPlan(workspace.id, 0);
  return workspace;
}

export async function makeUser(overrides: { email?: string; displayName?: string; workspace?: Workspace; role?: Role; emailVerified?: boolean; passwordHash?: string | null } = {}) {
  const user = await User.create({
    email: overrides.email ?? uniqueEmail(),
    displayName: overrides.displayName ?? 'Fixture Person',
    passwordHash: overrides.passwordHash === undefined ? passwordHash : overrides.passwordHash,
    emailVerified: overrides.emailVerified ?? true,
  });
  if (overrides.workspace) await Membership.create({ workspaceId: overrides.workspace.id, userId: user.id, role: overrides.role ?? 'staff' });
  return user;
}

export async function makePerson(workspace: Workspace, overrides: { name?: string; email?: string | null; userId?: number | null } = {}) {
  return Person.create({ workspaceId: workspace.id, name: overrides.name ?? 'Fixture Person', email: overrides.email ?? null, userId: overrides.userId ?? null, contractedHours: 30, skills: [] });
}

/**
 * A signed-in agent for a new user with this role in the workspace; with `personId`, the user is
 * that person's account (as "my shifts", "my ledger" and the calendar feed need).
 */
export async function signedIn(app: Express, workspace: Workspace, role: Role, options: { personId?: number } = {}) {
  const user = await makeUser({ workspace, role });
  if (options.personId !== undefined) await Person.update({ userId: user.id }, { where: { id: options.personId } });
  const a = agent(app);
  const res = await a.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
  if (res.status !== 200) throw new Error(`fixture sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent: a, user };
}

/** The link in the last mail to this address that contains `path`. */
export function linkIn(mail: OutgoingMail | undefined, path: string): URL {
  const found = mail?.text.match(/https?:\/\/\S+/g)?.find((l) => l.includes(path));
  if (!found) throw new Error(`no ${path} link in ${mail ? `"${mail.subject}"` : 'any mail'}`);
  return new URL(found);
}

/** The newest mail to this address with a link containing `path`, waiting for it: mail goes out after the answer. */
export async function waitForMail(mailer: Mailer, to: string, path: string, since = 0): Promise<OutgoingMail> {
  for (let i = 0; i < 100; i++) {
    const found = mailer.outbox.slice(since).reverse().find((m) => m.to === to && m.text.includes(path));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 20));
  }
  throw new Error(`no mail to ${to} with ${path}`);
}

export interface SignUpFields {
  displayName: string;
  email: string;
  password: string;
  workspaceName: string;
  timeZone?: string;
}

/**
 * Signs up as a person does: asks, opens the link from the mail, finishes. One agent does all
 * three, as one browser would, so the finish needs no password; the agent ends signed in.
 */
export async function signUpThroughMail(app: Express, mailer: Mailer, fields: SignUpFields, a = agent(app)) {
  const since = mailer.outbox.length;
  const asked = await a.post('/api/auth/sign-up').send(fields);
  if (asked.status !== 202) throw new Error(`fixture sign-up failed: ${asked.status} ${JSON.stringify(asked.body)}`);
  const mail = await waitForMail(mailer, fields.email.trim().toLowerCase(), '/finish-sign-up', since);
  const token = linkIn(mail, '/finish-sign-up').searchParams.get('token')!;
  const finished = await a.post('/api/auth/sign-up/finish').send({ token });
  if (finished.status !== 201) throw new Error(`fixture sign-up finish failed: ${finished.status} ${JSON.stringify(finished.body)}`);
  return { agent: a, session: finished.body, token, mail };
}

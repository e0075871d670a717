import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { PASSWORD, agent, linkIn, makeApp, makePerson, makeUser, makeWorkspace, signedIn } from '../auth/helpers';
import { Invitation } from '../../../server/auth/models';
import { Membership, Person } from '../../../server/db/models';

describe('members, roles, invitations and workspaces', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  let mailer: ReturnType<typeof makeApp>['mailer'];
  beforeAll(async () => {
    db = await createTestDb();
    ({ app, mailer } = makeApp(db));
  });
  afterAll(async () => {
    await db.drop();
  });

  const tokenFor = (email: string) => linkIn(mailer.last(email), '/invitation').searchParams.get('token')!;

  it('an admin invites a coordinator; the mail names the workspace; the link signs the invitee up and joins them', async () => {
    const workspace = await makeWorkspace('Saltmarsh Kitchens');
    const { agent: admin, user: adminUser } = await signedIn(app, workspace, 'admin');
    await adminUser.update({ displayName: 'Greer Halloran' });
    const invited = await admin.post('/api/invitations').send({ email: 'New.Coordinator@example.test', role: 'coordinator' });
    expect(invited.status).toBe(201);
    expect(invited.body).toMatchObject({ invitation: { email: 'new.coordinator@example.test', role: 'coordinator', status: 'pending' }, mailSent: true });
    const mail = mailer.last('new.coordinator@example.test')!;
    expect(mail.subject).toBe('Greer Halloran invited you to Saltmarsh Kitchens on Rotaloom');
    expect(mail.html).toContain('Saltmarsh Kitchens');
    expect(mail.text).toContain('coordinator');
    expect((await admin.get('/api/invitations')).body.invitations).toHaveLength(1);

    const token = tokenFor('new.coordinator@example.test');
    const preview = await agent(app).get(`/api/invitations/preview?token=${token}`);
    expect(preview.body).toMatchObject({ email: 'new.coordinator@example.test', role: 'coordinator', workspace: { name: 'Saltmarsh Kitchens' }, invitedBy: 'Greer Halloran', accountExists: false });

    const invitee = agent(app);
    const missing = await invitee.post('/api/invitations/accept').send({ token });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields.map((f: { path: string }) => f.path)).toEqual(['body.displayName', 'body.password']);
    const accepted = await invitee.post('/api/invitations/accept').send({ token, displayName: 'Corin Vale', password: 'coordinator passphrase' });
    expect(accepted.status).toBe(201);
    expect(accepted.body).toMatchObject({ user: { email: 'new.coordinator@example.test', emailVerified: true }, role: 'coordinator', workspace: { id: workspace.id } });
    expect((await invitee.get('/api/members')).status).toBe(403);

    // The link is single-use.
    const again = await agent(app).post('/api/invitations/accept').send({ token, displayName: 'Someone', password: 'another passphrase' });
    expect(again.status).toBe(410);
    expect(again.body.error.fields[0].path).toBe('body.token');
    expect((await agent(app).get(`/api/invitations/preview?token=${token}`)).status).toBe(410);
    expect((await admin.get('/api/members')).body.members.map((m: { role: string }) => m.role).sort()).toEqual(['admin', 'coordinator']);
  });

  it('an existing account must sign in (as the invited address) to accept, and then joins a second workspace', async () => {
    const home = await makeWorkspace('Home Ward');
    const other = await makeWorkspace('Second Site');
    const person = await makePerson(other, { name: 'Bram Kettle' });
    const existing = await makeUser({ workspace: home, role: 'admin' });
    const { agent: admin } = await signedIn(app, other, 'admin');
    await admin.post('/api/invitations').send({ email: existing.email, role: 'staff', personId: person.id });
    const token = tokenFor(existing.email);
    expect((await agent(app).get(`/api/invitations/preview?token=${token}`)).body.accountExists).toBe(true);
    expect((await agent(app).post('/api/invitations/accept').send({ token, displayName: 'X', password: 'some long passphrase' })).status).toBe(401);

    const stranger = await signedIn(app, home, 'staff');
    expect((await stranger.agent.post('/api/invitations/accept').send({ token })).status).toBe(409);

    const a = agent(app);
    await a.post('/api/auth/sign-in').send({ email: existing.email, password: PASSWORD });
    const accepted = await a.post('/api/invitations/accept').send({ token });
    expect(accepted.status).toBe(200);
    expect(accepted.body).toMatchObject({ workspace: { id: other.id }, role: 'staff', personId: person.id });
    expect(accepted.body.workspaces.map((w: { name: string }) => w.name).sort()).toEqual(['Home Ward', 'Second Site']);

    // Switching between the two, and not into someone else's.
    const back = await a.put('/api/workspaces/current').send({ workspaceId: home.id });
    expect(back.body).toMatchObject({ workspace: { id: home.id }, role: 'admin' });
    const foreign = await makeWorkspace('Not Mine');
    const refused = await a.put('/api/workspaces/current').send({ workspaceId: foreign.id });
    expect(refused.status).toBe(404);
    expect(refused.body.error.fields[0].path).toBe('body.workspaceId');
    expect((await a.get('/api/auth/session')).body.workspace.id).toBe(home.id);
  });

  it('expired and revoked invitations are refused naming the token; a new invitation replaces the old', async () => {
    const workspace = await makeWorkspace();
    const { agent: admin } = await signedIn(app, workspace, 'admin');
    await admin.post('/api/invitations').send({ email: 'late@example.test', role: 'staff' });
    const first = tokenFor('late@example.test');
    await Invitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { email: 'late@example.test' } });
    const expired = await agent(app).post('/api/invitations/accept').send({ token: first, displayName: 'Late', password: 'late passphrase!' });
    expect(expired.status).toBe(410);
    expect(expired.body.error.message).toMatch(/expired/);
    expect((await admin.get('/api/invitations')).body.invitations[0].status).toBe('expired');

    await admin.post('/api/invitations').send({ email: 'late@example.test', role: 'staff' });
    const second = tokenFor('late@example.test');
    const list = (await admin.get('/api/invitations')).body.invitations;
    expect(list).toHaveLength(1);
    expect((await admin.delete(`/api/invitations/${list[0].id}`)).status).toBe(204);
    const revoked = await agent(app).post('/api/invitations/accept').send({ token: second, displayName: 'Late', password: 'late passphrase!' });
    expect(revoked.status).toBe(410);
    expect(revoked.body.error.message).toMatch(/withdrawn/);
    const bogus = await agent(app).get('/api/invitations/preview?token=short');
    expect(bogus.status).toBe(400);
    expect(bogus.body.error.fields[0].path).toBe('query.token');
  });

  it('refuses inviting an existing member, a person of another workspace, and a bad role', async () => {
    const workspace = await makeWorkspace();
    const { agent: admin, user } = await signedIn(app, workspace, 'admin');
    expect((await admin.post('/api/invitations').send({ email: user.email, role: 'staff' })).status).toBe(409);
    const elsewhere = await makePerson(await makeWorkspace());
    const foreign = await admin.post('/api/invitations').send({ email: 'x@example.test', role: 'staff', personId: elsewhere.id });
    expect(foreign.status).toBe(404);
    expect(foreign.body.error.fields[0].path).toBe('body.personId');
    const badRole = await admin.post('/api/invitations').send({ email: 'x@example.test', role: 'owner' });
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.fields[0].path).toBe('body.role');
    const long = await admin.post('/api/invitations').send({ email: `${'a'.repeat(250)}@example.test`, role: 'staff' });
    expect(long.status).toBe(400);
    expect(long.body.error.fields[0]).toEqual({ path: 'body.email', message: 'At most 254 characters' });
    const notJson = await admin.post('/api/invitations').set('content-type', 'application/json').send('{"email":');
    expect(notJson.status).toBe(400);
    expect(notJson.body.error.fields[0].path).toBe('body');
  });

  it('admins change roles and remove members, but never the last admin', async () => {
    const workspace = await makeWorkspace();
    const { agent: admin, user: adminUser } = await signedIn(app, workspace, 'admin');
    const staff = await makeUser({ workspace, role: 'staff' });
    const person = await makePerson(workspace, { userId: staff.id });

    const last = await admin.patch(`/api/members/${adminUser.id}`).send({ role: 'coordinator' });
    expect(last.status).toBe(409);
    expect(last.body.error.message).toMatch(/at least one admin/);
    expect((await admin.delete(`/api/members/${adminUser.id}`)).status).toBe(409);

    const promoted = await admin.patch(`/api/members/${staff.id}`).send({ role: 'admin' });
    expect(promoted.status).toBe(200);
    // Now there are two admins, so the first may step down.
    expect((await admin.patch(`/api/members/${adminUser.id}`).send({ role: 'coordinator' })).status).toBe(200);
    expect((await admin.get('/api/members')).status).toBe(403);

    const other = agent(app);
    await other.post('/api/auth/sign-in').send({ email: staff.email, password: PASSWORD });
    expect((await other.delete(`/api/members/${staff.id}`)).status).toBe(409);
    expect((await other.delete(`/api/members/${adminUser.id}`)).status).toBe(204);
    expect(await Membership.count({ where: { workspaceId: workspace.id, userId: adminUser.id } })).toBe(0);
    // The removed member loses access at once: their session in this workspace is ended (issue 13 item 5).
    const after = await admin.get('/api/auth/session');
    expect(after.body.user).toBeNull();
    expect((await person.reload()).userId).toBe(staff.id);
  });

  it('links a member to a person of the same workspace only, one person per member', async () => {
    const workspace = await makeWorkspace();
    const { agent: admin } = await signedIn(app, workspace, 'admin');
    const staff = await makeUser({ workspace, role: 'staff' });
    const p1 = await makePerson(workspace, { name: 'First' });
    const p2 = await makePerson(workspace, { name: 'Second' });
    expect((await admin.put(`/api/members/${staff.id}/person`).send({ personId: p1.id })).status).toBe(200);
    const res = await admin.put(`/api/members/${staff.id}/person`).send({ personId: p2.id });
    expect(res.body.members.find((m: { userId: number }) => m.userId === staff.id)).toMatchObject({ personId: p2.id, personName: 'Second' });
    expect((await Person.findByPk(p1.id))!.userId).toBeNull();
    const foreign = await makePerson(await makeWorkspace());
    expect((await admin.put(`/api/members/${staff.id}/person`).send({ personId: foreign.id })).status).toBe(404);
    expect((await admin.put(`/api/members/${staff.id}/person`).send({ personId: 'abc' })).body.error.fields[0].path).toBe('body.personId');
    const s = agent(app);
    await s.post('/api/auth/sign-in').send({ email: staff.email, password: PASSWORD });
    expect((await s.get('/api/auth/session')).body.personId).toBe(p2.id);
  });

  it('a signed-in user can make another workspace, becoming its admin; admins rename the current one', async () => {
    const { agent: a } = await signedIn(app, await makeWorkspace('First'), 'staff');
    const made = await a.post('/api/workspaces').send({ name: 'Side Project', timeZone: 'Not/AZone' });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({ workspace: { name: 'Side Project', timeZone: 'UTC' }, role: 'admin' });
    const renamed = await a.patch('/api/workspaces/current').send({ name: 'Side Project II' });
    expect(renamed.body.workspace.name).toBe('Side Project II');
    const list = await a.get('/api/workspaces');
    expect(list.body.workspaces.map((w: { name: string; role: string }) => `${w.name}:${w.role}`)).toEqual(['First:staff', 'Side Project II:admin']);
    await a.put('/api/workspaces/current').send({ workspaceId: list.body.workspaces[0].id });
    expect((await a.patch('/api/workspaces/current').send({ name: 'Nope' })).status).toBe(403);
  });
});

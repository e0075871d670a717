import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { Roster } from '../../../server/rosters/models';
import { BillingAccount } from '../../../server/billing/models';
import { PLANS } from '../../../shared/billing/plans';

const person = (i: number) => ({ name: `Limit Person ${i}`, contractedHours: 20, skillIds: [] });
const roster = (name: string) => ({ name, periodStart: '2027-05-03', periodEnd: '2027-05-09', timeZone: 'Europe/London' });

describe('plan limits, enforced by the API', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('the free plan takes 12 people; the 13th is refused with 402 naming the limit and the way to upgrade', async () => {
    expect(PLANS.free.limits.people).toBe(12); // the issue's figure, from the one plans file
    const ws = await makeWorkspace('Small Clinic', { plan: 'free' });
    const { agent: coordinator } = await signedIn(app, ws, 'coordinator');
    const { agent: admin } = await signedIn(app, ws, 'admin');
    for (let i = 1; i <= 12; i++) expect((await coordinator.post('/api/people').send(person(i))).status).toBe(201);
    const refused = await coordinator.post('/api/people').send(person(13));
    expect(refused.status).toBe(402);
    expect(refused.body.error).toMatchObject({ code: 'plan_limit', limit: { name: 'people', max: 12, current: 12, plan: 'free' }, upgrade: { plan: 'team', path: '/billing' } });
    expect(refused.body.error.fields).toEqual([{ path: 'plan.people', message: 'limit of 12 reached' }]);
    expect(refused.body.error.message).toMatch(/allows 12 people.*An admin/);
    // The admin is told where to do it themselves.
    const asAdmin = await admin.post('/api/people').send(person(13));
    expect(asAdmin.status).toBe(402);
    expect(asAdmin.body.error.message).toMatch(/Plan & billing/);
    // Nothing was created, and bad input is still a 400 about the field, not a limit error.
    expect((await coordinator.get('/api/people')).body.total).toBe(12);
    expect((await coordinator.post('/api/people').send({ name: '' })).status).toBe(400);
    // Removing one makes room again.
    const list = await coordinator.get('/api/people');
    expect((await coordinator.delete(`/api/people/${list.body.items[0].id}`)).status).toBe(204);
    expect((await coordinator.post('/api/people').send(person(14))).status).toBe(201);
  });

  it('creates sent at the same moment cannot carry a free workspace past its limit', async () => {
    const ws = await makeWorkspace('Busy Clinic', { plan: 'free' });
    const { agent: coordinator } = await signedIn(app, ws, 'coordinator');
    for (let i = 1; i <= 10; i++) expect((await coordinator.post('/api/people').send(person(i))).status).toBe(201);
    // 10 of 12: eight creates at once, so exactly two may land and six must be refused (without
    // the lock, several read "10" before any insert and all of those passed: seen 3 and more).
    const answers = await Promise.all([11, 12, 13, 14, 15, 16, 17, 18].map((i) => coordinator.post('/api/people').send(person(i))));
    expect(answers.map((a) => a.status).sort()).toEqual([201, 201, 402, 402, 402, 402, 402, 402]);
    expect((await coordinator.get('/api/people')).body.total).toBe(12);
  });

  it('a CSV import cannot carry a free workspace past 12 people either', async () => {
    const ws = await makeWorkspace('Import Hall', { plan: 'free' });
    const { agent: coordinator } = await signedIn(app, ws, 'coordinator');
    for (let i = 1; i <= 10; i++) expect((await coordinator.post('/api/people').send(person(i))).status).toBe(201);
    const csv = (names: string[]) => Buffer.from(`name,email,contracted_hours,skills\n${names.map((n) => `${n},,30,`).join('\n')}\n`, 'utf8');
    const tooMany = await coordinator.post('/api/people/import/commit').attach('file', csv(['Ada Quill', 'Bram Fell', 'Cora Vane']), { filename: 'people.csv', contentType: 'text/csv' });
    expect(tooMany.status).toBe(402);
    expect(tooMany.body.error.limit).toMatchObject({ name: 'people', max: 12, current: 10, adding: 3 });
    expect((await coordinator.get('/api/people')).body.total).toBe(10);
    const fits = await coordinator.post('/api/people/import/commit').attach('file', csv(['Ada Quill', 'Bram Fell']), { filename: 'people.csv', contentType: 'text/csv' });
    expect(fits.status).toBe(201);
    expect((await coordinator.get('/api/people')).body.total).toBe(12);
  });

  it('the free plan has one roster in progress; a second is refused until the first is published', async () => {
    const ws = await makeWorkspace('One Roster Kitchen', { plan: 'free' });
    const { agent: coordinator } = await signedIn(app, ws, 'coordinator');
    const first = await coordinator.post('/api/rosters').send(roster('May'));
    expect(first.status).toBe(201);
    const second = await coordinator.post('/api/rosters').send(roster('June'));
    expect(second.status).toBe(402);
    expect(second.body.error).toMatchObject({ code: 'plan_limit', limit: { name: 'activeRosters', max: 1, current: 1 } });
    expect(await Roster.count({ where: { workspaceId: ws.id } })).toBe(1);
    // Published rosters do not count (as if the publish route had run).
    await Roster.update({ status: 'published' }, { where: { id: first.body.id } });
    expect((await coordinator.post('/api/rosters').send(roster('June'))).status).toBe(201);
    // Reopening the published one would make two in progress: refused the same way.
    const published = await Roster.findByPk(first.body.id);
    const reopen = await coordinator.post(`/api/rosters/${first.body.id}/reopen`).send({ version: published!.version });
    expect(reopen.status).toBe(402);
    expect(reopen.body.error.limit).toMatchObject({ name: 'activeRosters', max: 1, current: 1 });
    expect((await Roster.findByPk(first.body.id))?.status).toBe('published');
  });

  it('the team plan has no such limits; a cancelled subscription brings them back', async () => {
    const ws = await makeWorkspace('Growing Lab', { plan: 'free' });
    await BillingAccount.create({ workspaceId: ws.id, status: 'trialing', quantity: 13, subscriptionId: `sub_t${ws.id}`, subscriptionItemId: `si_t${ws.id}` });
    const { agent: coordinator } = await signedIn(app, ws, 'coordinator');
    for (let i = 1; i <= 13; i++) expect((await coordinator.post('/api/people').send(person(i))).status).toBe(201);
    expect((await coordinator.post('/api/rosters').send(roster('A'))).status).toBe(201);
    expect((await coordinator.post('/api/rosters').send(roster('B'))).status).toBe(201);
    await BillingAccount.update({ status: 'canceled' }, { where: { workspaceId: ws.id } });
    // Data stays (13 people, 2 rosters readable), but nothing more can be added.
    expect((await coordinator.get('/api/rosters')).status).toBe(200);
    expect((await coordinator.post('/api/people').send(person(14))).status).toBe(402);
    expect((await coordinator.post('/api/rosters').send(roster('C'))).status).toBe(402);
  });

  it('past due: rosters stay readable, new runs are refused with 402, and they start again once paid', async () => {
    const ws = await makeWorkspace('Overdue Home', { plan: 'free' });
    await BillingAccount.create({ workspaceId: ws.id, status: 'active', quantity: 4, subscriptionId: `sub_p${ws.id}`, subscriptionItemId: `si_p${ws.id}` });
    const { agent: coordinator } = await signedIn(app, ws, 'coordinator');
    const { roster: r } = await makeApiRoster(coordinator, ws, { people: 4 });
    await BillingAccount.update({ status: 'past_due' }, { where: { workspaceId: ws.id } });
    expect((await coordinator.get(`/api/rosters/${r.id}`)).status).toBe(200);
    expect((await coordinator.get(`/api/rosters/${r.id}/shifts`)).status).toBe(200);
    const blocked = await coordinator.post(`/api/rosters/${r.id}/runs`).send({});
    expect(blocked.status).toBe(402);
    expect(blocked.body.error.code).toBe('payment_overdue');
    expect(blocked.body.error.message).toMatch(/new runs are paused.*stay readable/);
    // Pricing a concession re-solves, so it waits too (before even looking the run up).
    const price = await coordinator.post('/api/runs/4000000001/concession-price').send({ index: 0 });
    expect(price.status).toBe(402);
    await BillingAccount.update({ status: 'active' }, { where: { workspaceId: ws.id } });
    expect((await coordinator.post(`/api/rosters/${r.id}/runs`).send({ timeLimitSeconds: 0.5 })).status).toBe(202);
  });

  it('coordinators and staff never see billing', async () => {
    const ws = await makeWorkspace('Private Books', { plan: 'free' });
    for (const role of ['coordinator', 'staff'] as const) {
      const { agent } = await signedIn(app, ws, role);
      for (const [method, path] of [['get', '/api/billing'], ['get', '/api/billing/invoices'], ['post', '/api/billing/checkout'], ['post', '/api/billing/portal'], ['post', '/api/billing/cancel']] as const) {
        expect((await agent[method](path).send({})).status, `${role} ${path}`).toBe(403);
      }
    }
    const { agent: admin } = await signedIn(app, ws, 'admin');
    const overview = await admin.get('/api/billing');
    expect(overview.status).toBe(200);
    expect(overview.body).toMatchObject({ plan: { id: 'free' }, status: 'none', usage: { people: 0, activeRosters: 0 }, limits: { people: 12, activeRosters: 1 } });
  });
});

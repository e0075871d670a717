import type { Express } from 'express';
import { Person, type Workspace } from '../../../server/db/models';
import { agent, makeUser, makeWorkspace, PASSWORD, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from '../staff/publish-helper';

type Agent = ReturnType<typeof agent>;

/**
 * A published week (Mon 1 – Sun 7 March 2027, Europe/London): an early (07–15) and a late
 * (15–23) shift each weekday, one seat each. A works the earlies Mon–Tue, C the earlies Wed–Fri,
 * B the lates Mon–Wed, D the lates Thu–Fri (seats in `leaveOpen` stay open). E has no login. A, B, C and D sign in as staff; everyone has an address.
 */
export async function publishedWeek(app: Express, options: { workspace?: Workspace; leaveOpen?: Array<[string, string]> } = {}) {
  const workspace = options.workspace ?? (await makeWorkspace('Willowmere House'));
  const coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
  const fixture = await makeApiRoster(coordinator, workspace, {
    people: 5,
    patterns: [
      { label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: null, count: 1 }] },
      { label: 'late', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '15:00', endTime: '23:00', seats: [{ skillId: null, count: 1 }] },
    ],
  });
  const [a, b, c, d, e] = fixture.people;
  const seats = await seatsOf(workspace.id, fixture.roster.id);
  const seat = (label: string, day: string) => seats.find((s) => s.label === label && s.startsLocal.startsWith(day))!.seatId;
  const days = ['2027-03-01', '2027-03-02', '2027-03-03', '2027-03-04', '2027-03-05'];
  const holder = { early: [a, a, c, c, c], late: [b, b, b, d, d] };
  const assignments = days.flatMap((day, i) => [
    { seatId: seat('early', day), personId: holder.early[i].id },
    { seatId: seat('late', day), personId: holder.late[i].id },
  ]);
  const open = new Set((options.leaveOpen ?? []).map(([label, day]) => seat(label, day)));
  await publishDirectly(workspace.id, fixture.roster.id, assignments.map((x) => (open.has(x.seatId) ? { ...x, personId: null } : x)));
  const staff: Record<'a' | 'b' | 'c' | 'd', Agent> = {} as never;
  const emails: Record<string, string> = {};
  for (const [key, person] of Object.entries({ a, b, c, d })) {
    const user = await makeUser({ workspace, role: 'staff' });
    await Person.update({ userId: user.id, email: user.email }, { where: { id: person.id } });
    emails[key] = user.email;
    const ag = agent(app);
    const res = await ag.post('/api/auth/sign-in').send({ email: user.email, password: PASSWORD });
    if (res.status !== 200) throw new Error(`sign-in ${res.status}`);
    staff[key as 'a'] = ag;
  }
  return { workspace, coordinator, roster: fixture.roster, people: { a, b, c, d, e }, seat, staff, emails };
}

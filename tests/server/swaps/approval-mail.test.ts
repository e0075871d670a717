import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp } from '../auth/helpers';
import { Workspace } from '../../../server/db/models';
import { createMailer } from '../../../server/mail/mailer';
import type { Env } from '../../../server/env';
import { startMailFake, type KeptMessage, type MailFake } from '../../../fakes/mail/smtp-fake';
import { publishedWeek } from './fixture';

/**
 * The mail after an approved swap, giveaway or open shift, read back from the SMTP fake: each
 * person of the change is told what they gave and what they took, from or to whom, with dates and
 * times in the workspace's zone. The workspace reads its rosters in Europe/Berlin while the roster's
 * shifts are entered in Europe/London, so the times in the mail must be converted.
 *
 * Expected wall-clock times come from Intl.DateTimeFormat (the platform's IANA zone data), not from
 * the project's time code: 1–5 March 2027 London keeps GMT (UTC+0; summer time starts on the last
 * Sunday of March, Summer Time Order), Berlin CET (UTC+1), so 07:00 London is 08:00 Berlin.
 */
describe('approval mail for swaps, giveaways and open shifts, through the SMTP fake', () => {
  let db: TestDb;
  let fake: MailFake;
  let app: Express;
  let w: Awaited<ReturnType<typeof publishedWeek>>;
  let rosterName: string;

  /** "Tue 2 Mar 2027, 08:00" for a London wall-clock time on a GMT day, shown in Berlin by Intl. */
  const berlin = (utcDay: number, utcHour: number) => {
    const d = new Date(Date.UTC(2027, 2, utcDay, utcHour, 0));
    const part = (o: Intl.DateTimeFormatOptions) => new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/Berlin', ...o }).format(d);
    return { day: `${part({ weekday: 'short' })} ${part({ day: 'numeric' })} ${part({ month: 'short' })} 2027`, time: part({ hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }) };
  };
  /** A shift's words: its Berlin day and times, and the day it ends when that is the next one. */
  const shift = (utcDay: number, label: string, fromHour: number, toHour: number) => {
    const [from, to] = [berlin(utcDay, fromHour), berlin(utcDay, toHour)];
    return `${from.day}, ${label} ${from.time}–${to.time}${to.day === from.day ? '' : ` (ends ${to.day.replace(/ 2027$/, '')})`}`;
  };

  /** Messages after `since` (the fake keeps the newest first; ids count up). */
  const after = (since: number) => fake.messages.filter((m) => m.id > since);
  const lastId = () => Math.max(0, ...fake.messages.map((m) => m.id));
  const mailTo = async (to: string, since: number): Promise<KeptMessage> => {
    for (let i = 0; i < 100; i++) {
      const found = after(since).find((m) => m.to.includes(to));
      if (found) return found;
      await new Promise((r) => setTimeout(r, 50));
    }
    throw new Error(`no mail to ${to}`);
  };

  beforeAll(async () => {
    db = await createTestDb();
    fake = await startMailFake();
    const env: Env = { ...db.env, mail: { smtp: { host: '127.0.0.1', port: fake.smtpPort, secure: false }, from: 'Rotaloom <no-reply@rotaloom.test>', fakeUrl: `http://127.0.0.1:${fake.httpPort}` } };
    app = makeApp(db, { env, mailer: createMailer(env) }).app;
    w = await publishedWeek(app, { leaveOpen: [['late', '2027-03-05']] });
    await Workspace.update({ timeZone: 'Europe/Berlin' }, { where: { id: w.workspace.id } });
    rosterName = (await w.coordinator.get(`/api/rosters/${w.roster.id}`)).body.name;
  });
  afterAll(async () => {
    await fake.stop();
    await db.drop();
  });

  it('a swap tells each of the two what they no longer work, what they work instead and whose it was', async () => {
    const since = lastId();
    const body = { kind: 'swap', mySeatId: w.seat('early', '2027-03-02'), colleagueId: w.people.c.id, theirSeatId: w.seat('early', '2027-03-03') };
    const proposed = await w.staff.a.post('/api/me/swaps').send(body);
    expect(proposed.status).toBe(201);
    expect((await w.staff.c.post(`/api/me/swaps/${proposed.body.id}/accept`).send({ version: 1 })).status).toBe(200);
    const approved = await w.coordinator.post(`/api/swaps/${proposed.body.id}/decision`).send({ decision: 'approve', version: 2 });
    expect(approved.status).toBe(200);
    expect(approved.body.mail).toMatchObject({ sent: 2, failed: 0 });

    const tue = shift(2, 'early', 7, 15);
    const wed = shift(3, 'early', 7, 15);
    expect(tue).toBe('Tue 2 Mar 2027, early 08:00–16:00'); // the conversion the mail must make
    const toA = await mailTo(w.emails.a, since);
    expect(toA.subject).toBe('Swap approved: Wed 3 Mar, early instead of Tue 2 Mar, early');
    expect(toA.text).toContain(`Your swap with ${w.people.c.name} on ${rosterName} was approved`);
    expect(toA.text).toContain(`You no longer work ${tue}: ${w.people.c.name} works it now.`);
    expect(toA.text).toContain(`You work ${wed} instead, which was ${w.people.c.name}'s.`);
    expect(toA.text).toContain('Times are in Europe/Berlin.');
    // A's shifts now: Monday's early (kept) and Wednesday's (taken), in Berlin time, and no Tuesday.
    expect(toA.text).toContain(`Your shifts on ${rosterName} now (2, times in Europe/Berlin):\n- ${shift(1, 'early', 7, 15)}\n- ${wed}\n`);
    expect(toA.html).toContain(`You no longer work ${tue}`);

    const toC = await mailTo(w.emails.c, since);
    expect(toC.subject).toBe('Swap approved: Tue 2 Mar, early instead of Wed 3 Mar, early');
    expect(toC.text).toContain(`The swap ${w.people.a.name} asked of you on ${rosterName}, and you accepted, was approved`);
    expect(toC.text).toContain(`You no longer work ${wed}: ${w.people.a.name} works it now.`);
    expect(toC.text).toContain(`You work ${tue} instead, which was ${w.people.a.name}'s.`);
    expect(after(since).map((m) => m.to.join(',')).sort()).toEqual([w.emails.a, w.emails.c].sort());
  });

  it('a giveaway tells the giver they took nothing back and the taker whose shift they now work', async () => {
    const since = lastId();
    const proposed = await w.staff.d.post('/api/me/swaps').send({ kind: 'giveaway', mySeatId: w.seat('late', '2027-03-04'), colleagueId: w.people.b.id });
    expect(proposed.status, JSON.stringify(proposed.body)).toBe(201);
    expect((await w.staff.b.post(`/api/me/swaps/${proposed.body.id}/accept`).send({ version: 1 })).status).toBe(200);
    expect((await w.coordinator.post(`/api/swaps/${proposed.body.id}/decision`).send({ decision: 'approve', version: 2 })).status).toBe(200);
    const thu = shift(4, 'late', 15, 23);
    expect(thu).toBe('Thu 4 Mar 2027, late 16:00–00:00 (ends Fri 5 Mar)'); // 23:00 London is midnight in Berlin
    const toD = await mailTo(w.emails.d, since);
    expect(toD.subject).toBe(`Shift handed over: ${w.people.b.name} works your Thu 4 Mar, late`);
    expect(toD.text).toContain(`You no longer work ${thu}: ${w.people.b.name} works it now. You took no shift back.`);
    const toB = await mailTo(w.emails.b, since);
    expect(toB.subject).toBe(`You now work ${w.people.d.name}'s Thu 4 Mar, late`);
    expect(toB.text).toContain(`You now work ${thu}, which was ${w.people.d.name}'s. Nothing was taken off your shifts.`);
  });

  it('an open shift tells the taker it is theirs, and nobody else', async () => {
    const since = lastId();
    const seatId = w.seat('late', '2027-03-05');
    const made = await w.coordinator.post(`/api/rosters/${w.roster.id}/offers`).send({ seatId });
    expect(made.status).toBe(201);
    expect((await w.staff.a.post(`/api/me/offers/${made.body.id}/take`)).status).toBe(200);
    expect((await w.coordinator.post(`/api/offers/${made.body.id}/decision`).send({ decision: 'approve', version: 2 })).status).toBe(200);
    const fri = shift(5, 'late', 15, 23);
    const toA = await mailTo(w.emails.a, since);
    expect(toA.subject).toBe('Open shift approved: Fri 5 Mar, late is yours');
    expect(toA.text).toContain(`You now work ${fri}, which nobody was on before.`);
    await new Promise((r) => setTimeout(r, 300));
    expect(after(since).map((m) => m.to.join(','))).toEqual([w.emails.a]);
  });
});

import type { Request } from 'express';
import { z } from 'zod';
import type { Env } from '../env';
import type { Mailer } from '../mail/mailer';
import type { Person } from '../db/models';
import { findPerson } from '../people/repository';
import { workspaceTimeZone } from '../workspaces/service';
import { ApiRoutes, STAFF_UP } from '../http/routes';
import { HttpError } from '../http/errors';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { rosterChildParams, rosterIdParams } from '../../shared/api/rosters';
import { myShiftsQuery, myWishBody, pairingRequestBody, weeklyWishBody } from '../../shared/api/staff';
import { requireRoster } from '../rosters/repository';
import { calendarForToken, feedStatus, resetFeed, stopFeed } from './feed';
import { colleagues, myPairingRequests, requestPairing, withdrawPairingRequest } from './pairings';
import { localToday, myShifts } from './shifts';
import { deleteMyWish, myRosters, myWishes, setMyWish, setWeeklyWish } from './wishes';
import { registerNoticeMailer } from './notices';

const ws = (req: Request) => req.auth!.workspaceId;

/** The person linked to the signed-in user; everything under /me acts for them and no one else. */
export async function me(req: Request): Promise<Person> {
  const personId = req.auth!.personId;
  const person = personId ? await findPerson(ws(req), personId) : null;
  if (!person) {
    throw new HttpError(409, 'conflict', 'Your account is not linked to a person on this workspace’s roster yet. Ask an admin to link it (Members), then try again.', [
      { path: 'auth.personId', message: 'no linked person' },
    ]);
  }
  return person;
}

/** A body naming another person is refused: staff speak only for themselves. */
function assertSelf(body: { personId?: number }, person: Person): void {
  if (body.personId !== undefined && body.personId !== person.id) {
    throw new HttpError(403, 'forbidden', 'You can only state your own wishes', [{ path: 'body.personId', message: 'not you' }]);
  }
}

/** An id in the path is looked up in the caller's workspace first, so another workspace's id is a plain 404. */
const rosterInWorkspace = (req: Request) => requireRoster(ws(req), Number(req.params.rosterId));

/** /api/me: a staff member's own shifts, wishes, pairing requests and calendar feed (issue 7). */
export function staffRouter(deps: { env: Env; mailer: Mailer }) {
  registerNoticeMailer(deps.mailer, deps.env);
  const r = new ApiRoutes('/me');

  r.get('/shifts', STAFF_UP, validate({ query: myShiftsQuery }), async (req, res) => {
    const person = await me(req);
    res.json(await myShifts(ws(req), person, (req.query as { week?: string }).week));
  });

  r.get('/rosters', STAFF_UP, async (req, res) => {
    await me(req);
    res.json({ items: await myRosters(ws(req), localToday(await workspaceTimeZone(ws(req)))) });
  });
  r.get('/rosters/:rosterId/wishes', STAFF_UP, validate({ params: rosterIdParams }), async (req, res) => {
    await rosterInWorkspace(req);
    const person = await me(req);
    res.json(await myWishes(ws(req), Number(req.params.rosterId), person.id));
  });
  r.post('/rosters/:rosterId/wishes', STAFF_UP, validate({ params: rosterIdParams, body: myWishBody }), async (req, res) => {
    await rosterInWorkspace(req);
    const person = await me(req);
    assertSelf(req.body, person);
    const out = await setMyWish(ws(req), Number(req.params.rosterId), person.id, req.body, req.auth!.userId);
    res.status(out.created ? 201 : 200).json(out);
  });
  r.post('/rosters/:rosterId/wishes/weekly', STAFF_UP, validate({ params: rosterIdParams, body: weeklyWishBody }), async (req, res) => {
    await rosterInWorkspace(req);
    const person = await me(req);
    assertSelf(req.body, person);
    res.json(await setWeeklyWish(ws(req), Number(req.params.rosterId), person.id, req.body, req.auth!.userId));
  });
  r.delete('/rosters/:rosterId/wishes/:id', STAFF_UP, validate({ params: rosterChildParams }), async (req, res) => {
    await rosterInWorkspace(req);
    const person = await me(req).catch(() => null);
    // Without a linked person there is no wish of theirs to find.
    if (!person) throw new HttpError(404, 'not_found', 'Wish not found');
    await deleteMyWish(ws(req), Number(req.params.rosterId), person.id, Number(req.params.id));
    res.status(204).end();
  });

  r.get('/colleagues', STAFF_UP, async (req, res) => {
    const person = await me(req);
    res.json({ items: await colleagues(ws(req), person.id) });
  });
  r.get('/pairings', STAFF_UP, async (req, res) => {
    const person = await me(req);
    res.json({ items: await myPairingRequests(ws(req), person.id) });
  });
  r.post('/pairings', STAFF_UP, validate({ body: pairingRequestBody }), async (req, res) => {
    const person = await me(req);
    res.status(201).json(await requestPairing(ws(req), person.id, req.body));
  });
  r.delete('/pairings/:id', STAFF_UP, validate({ params: idParams }), async (req, res) => {
    const person = await me(req).catch(() => null);
    if (!person) throw new HttpError(404, 'not_found', 'Pairing request not found');
    await withdrawPairingRequest(ws(req), person.id, Number(req.params.id));
    res.status(204).end();
  });

  r.get('/feed', STAFF_UP, async (req, res) => {
    const person = await me(req);
    res.json(await feedStatus(ws(req), person.id));
  });
  r.post('/feed', STAFF_UP, async (req, res) => {
    const person = await me(req);
    res.status(201).json(await resetFeed(ws(req), person.id, deps.env.publicUrl));
  });
  r.delete('/feed', STAFF_UP, async (req, res) => {
    const person = await me(req);
    await stopFeed(ws(req), person.id);
    res.status(204).end();
  });
  return r.router;
}

// Any string: a malformed token gets the same empty 404 as an unknown one.
const feedParams = z.object({ token: z.string() });

/** /api/feeds/<token>.ics: the private calendar; anything unknown is an empty 404, saying nothing. */
export function feedsRouter() {
  const r = new ApiRoutes('/feeds');
  r.get('/:token.ics', 'public', validate({ params: feedParams }), async (req, res) => {
    const body = await calendarForToken(String(req.params.token));
    res.setHeader('Cache-Control', 'private, no-store');
    res.setHeader('Referrer-Policy', 'no-referrer');
    if (body === null) {
      res.status(404).end();
      return;
    }
    res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
    res.setHeader('Content-Disposition', 'inline; filename="shifts.ics"');
    res.send(body);
  });
  return r.router;
}

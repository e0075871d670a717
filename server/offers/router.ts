import type { Request } from 'express';
import { ApiRoutes, COORDINATOR_UP, STAFF_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { rosterIdParams } from '../../shared/api/rosters';
import { decisionBody, offerBody, versionBody } from '../../shared/api/swaps';
import { me } from '../staff/router';
import { createOffer, decideOffer, findOffer, myOffers, openSeats, rosterOffers, takeOffer, withdrawOffer } from './service';

const ws = (req: Request) => req.auth!.workspaceId;
const id = (req: Request) => Number(req.params.id);
const rid = (req: Request) => Number(req.params.rosterId);

/** Open shifts: coordinators offer uncovered seats of a published roster; eligible staff take them. */
export function offerRouters() {
  const rosters = new ApiRoutes('/rosters');
  rosters.get('/:rosterId/open-seats', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json(await openSeats(ws(req), rid(req)));
  });
  rosters.get('/:rosterId/offers', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json(await rosterOffers(ws(req), rid(req)));
  });
  rosters.post('/:rosterId/offers', COORDINATOR_UP, validate({ params: rosterIdParams, body: offerBody }), async (req, res) => {
    res.status(201).json(await createOffer(ws(req), req.auth!.userId, rid(req), req.body));
  });

  const offers = new ApiRoutes('/offers');
  offers.post('/:id/decision', COORDINATOR_UP, validate({ params: idParams, body: decisionBody }), async (req, res) => {
    res.json(await decideOffer(ws(req), id(req), req.body));
  });
  offers.post('/:id/withdraw', COORDINATOR_UP, validate({ params: idParams, body: versionBody }), async (req, res) => {
    res.json(await withdrawOffer(ws(req), id(req), req.body.version));
  });

  const mine = new ApiRoutes('/me');
  mine.get('/offers', STAFF_UP, async (req, res) => {
    res.json(await myOffers(ws(req), await me(req)));
  });
  mine.post('/offers/:id/take', STAFF_UP, validate({ params: idParams }), async (req, res) => {
    await findOffer(ws(req), id(req)); // another workspace's id is a 404 before anything else
    res.json(await takeOffer(ws(req), await me(req), id(req)));
  });
  return [rosters.router, offers.router, mine.router] as const;
}

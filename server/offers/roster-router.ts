import type { Request } from 'express';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { rosterIdParams } from '../../shared/api/rosters';
import { offerBody } from '../../shared/api/swaps';
import { createOffer, openSeats, rosterOffers } from './service';

const ws = (req: Request) => req.auth!.workspaceId;
const rid = (req: Request) => Number(req.params.rosterId);

/** /api/rosters/:rosterId/open-seats and …/offers: a published roster's uncovered seats and the offers made for them. */
export function rosterOffersRouter() {
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
  return rosters.router;
}

import type { Request } from 'express';
import { ApiRoutes, STAFF_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { me } from '../staff/router';
import { findOffer, myOffers, takeOffer } from './service';

const ws = (req: Request) => req.auth!.workspaceId;
const id = (req: Request) => Number(req.params.id);

/** /api/me/offers: the open shifts offered to the signed-in person, and taking one (first taker wins). */
export function myOffersRouter() {
  const mine = new ApiRoutes('/me');
  mine.get('/offers', STAFF_UP, async (req, res) => {
    res.json(await myOffers(ws(req), await me(req)));
  });
  mine.post('/offers/:id/take', STAFF_UP, validate({ params: idParams }), async (req, res) => {
    await findOffer(ws(req), id(req)); // another workspace's id is a 404 before anything else
    res.json(await takeOffer(ws(req), await me(req), id(req)));
  });
  return mine.router;
}

import type { Request } from 'express';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { decisionBody, versionBody } from '../../shared/api/swaps';
import { decideOffer, withdrawOffer } from './service';

const ws = (req: Request) => req.auth!.workspaceId;
const id = (req: Request) => Number(req.params.id);

/**
 * Open shifts: coordinators offer uncovered seats of a published roster (roster-router.ts), eligible
 * staff take them (staff-router.ts), and coordinators decide or withdraw an offer here.
 */
export function offersRouter() {
  const offers = new ApiRoutes('/offers');
  offers.post('/:id/decision', COORDINATOR_UP, validate({ params: idParams, body: decisionBody }), async (req, res) => {
    res.json(await decideOffer(ws(req), id(req), req.body));
  });
  offers.post('/:id/withdraw', COORDINATOR_UP, validate({ params: idParams, body: versionBody }), async (req, res) => {
    res.json(await withdrawOffer(ws(req), id(req), req.body.version));
  });
  return offers.router;
}

import type { Request } from 'express';
import { ApiRoutes, COORDINATOR_UP, STAFF_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { decisionBody, swapListQuery, swapProposalBody, versionBody } from '../../shared/api/swaps';
import { me } from '../staff/router';
import { findSwap, acceptSwap, checkSwap, decideSwap, declineSwap, listSwaps, mySwaps, proposeSwap, swapOptions, withdrawSwap } from './service';
import type { SwapRow } from './models';

const ws = (req: Request) => req.auth!.workspaceId;
const id = (req: Request) => Number(req.params.id);

/** Staff side under /api/me/swaps: propose, check first, accept or decline, withdraw. */
export function mySwapsRouter() {
  const r = new ApiRoutes('/me');
  r.get('/swap-options', STAFF_UP, async (req, res) => {
    res.json(await swapOptions(ws(req), await me(req)));
  });
  r.get('/swaps', STAFF_UP, async (req, res) => {
    res.json(await mySwaps(ws(req), await me(req)));
  });
  // A check that stores nothing, so the screen can say why a swap cannot be proposed before anyone asks.
  r.post('/swaps/check', STAFF_UP, validate({ body: swapProposalBody }), async (req, res) => {
    res.json(await checkSwap(ws(req), await me(req), req.body));
  });
  r.post('/swaps', STAFF_UP, validate({ body: swapProposalBody }), async (req, res) => {
    res.status(201).json(await proposeSwap(ws(req), await me(req), req.body));
  });
  r.post('/swaps/:id/accept', STAFF_UP, validate({ params: idParams, body: versionBody }), async (req, res) => {
    await findSwap(ws(req), id(req)); // another workspace's id is a 404 before anything else
    res.json(await acceptSwap(ws(req), await me(req), id(req), req.body.version));
  });
  r.post('/swaps/:id/decline', STAFF_UP, validate({ params: idParams, body: versionBody }), async (req, res) => {
    await findSwap(ws(req), id(req)); // another workspace's id is a 404 before anything else
    res.json(await declineSwap(ws(req), await me(req), id(req), req.body.version));
  });
  r.post('/swaps/:id/withdraw', STAFF_UP, validate({ params: idParams, body: versionBody }), async (req, res) => {
    await findSwap(ws(req), id(req)); // another workspace's id is a 404 before anything else
    res.json(await withdrawSwap(ws(req), await me(req), id(req), req.body.version));
  });
  return r.router;
}

/** Coordinator side under /api/swaps: the list and the one-tap decision. */
export function swapsRouter() {
  const r = new ApiRoutes('/swaps');
  r.get('/', COORDINATOR_UP, validate({ query: swapListQuery }), async (req, res) => {
    res.json(await listSwaps(ws(req), (req.query as { status?: SwapRow['status'] }).status));
  });
  r.post('/:id/decision', COORDINATOR_UP, validate({ params: idParams, body: decisionBody }), async (req, res) => {
    res.json(await decideSwap(ws(req), req.auth!.userId, id(req), req.body));
  });
  return r.router;
}

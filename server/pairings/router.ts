import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { pairingBody, updatePairingBody } from '../../shared/api/rosters';
import { pairingsListQuery } from '../../shared/api/pairings';
import { createPairing, deletePairing, listPairings, updatePairing } from './repository';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

/** Coordinators: pairings of the workspace, and the staff's pairing requests to approve or decline. */
export function pairingsRouter() {
  const r = new ApiRoutes('/pairings');
  r.get('/', COORDINATOR_UP, validate({ query: pairingsListQuery }), async (req, res) => {
    res.json({ items: await listPairings(ws(req), req.query as never) });
  });
  r.post('/', COORDINATOR_UP, validate({ body: pairingBody }), async (req, res) => {
    const created = await createPairing(ws(req), req.body);
    res.status(201).json((await listPairings(ws(req))).find((p) => p.id === created.id));
  });
  r.patch('/:id', COORDINATOR_UP, validate({ params: idParams, body: updatePairingBody }), async (req, res) => {
    const updated = await updatePairing(ws(req), Number(req.params.id), req.body);
    res.json((await listPairings(ws(req))).find((p) => p.id === updated.id));
  });
  r.delete('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    await deletePairing(ws(req), Number(req.params.id));
    res.status(204).end();
  });
  return r.router;
}

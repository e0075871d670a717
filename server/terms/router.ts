import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { createTermBody, termParams, updateTermBody } from '../../shared/api/terms';
import { createTerm, deleteTerm, listTerms, updateTerm } from './repository';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

/** Coordinators: a person's terms (`/api/people/:id/terms`). */
export function termsRouter() {
  const r = new ApiRoutes('/people');
  r.get('/:id/terms', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    res.json({ items: await listTerms(ws(req), Number(req.params.id)) });
  });
  r.post('/:id/terms', COORDINATOR_UP, validate({ params: idParams, body: createTermBody }), async (req, res) => {
    res.status(201).json(await createTerm(ws(req), Number(req.params.id), req.body));
  });
  r.patch('/:id/terms/:termId', COORDINATOR_UP, validate({ params: termParams, body: updateTermBody }), async (req, res) => {
    res.json(await updateTerm(ws(req), Number(req.params.id), Number(req.params.termId), req.body));
  });
  r.delete('/:id/terms/:termId', COORDINATOR_UP, validate({ params: termParams }), async (req, res) => {
    await deleteTerm(ws(req), Number(req.params.id), Number(req.params.termId));
    res.status(204).end();
  });
  return r.router;
}

import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { rosterIdParams } from '../../shared/api/rosters';
import { pickedAlternativeBody, suggestionDecisionBody } from '../../shared/api/suggestion';
import { refuseWhenPublished } from '../rosters/publish';
import { adoptSuggestion, createSuggestion, dismissSuggestion, getSuggestion, recordPickedAlternative } from './service';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;
const uid = (req: { auth?: { userId: number } }) => req.auth!.userId;

/** /api/rosters/:rosterId/suggestion: read, learn (POST), adopt, dismiss; and picked seat alternatives recorded as preferences. */
export function suggestionRouter() {
  const r = new ApiRoutes('/rosters');
  r.get('/:rosterId/suggestion', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json(await getSuggestion(ws(req), Number(req.params.rosterId)));
  });
  r.post('/:rosterId/suggestion', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.status(201).json({ suggestion: await createSuggestion(ws(req), Number(req.params.rosterId), uid(req)) });
  });
  r.post('/:rosterId/suggestion/adopt', COORDINATOR_UP, validate({ params: rosterIdParams, body: suggestionDecisionBody }), refuseWhenPublished, async (req, res) => {
    res.json({ suggestion: await adoptSuggestion(ws(req), Number(req.params.rosterId), req.body.suggestionId, uid(req)) });
  });
  r.post('/:rosterId/suggestion/dismiss', COORDINATOR_UP, validate({ params: rosterIdParams, body: suggestionDecisionBody }), async (req, res) => {
    res.json({ suggestion: await dismissSuggestion(ws(req), Number(req.params.rosterId), req.body.suggestionId, uid(req)) });
  });
  // A picked seat alternative is an edit too: the roster behind it kept over the run's.
  r.post('/:rosterId/preferences/alternative', COORDINATOR_UP, validate({ params: rosterIdParams, body: pickedAlternativeBody }), refuseWhenPublished, async (req, res) => {
    const row = await recordPickedAlternative(ws(req), Number(req.params.rosterId), uid(req), req.body);
    res.status(201).json({ preference: { id: row.id, seatsChanged: row.seatsChanged } });
  });
  return r.router;
}

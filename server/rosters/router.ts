import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import {
  createRosterBody,
  patternBody,
  pinBody,
  rosterChildParams,
  rosterIdParams,
  rostersListQuery,
  rulesBody,
  shiftBody,
  updateRosterBody,
  updateShiftBody,
  updateWishBody,
  wishBody,
} from '../../shared/api/rosters';
import { updateWish, wishesView } from './wishes-view';
import * as repo from './repository';
import { enforcePlanLimit } from '../billing/limits';
import { assembleRoster } from './assemble';
import { refuseWhenPublished as frozen } from './publish';
import { requireWorkspaceSkills } from './rule-skills';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;
const rid = (req: { params: Record<string, unknown> }) => Number(req.params.rosterId);
const cid = (req: { params: Record<string, unknown> }) => Number(req.params.id);

export function rostersRouter() {
  const r = new ApiRoutes('/rosters');
  r.get('/', COORDINATOR_UP, validate({ query: rostersListQuery }), async (req, res) => {
    res.json(await repo.listRosters(ws(req), req.query as never));
  });
  r.post('/', COORDINATOR_UP, validate({ body: createRosterBody }), enforcePlanLimit('activeRosters'), async (req, res) => {
    res.status(201).json(await repo.createRoster(ws(req), req.body));
  });
  r.get('/:rosterId', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json(repo.toRosterDto(await repo.findRoster(ws(req), rid(req))));
  });
  r.patch('/:rosterId', COORDINATOR_UP, validate({ params: rosterIdParams, body: updateRosterBody }), async (req, res) => {
    res.json(await repo.updateRoster(ws(req), rid(req), req.body));
  });
  r.delete('/:rosterId', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    await repo.deleteRoster(ws(req), rid(req));
    res.status(204).end();
  });
  r.get('/:rosterId/export', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    const { input } = await assembleRoster(ws(req), rid(req));
    res.setHeader('Content-Disposition', `attachment; filename="roster-${rid(req)}.json"`);
    res.json(input);
  });

  r.get('/:rosterId/rules', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json(await repo.getRules(ws(req), rid(req)));
  });
  r.put('/:rosterId/rules', COORDINATOR_UP, validate({ params: rosterIdParams, body: rulesBody }), frozen, async (req, res) => {
    await requireWorkspaceSkills(ws(req), req.body.rules);
    res.json(await repo.putRules(ws(req), rid(req), req.body.rules, req.body.version));
  });

  r.get('/:rosterId/patterns', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json({ items: await repo.listPatterns(ws(req), rid(req)) });
  });
  r.post('/:rosterId/patterns/preview', COORDINATOR_UP, validate({ params: rosterIdParams, body: patternBody }), async (req, res) => {
    res.json({ items: await repo.previewPattern(ws(req), rid(req), req.body) });
  });
  r.post('/:rosterId/patterns', COORDINATOR_UP, validate({ params: rosterIdParams, body: patternBody }), frozen, async (req, res) => {
    res.status(201).json(await repo.createPattern(ws(req), rid(req), req.body));
  });
  r.delete('/:rosterId/patterns/:id', COORDINATOR_UP, validate({ params: rosterChildParams }), frozen, async (req, res) => {
    await repo.deletePattern(ws(req), rid(req), cid(req));
    res.status(204).end();
  });

  r.get('/:rosterId/shifts', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json({ items: await repo.listShifts(ws(req), rid(req)) });
  });
  r.post('/:rosterId/shifts', COORDINATOR_UP, validate({ params: rosterIdParams, body: shiftBody }), frozen, async (req, res) => {
    res.status(201).json(await repo.createShift(ws(req), rid(req), req.body));
  });
  r.patch('/:rosterId/shifts/:id', COORDINATOR_UP, validate({ params: rosterChildParams, body: updateShiftBody }), frozen, async (req, res) => {
    res.json(await repo.updateShift(ws(req), rid(req), cid(req), req.body));
  });
  r.delete('/:rosterId/shifts/:id', COORDINATOR_UP, validate({ params: rosterChildParams }), frozen, async (req, res) => {
    await repo.deleteShift(ws(req), rid(req), cid(req));
    res.status(204).end();
  });

  r.get('/:rosterId/wishes', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json(await wishesView(ws(req), rid(req)));
  });
  r.post('/:rosterId/wishes', COORDINATOR_UP, validate({ params: rosterIdParams, body: wishBody }), async (req, res) => {
    res.status(201).json(await repo.createWish(ws(req), rid(req), req.body, req.auth!.userId));
  });
  r.patch('/:rosterId/wishes/:id', COORDINATOR_UP, validate({ params: rosterChildParams, body: updateWishBody }), async (req, res) => {
    res.json(await updateWish(ws(req), rid(req), cid(req), req.body, req.auth!.userId));
  });
  r.delete('/:rosterId/wishes/:id', COORDINATOR_UP, validate({ params: rosterChildParams }), async (req, res) => {
    await repo.deleteWish(ws(req), rid(req), cid(req));
    res.status(204).end();
  });

  r.get('/:rosterId/pins', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    res.json({ items: await repo.listPins(ws(req), rid(req)) });
  });
  r.put('/:rosterId/pins', COORDINATOR_UP, validate({ params: rosterIdParams, body: pinBody }), frozen, async (req, res) => {
    res.json(await repo.putPin(ws(req), rid(req), req.body));
  });
  r.delete('/:rosterId/pins/:id', COORDINATOR_UP, validate({ params: rosterChildParams }), frozen, async (req, res) => {
    await repo.deletePin(ws(req), rid(req), cid(req));
    res.status(204).end();
  });
  return r.router;
}


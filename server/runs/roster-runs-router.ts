import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError } from '../http/errors';
import { manualRunBody, rosterIdParams, scoreBody, startRunBody } from '../../shared/api/rosters';
import { scoreRoster } from '../../solver/roster';
import { assembleValidRoster } from '../rosters/assemble';
import { rosterIds, parseRosterId } from '../rosters/ids';
import { finite } from './execute';
import { requireRunsAllowed } from '../billing/limits';
import { refuseWhenPublished } from '../rosters/publish';
import { findRoster } from '../rosters/repository';
import { runNumber, runNumbers } from './numbering';
import { listRosterRuns } from './repository';
import { queueRun } from './start';
import { toRunDto } from './router';
import { saveManualRun } from './manual';
import { recordManualPreferenceQuietly } from '../learning/service';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

/** /api/rosters/:rosterId/…: start a run, list runs, score a filled roster, save a hand-edited one. */
export function rosterRunsRouter() {
  const routes = new ApiRoutes('/rosters');
  routes.post('/:rosterId/runs', COORDINATOR_UP, validate({ params: rosterIdParams, body: startRunBody }), requireRunsAllowed, refuseWhenPublished, async (req, res) => {
    const run = (await queueRun(ws(req), Number(req.params.rosterId), req.body))!;
    res.status(202).json(toRunDto(run, await runNumber(run)));
  });
  routes.get('/:rosterId/runs', COORDINATOR_UP, validate({ params: rosterIdParams }), async (req, res) => {
    await findRoster(ws(req), Number(req.params.rosterId)); // another workspace's roster is a 404, not an empty list
    const rows = await listRosterRuns(ws(req), Number(req.params.rosterId));
    const numbers = await runNumbers(ws(req), Number(req.params.rosterId));
    res.json({ items: rows.map((r) => toRunDto(r, numbers.get(r.id) ?? 0)) });
  });
  routes.post('/:rosterId/score', COORDINATOR_UP, validate({ params: rosterIdParams, body: scoreBody }), async (req, res) => {
    const { roster } = await assembleValidRoster(ws(req), Number(req.params.rosterId));
    const known = new Set(roster.seats.map((s) => s.id));
    const assignment: Record<string, string | null> = {};
    for (const [seat, person] of Object.entries(req.body.assignment as Record<string, number | null>)) {
      const key = rosterIds.seat(Number(seat));
      if (!known.has(key)) throw new HttpError(422, 'unprocessable', `Seat ${seat} is not part of this roster`, [{ path: `body.assignment.${seat}`, message: 'unknown seat' }]);
      assignment[key] = person === null ? null : rosterIds.person(person);
    }
    const check = scoreRoster(roster, assignment);
    res.json({
      total: finite(check.total),
      feasible: check.feasible,
      softTotal: check.softTotal,
      terms: check.terms,
      hardCounts: check.hardCounts,
      violations: check.violations.map((v) => ({ ...v, points: finite(v.points), seats: v.seats.map((s) => parseRosterId('st', s)) })),
    });
  });
  routes.post('/:rosterId/manual-runs', COORDINATOR_UP, validate({ params: rosterIdParams, body: manualRunBody }), refuseWhenPublished, async (req, res) => {
    const saved = await saveManualRun(ws(req), Number(req.params.rosterId), req.body);
    await recordManualPreferenceQuietly(ws(req), Number(req.params.rosterId), req.auth!.userId, saved.runId, req.body.basedOnRunId); // the edit as a preference (server/learning)
    res.status(201).json(saved);
  });
  return routes.router;
}

/**
 * Weight suggestions: record each coordinator edit as a preference, learn a suggestion for a
 * roster from the workspace's edits, adopt it (the roster's rules change, on record with who and
 * when) or dismiss it. Nothing here changes weights except `adoptSuggestion`, on a coordinator's
 * request.
 */
import { HttpError } from '../http/errors';
import { Roster, RunRow } from '../rosters/models';
import { User } from '../db/models';
import { runAssignment, currentRoster } from '../runs/run-view';
import { MIN_EDITS_FOR_SUGGESTION, type SuggestionAnswer, type SuggestionDto } from '../../shared/api/suggestion';
import type { RosterAssignment, RuleSet } from '../../shared/roster/schema';
import type { SeatAlternativesAnswer } from '../../shared/api/seat-alternatives';
import { rosterIds } from '../rosters/ids';
import { computeOnWorker } from '../queue/queues';
import { PreferenceRow, SuggestionRow } from './models';
import { computeSuggestion, DEFAULT_COMPUTE_OPTIONS, type ComputeOptions, type StoredEdit } from './compute';

/** The newest edits a suggestion learns from: older ones may no longer say what the coordinator wants. */
export const MAX_EDITS_LEARNED = 60;

const changedSeats = (a: RosterAssignment, b: RosterAssignment) => Object.keys({ ...a, ...b }).filter((s) => (a[s] ?? null) !== (b[s] ?? null)).length;

/**
 * After a manual save: the saved roster kept over the run it was based on. A save based on no run
 * (or on a run of another roster) says nothing about a proposal, so it records nothing.
 */
export async function recordManualPreference(workspaceId: number, rosterId: number, userId: number, keptRunId: number, basedOnRunId: number | null | undefined): Promise<PreferenceRow | null> {
  if (!basedOnRunId) return null;
  const proposed = await runAssignment(workspaceId, basedOnRunId);
  if (proposed.run.rosterId !== rosterId) return null;
  const kept = await runAssignment(workspaceId, keptRunId);
  const seatsChanged = changedSeats(kept.assignment, proposed.assignment);
  if (seatsChanged === 0) return null;
  return PreferenceRow.create({ workspaceId, rosterId, source: 'manual', keptRunId, proposedRunId: basedOnRunId, rosterJson: kept.roster, kept: kept.assignment, proposed: proposed.assignment, seatsChanged, createdByUserId: userId });
}

/** The same, never failing the save it follows: a preference lost is logged, the save stands. */
export async function recordManualPreferenceQuietly(...args: Parameters<typeof recordManualPreference>): Promise<void> {
  try {
    await recordManualPreference(...args);
  } catch (err) {
    console.error('[learning] could not record the edit as a preference:', err);
  }
}

/**
 * A seat alternative the coordinator picked, as a preference: the roster behind the alternative
 * (the seat with the picked person and the other seats it moves, as the seat panel showed it) kept
 * over the run's roster. `alternatives` gives the seat's alternatives for that run as computed for
 * the panel (a job on the worker, whose cache answers with the figures the panel showed).
 */
export async function recordPickedAlternative(
  workspaceId: number,
  rosterId: number,
  userId: number,
  pick: { runId: number; seatId: number; personId: number | null },
  alternatives: () => Promise<SeatAlternativesAnswer> = async () =>
    (await computeOnWorker(PreferenceRow.sequelize!, { kind: 'alternatives', workspaceId, runId: pick.runId, seatId: pick.seatId }, 150_000, 'the alternatives for this seat')) as SeatAlternativesAnswer,
): Promise<PreferenceRow> {
  await findRosterRow(workspaceId, rosterId);
  const run = await RunRow.findOne({ where: { id: pick.runId, workspaceId }, attributes: ['id', 'rosterId'] });
  if (!run) throw new HttpError(404, 'not_found', 'Run not found', [{ path: 'body.runId', message: 'no such run in this workspace' }]);
  const proposed = await runAssignment(workspaceId, pick.runId);
  if (proposed.run.rosterId !== rosterId) throw new HttpError(422, 'unprocessable', 'That run belongs to another roster.', [{ path: 'body.runId', message: 'not a run of this roster' }]);
  if (!proposed.roster.seats.some((s) => s.id === rosterIds.seat(pick.seatId))) throw new HttpError(422, 'unprocessable', 'That seat is not in this roster.', [{ path: 'body.seatId', message: 'not a seat of this roster' }]);
  const answer = await alternatives();
  if (answer.current.personId === pick.personId) throw new HttpError(422, 'unprocessable', 'That person already holds this seat in the run: picking them changes nothing.', [{ path: 'body.personId', message: 'already in this seat' }]);
  const alt = answer.alternatives.find((a) => a.personId === pick.personId);
  if (!alt) throw new HttpError(422, 'unprocessable', 'That person may not take this seat (skill, pin or a "cannot" wish).', [{ path: 'body.personId', message: 'not an alternative for this seat' }]);
  if (!alt.feasible) throw new HttpError(422, 'unprocessable', 'No roster with that choice keeps every hard rule, so there is nothing to keep.', [{ path: 'body.personId', message: 'breaks a hard rule' }]);
  const kept: RosterAssignment = { ...proposed.assignment, [rosterIds.seat(pick.seatId)]: pick.personId === null ? null : rosterIds.person(pick.personId) };
  for (const o of alt.otherSeats) kept[rosterIds.seat(o.seatId)] = o.personId === null ? null : rosterIds.person(o.personId);
  return PreferenceRow.create({
    workspaceId,
    rosterId,
    source: 'alternative',
    keptRunId: null,
    proposedRunId: pick.runId,
    rosterJson: proposed.roster,
    kept,
    proposed: proposed.assignment,
    seatsChanged: changedSeats(kept, proposed.assignment),
    createdByUserId: userId,
  });
}

async function editCounts(workspaceId: number): Promise<{ edits: number; rosters: number }> {
  const rows = await PreferenceRow.findAll({ where: { workspaceId }, attributes: ['rosterId'], order: [['id', 'DESC']], limit: MAX_EDITS_LEARNED, raw: true });
  return { edits: rows.length, rosters: new Set(rows.map((r) => r.rosterId)).size };
}

async function toDto(row: SuggestionRow): Promise<SuggestionDto> {
  const decider = row.decidedByUserId ? await User.findByPk(row.decidedByUserId, { attributes: ['displayName'] }) : null;
  return {
    id: row.id,
    rosterId: row.rosterId,
    status: row.status,
    weights: row.weights,
    report: row.report,
    editCount: row.editCount,
    rosterCount: row.rosterCount,
    createdAt: row.createdAt.toISOString(),
    decidedAt: row.decidedAt ? row.decidedAt.toISOString() : null,
    decidedBy: decider?.displayName ?? null,
  };
}

export async function getSuggestion(workspaceId: number, rosterId: number): Promise<SuggestionAnswer> {
  await findRosterRow(workspaceId, rosterId);
  const row = await SuggestionRow.findOne({ where: { workspaceId, rosterId }, order: [['id', 'DESC']] });
  return { suggestion: row ? await toDto(row) : null, ...(await editCounts(workspaceId)), minEdits: MIN_EDITS_FOR_SUGGESTION };
}

async function findRosterRow(workspaceId: number, rosterId: number): Promise<Roster> {
  const row = await Roster.findOne({ where: { workspaceId, id: rosterId } });
  if (!row) throw new HttpError(404, 'not_found', 'Roster not found', [{ path: 'params.rosterId', message: 'no such roster in this workspace' }]);
  return row;
}

/**
 * Learns a suggestion for the roster's rules from the workspace's newest edits (inline, with the
 * learner's time limit; `computeSuggestion` is the part a queue job would run). An earlier open
 * suggestion for the roster is superseded: marked dismissed by the coordinator who asked again.
 */
export async function createSuggestion(workspaceId: number, rosterId: number, userId: number, options: ComputeOptions = DEFAULT_COMPUTE_OPTIONS): Promise<SuggestionDto> {
  const rosterRow = await findRosterRow(workspaceId, rosterId);
  const rows = (await PreferenceRow.findAll({ where: { workspaceId }, order: [['id', 'DESC']], limit: MAX_EDITS_LEARNED })).reverse();
  if (rows.length < MIN_EDITS_FOR_SUGGESTION) {
    throw new HttpError(422, 'unprocessable', `A suggestion needs at least ${MIN_EDITS_FOR_SUGGESTION} edits; this workspace has ${rows.length}. Edit a solved roster by hand and save it (each save counts as one edit).`, [
      { path: 'edits', message: `needs at least ${MIN_EDITS_FOR_SUGGESTION} edits, has ${rows.length}` },
    ]);
  }
  const { roster } = await currentRoster(workspaceId, rosterId);
  const names = new Map((await Roster.findAll({ where: { workspaceId, id: [...new Set(rows.map((r) => r.rosterId))] }, attributes: ['id', 'name'] })).map((r) => [r.id, r.name]));
  const edits: StoredEdit[] = rows.map((r) => ({ id: r.id, rosterId: r.rosterId, rosterName: names.get(r.rosterId) ?? `roster ${r.rosterId}`, roster: r.rosterJson, kept: r.kept, proposed: r.proposed }));
  const outcome = await computeSuggestion(roster.rules, edits, options);
  if (!outcome.ok) throw new HttpError(422, 'unprocessable', outcome.message, outcome.pairs.map(([a, b]) => ({ path: 'edits', message: `edits ${a} and ${b} undo each other` })));
  if (outcome.weights.length === 0) throw new HttpError(422, 'unprocessable', 'This roster has no soft rule with a weight to learn: every rule is hard or off.', [{ path: 'rules', message: 'no soft rule' }]);
  const sequelize = SuggestionRow.sequelize!;
  return sequelize.transaction(async (transaction) => {
    await SuggestionRow.update({ status: 'dismissed', decidedByUserId: userId, decidedAt: new Date() }, { where: { workspaceId, rosterId, status: 'open' }, transaction });
    const row = await SuggestionRow.create(
      { workspaceId, rosterId, weights: outcome.weights, report: outcome.report, editCount: outcome.report.edits, rosterCount: outcome.report.rosters, rosterVersion: rosterRow.version, createdByUserId: userId },
      { transaction },
    );
    return toDto(row);
  });
}

async function openSuggestion(workspaceId: number, rosterId: number, suggestionId: number): Promise<SuggestionRow> {
  const row = await SuggestionRow.findOne({ where: { workspaceId, rosterId, id: suggestionId } });
  if (!row) throw new HttpError(404, 'not_found', 'Suggestion not found', [{ path: 'body.suggestionId', message: 'no such suggestion for this roster' }]);
  if (row.status !== 'open') throw new HttpError(409, 'conflict', `This suggestion was already ${row.status}.`, [{ path: 'body.suggestionId', message: `already ${row.status}` }]);
  return row;
}

/**
 * Adopts a suggestion: the roster's rules take the suggested weights (every other setting stays),
 * the rules before are kept on the suggestion with who adopted it and when. Refused (409) when the
 * weights changed since the suggestion was learned: it would overwrite a coordinator's own change.
 */
export async function adoptSuggestion(workspaceId: number, rosterId: number, suggestionId: number, userId: number): Promise<SuggestionDto> {
  const row = await openSuggestion(workspaceId, rosterId, suggestionId);
  const sequelize = SuggestionRow.sequelize!;
  return sequelize.transaction(async (transaction) => {
    const roster = await Roster.findOne({ where: { workspaceId, id: rosterId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!roster) throw new HttpError(404, 'not_found', 'Roster not found');
    if (roster.status === 'published') throw new HttpError(409, 'conflict', 'This roster is published. Reopen it before changing its rules.', [{ path: 'params.rosterId', message: 'roster is published' }]);
    const rules = { ...(roster.rules as Record<string, unknown>) };
    for (const w of row.weights) {
      const now = (rules[w.key] as { weight?: number } | undefined)?.weight;
      if (now !== w.from) {
        throw new HttpError(409, 'conflict', `The weight of ${w.name} changed since this suggestion was made (${w.from} then, ${now ?? 'gone'} now). Ask for a new suggestion.`, [{ path: 'body.suggestionId', message: 'rules changed since' }]);
      }
    }
    for (const w of row.weights) rules[w.key] = { ...(rules[w.key] as object), weight: w.to };
    await Roster.update({ rules: rules as RuleSet, version: roster.version + 1 }, { where: { workspaceId, id: rosterId }, transaction });
    await row.update({ status: 'adopted', decidedByUserId: userId, decidedAt: new Date(), rulesBefore: roster.rules as object }, { transaction });
    return toDto(row);
  });
}

export async function dismissSuggestion(workspaceId: number, rosterId: number, suggestionId: number, userId: number): Promise<SuggestionDto> {
  const row = await openSuggestion(workspaceId, rosterId, suggestionId);
  await row.update({ status: 'dismissed', decidedByUserId: userId, decidedAt: new Date() });
  return toDto(row);
}

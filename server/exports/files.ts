import { Op } from 'sequelize';
import { Person } from '../db/models';
import { HttpError } from '../http/errors';
import { AssignmentRow, RunRow } from '../rosters/models';
import { findRoster } from '../rosters/repository';
import { pickRun, rosterPdf } from '../rosters/pdf';
import { exportCsv, exportIcs } from '../rosters/publish';
import { exportPeopleCsv } from '../people/export';
import type { ExportKind } from './models';

/** The validated query of each kind of export: what the file is made from (and the key two equal requests share). */
export type ExportParams =
  | { kind: 'roster-pdf'; rosterId: number; runId?: number; days: number }
  | { kind: 'roster-csv' | 'roster-ics'; rosterId: number; runId?: number; personId?: number }
  | { kind: 'people-csv' };

export interface ExportOutput {
  filename: string;
  contentType: string;
  body: Buffer;
}

const CONTENT_TYPES: Record<ExportKind, string> = {
  'roster-pdf': 'application/pdf',
  'roster-csv': 'text/csv; charset=utf-8',
  'roster-ics': 'text/calendar; charset=utf-8',
  'people-csv': 'text/csv; charset=utf-8',
};

/**
 * Makes the file. The API process calls it for small exports and the worker for large ones,
 * with the same parameters, so both give the same bytes (tests/server/exports/jobs.test.ts).
 */
export async function makeExport(workspaceId: number, p: ExportParams): Promise<ExportOutput> {
  const contentType = CONTENT_TYPES[p.kind];
  switch (p.kind) {
    case 'roster-pdf': {
      const file = await rosterPdf(workspaceId, p.rosterId, { runId: p.runId, days: p.days });
      return { filename: file.filename, contentType, body: file.body };
    }
    case 'roster-csv':
    case 'roster-ics': {
      const file = await (p.kind === 'roster-csv' ? exportCsv : exportIcs)(workspaceId, p.rosterId, { runId: p.runId, personId: p.personId });
      return { filename: file.filename, contentType, body: Buffer.from(file.body, 'utf8') };
    }
    case 'people-csv':
      return { filename: 'people.csv', contentType, body: Buffer.from(await exportPeopleCsv(workspaceId), 'utf8') };
  }
}

/**
 * Above these sizes a file is made by a worker (a 202 the client follows) instead of in the API
 * process. Measured with `npx tsx server/exports/bench.ts` (docs/scaling.md): the grid PDF costs
 * about 0.2 s of CPU plus 0.08 ms per person-day, so 2,000 person-days is about 0.35 s; roster
 * CSV and iCalendar files cost about 0.04 ms per line written from the run (5,000 lines: about
 * 0.2 s) and far less from a published snapshot; the people CSV about 0.04 ms per person. Below
 * them a job would only add its queue hop and a poll (about 0.5 s) to a file made faster than that.
 */
export const EXPORT_JOB_FROM: Record<ExportKind, { size: number; unit: string }> = {
  'roster-pdf': { size: 2000, unit: 'person-days' },
  'roster-csv': { size: 5000, unit: 'shift lines' },
  'roster-ics': { size: 5000, unit: 'shift lines' },
  'people-csv': { size: 5000, unit: 'people' },
};

const filled = { personId: { [Op.ne]: null } };

/**
 * How big the file will be, in the unit its threshold is measured in, from a count or two (never
 * the file itself). Checks the ids on the way, with the same answers the file's own code gives
 * (404 naming the field, 409 in words), so a bad id is refused at once on either path.
 */
export async function exportSize(workspaceId: number, p: ExportParams): Promise<number> {
  if (p.kind === 'people-csv') return Person.count({ where: { workspaceId, archivedAt: null } });
  const roster = await findRoster(workspaceId, p.rosterId);
  if (p.kind === 'roster-pdf') {
    const runId = await pickRun(workspaceId, p.rosterId, p.runId);
    const people = await AssignmentRow.count({ where: { runId, workspaceId, ...filled }, distinct: true, col: 'personId' });
    const days = Math.round((Date.parse(`${roster.periodEnd}T00:00:00Z`) - Date.parse(`${roster.periodStart}T00:00:00Z`)) / 86_400_000) + 1;
    return people * days;
  }
  const runId = p.runId ?? roster.publishedRunId;
  if (!runId) throw new HttpError(409, 'conflict', 'This roster is not published yet: publish it, or name a run to export (?runId=).', [{ path: 'query.runId', message: 'required until the roster is published' }]);
  if (p.runId && p.runId !== roster.publishedRunId) {
    const run = await RunRow.findOne({ where: { id: p.runId, workspaceId, rosterId: p.rosterId }, attributes: ['id', 'status'] });
    if (!run) throw new HttpError(404, 'not_found', 'Run not found for this roster', [{ path: 'query.runId', message: 'not a run of this roster' }]);
    if (run.status !== 'done' && run.status !== 'cancelled') throw new HttpError(409, 'conflict', 'This run has no finished roster yet.');
  }
  if (p.personId && !(await Person.findOne({ where: { id: p.personId, workspaceId }, attributes: ['id'] }))) {
    throw new HttpError(404, 'not_found', 'Person not found', [{ path: 'query.personId', message: 'unknown person' }]);
  }
  // The whole run is read whoever the file is for, so the run's lines are the work.
  return AssignmentRow.count({ where: { runId, workspaceId, ...filled } });
}

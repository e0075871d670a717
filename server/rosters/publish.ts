import { Person, User, Workspace } from '../db/models';
import { HttpError } from '../http/errors';
import type { Mailer, OutgoingMail } from '../mail/mailer';
import { notifyPublished } from '../staff/notices';
import { localDateTimeToInstant } from '../../shared/roster/time';
import { formatDay } from '../../shared/roster/derive';
import { AssignmentRow, Roster, RunRow, SeatRow, ShiftRow } from './models';
import { findRoster, toRosterDto } from './repository';
import { buildCalendar, type CalendarEvent } from '../exports/ical';
import { buildCsv } from '../exports/csv';

/** Every shift of a run with who works it, in start order; the data the mails and files are made from. */
export async function runShifts(workspaceId: number, rosterId: number, runId: number) {
  const run = await RunRow.findOne({ where: { id: runId, workspaceId, rosterId } });
  if (!run) throw new HttpError(404, 'not_found', 'Run not found for this roster', [{ path: 'query.runId', message: 'not a run of this roster' }]);
  if (run.status !== 'done' && run.status !== 'cancelled') throw new HttpError(409, 'conflict', 'This run has no finished roster yet.');
  const assignments = await AssignmentRow.findAll({ where: { runId, workspaceId } });
  const seats = await SeatRow.findAll({ where: { workspaceId, id: assignments.map((a) => a.seatId) } });
  const shifts = await ShiftRow.findAll({ where: { workspaceId, rosterId }, order: [['startsLocal', 'ASC'], ['id', 'ASC']] });
  const people = await Person.findAll({ where: { workspaceId } });
  const personName = new Map(people.map((p) => [p.id, p.name]));
  const seatShift = new Map(seats.map((s) => [s.id, s.shiftId]));
  const byShift = new Map<number, Array<{ personId: number; name: string }>>();
  for (const a of assignments) {
    const shiftId = seatShift.get(a.seatId);
    if (shiftId === undefined || a.personId === null) continue;
    const list = byShift.get(shiftId) ?? [];
    list.push({ personId: a.personId, name: personName.get(a.personId) ?? `person ${a.personId}` });
    byShift.set(shiftId, list);
  }
  return {
    run,
    people,
    shifts: shifts.map((s) => ({ id: s.id, label: s.label, startsLocal: s.startsLocal, endsLocal: s.endsLocal, people: byShift.get(s.id) ?? [] })),
  };
}

const time = (local: string) => local.slice(11, 16);

/**
 * What a published roster's files are written from, kept on the roster row at publish: renaming
 * or archiving a person, renaming the workspace or editing a shift after publishing changes none
 * of the published CSV and iCalendar bytes (the DTSTAMP is the publication time, not "now").
 */
export interface PublishedSnapshot {
  format: 1;
  runId: number;
  rosterName: string;
  timeZone: string;
  workspaceName: string | null;
  publishedAt: string;
  shifts: Array<{ id: number; label: string; startsLocal: string; endsLocal: string; people: Array<{ personId: number; name: string }> }>;
}

async function takeSnapshot(workspaceId: number, roster: Roster, runId: number, publishedAt: Date): Promise<PublishedSnapshot> {
  const { shifts } = await runShifts(workspaceId, roster.id, runId);
  const workspace = await Workspace.findByPk(workspaceId);
  return { format: 1, runId, rosterName: roster.name, timeZone: roster.timeZone, workspaceName: workspace?.name ?? null, publishedAt: publishedAt.toISOString(), shifts };
}

/** The published run's snapshot; rosters published before snapshots existed get theirs on first export. */
async function publishedSnapshotOf(workspaceId: number, roster: Roster): Promise<PublishedSnapshot> {
  const kept = roster.publishedSnapshot as PublishedSnapshot | null;
  if (kept && kept.runId === roster.publishedRunId) return kept;
  const snapshot = await takeSnapshot(workspaceId, roster, roster.publishedRunId!, new Date(roster.publishedAt ?? Date.now()));
  await Roster.update({ publishedSnapshot: snapshot }, { where: { id: roster.id, workspaceId, publishedRunId: roster.publishedRunId }, silent: true });
  return snapshot;
}

/** The shifts, names and stamp an export is written from: the publication's snapshot, or a named run as it is now. */
async function exportView(workspaceId: number, rosterId: number, runId?: number) {
  const roster = await findRoster(workspaceId, rosterId);
  if (!runId && !roster.publishedRunId) throw new HttpError(409, 'conflict', 'This roster is not published yet: publish it, or name a run to export (?runId=).', [{ path: 'query.runId', message: 'required until the roster is published' }]);
  if (!runId || runId === roster.publishedRunId) {
    const snap = await publishedSnapshotOf(workspaceId, roster);
    return { rosterId: roster.id, rosterName: snap.rosterName, timeZone: snap.timeZone, workspaceName: snap.workspaceName, stamp: new Date(snap.publishedAt), shifts: snap.shifts };
  }
  const workspace = await Workspace.findByPk(workspaceId);
  const { run, shifts } = await runShifts(workspaceId, rosterId, runId);
  // The run row's last write (its finish), so two downloads of one run give the same bytes.
  return { rosterId: roster.id, rosterName: roster.name, timeZone: roster.timeZone, workspaceName: workspace?.name ?? null, stamp: new Date(run.updatedAt), shifts };
}

/** The person a per-person export is for: by the name the file was published with, else as they are now. */
async function exportPerson(workspaceId: number, shifts: PublishedSnapshot['shifts'], personId?: number) {
  if (!personId) return undefined;
  for (const s of shifts) for (const p of s.people) if (p.personId === personId) return { id: personId, name: p.name };
  const now = await Person.findOne({ where: { id: personId, workspaceId } });
  if (!now) throw new HttpError(404, 'not_found', 'Person not found', [{ path: 'query.personId', message: 'unknown person' }]);
  return { id: now.id, name: now.name };
}

export async function exportCsv(workspaceId: number, rosterId: number, q: { runId?: number; personId?: number }) {
  const view = await exportView(workspaceId, rosterId, q.runId);
  const person = await exportPerson(workspaceId, view.shifts, q.personId);
  const rows: Array<Array<string | number>> = [['date', 'start', 'end', 'shift', 'person', 'time zone']];
  for (const s of view.shifts) {
    for (const p of s.people) {
      if (person && p.personId !== person.id) continue;
      rows.push([s.startsLocal.slice(0, 10), time(s.startsLocal), time(s.endsLocal), s.label, p.name, view.timeZone]);
    }
  }
  const who = person ? `-${slug(person.name)}` : '';
  return { filename: `${slug(view.rosterName)}${who}.csv`, body: buildCsv(rows) };
}

export async function exportIcs(workspaceId: number, rosterId: number, q: { runId?: number; personId?: number }) {
  const view = await exportView(workspaceId, rosterId, q.runId);
  const person = await exportPerson(workspaceId, view.shifts, q.personId);
  const events: CalendarEvent[] = [];
  for (const s of view.shifts) {
    if (s.people.length === 0) continue;
    if (person && !s.people.some((p) => p.personId === person.id)) continue;
    const start = localDateTimeToInstant(s.startsLocal, view.timeZone);
    const end = localDateTimeToInstant(s.endsLocal, view.timeZone);
    events.push({
      // Stable across re-publishing, so calendar programs update an event instead of adding a copy.
      uid: person ? `roster${view.rosterId}-shift${s.id}-person${person.id}@rotaloom` : `roster${view.rosterId}-shift${s.id}@rotaloom`,
      start,
      end,
      stamp: view.stamp,
      summary: person ? `${capital(s.label)} shift` : `${capital(s.label)} shift: ${s.people.map((p) => p.name).join(', ')}`,
      description: `${view.rosterName}\n${capital(s.label)} shift, ${time(s.startsLocal)}–${time(s.endsLocal)} (${view.timeZone})\nOn this shift: ${s.people.map((p) => p.name).join(', ')}`,
      location: view.workspaceName ?? undefined,
    });
  }
  const name = person ? `${person.name} — ${view.rosterName}` : view.rosterName;
  return { filename: `${slug(view.rosterName)}${person ? `-${slug(person.name)}` : ''}.ics`, body: buildCalendar({ name, product: 'Published roster', publish: true, events }) };
}

const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
const slug = (s: string) => s.toLowerCase().normalize('NFKD').replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'roster';

function shiftsMail(input: { to: string; personName: string; rosterName: string; workspaceName: string; timeZone: string; lines: string[]; url: string }): OutgoingMail {
  const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);
  const subject = `Your shifts: ${input.rosterName}`;
  const intro = `${input.workspaceName} has published ${input.rosterName}. These are your ${input.lines.length} shift${input.lines.length === 1 ? '' : 's'} (times in ${input.timeZone}):`;
  const text = [`Hello ${input.personName},`, '', intro, '', ...input.lines.map((l) => `- ${l}`), '', `See the roster: ${input.url}`, '', '— Rotaloom'].join('\n');
  const html = `<!doctype html><html><body style="font-family:system-ui,-apple-system,sans-serif;color:#1d2a33;line-height:1.5;max-width:560px;margin:0 auto;padding:24px">
<p>Hello ${esc(input.personName)},</p><p>${esc(intro)}</p><ul>${input.lines.map((l) => `<li>${esc(l)}</li>`).join('')}</ul>
<p><a href="${esc(input.url)}">See the roster</a></p><p style="color:#51606b">— Rotaloom</p></body></html>`;
  return { to: input.to, subject, text, html };
}

/**
 * Freezes the roster on one finished run (status published, published_run_id), then mails every
 * person on it their own shifts. A person without an address (their own or their linked account's)
 * is listed, not skipped silently; a mail that fails is reported and the publication stands.
 */
export async function publishRoster(workspaceId: number, rosterId: number, body: { runId: number; version: number }, deps: { mailer: Mailer; publicUrl: string }) {
  const roster = await findRoster(workspaceId, rosterId);
  if (roster.status === 'published') throw new HttpError(409, 'conflict', 'This roster is already published. Reopen it first to publish another version.', [{ path: 'body.version', message: 'already published' }]);
  const { run, shifts, people } = await runShifts(workspaceId, rosterId, body.runId).catch((err: unknown) => {
    if (err instanceof HttpError && err.status === 404) throw new HttpError(422, 'unprocessable', 'That run is not a run of this roster', [{ path: 'body.runId', message: 'not a run of this roster' }]);
    throw err;
  });
  const result = run.result as { feasible?: boolean } | null;
  if (run.status !== 'done' || !result?.feasible) throw new HttpError(422, 'unprocessable', 'Only a finished run that keeps every hard rule can be published.', [{ path: 'body.runId', message: 'run not finished or not feasible' }]);
  const publishedAt = new Date();
  const snapshot = await takeSnapshot(workspaceId, roster, run.id, publishedAt);
  const [count] = await Roster.update(
    { status: 'published', publishedRunId: run.id, publishedAt, publishedSnapshot: snapshot, version: body.version + 1 },
    { where: { id: rosterId, workspaceId, version: body.version } },
  );
  if (count === 0) {
    throw new HttpError(409, 'conflict', 'Someone changed this roster after you last loaded it. Reload, check the roster, then publish again.', [{ path: 'body.version', message: `you saw version ${body.version}; the current one is ${roster.version}` }]);
  }

  // A re-publish (after a reopen) tells only the people whose shifts changed, and what changed.
  if (roster.publishedRunId && roster.publishedRunId !== run.id) {
    const report = await notifyPublished(workspaceId, rosterId, roster.publishedRunId, deps);
    const names = new Map(people.map((p) => [p.id, p.name]));
    return {
      roster: toRosterDto(await findRoster(workspaceId, rosterId)),
      mail: {
        sent: report.sent.map((m) => ({ ...m, name: names.get(m.personId) ?? '' })),
        noAddress: report.noAddress,
        failed: report.failed.map((m) => ({ ...m, name: names.get(m.personId) ?? '' })),
        unchanged: report.unchanged,
      },
    };
  }

  const workspace = await Workspace.findByPk(workspaceId);
  const users = await User.findAll({ where: { id: people.map((p) => p.userId).filter((id): id is number => typeof id === 'number') } });
  const userEmail = new Map(users.map((u) => [u.id, u.email]));
  const sent: Array<{ personId: number; name: string; to: string }> = [];
  const noAddress: Array<{ personId: number; name: string }> = [];
  const failed: Array<{ personId: number; name: string; reason: string }> = [];
  for (const person of people) {
    const own = shifts.filter((s) => s.people.some((p) => p.personId === person.id));
    if (own.length === 0) continue;
    const to = person.email ?? (person.userId ? userEmail.get(person.userId) : undefined);
    if (!to) {
      noAddress.push({ personId: person.id, name: person.name });
      continue;
    }
    const lines = own.map((s) => `${formatDay(s.startsLocal.slice(0, 10))}: ${s.label}, ${time(s.startsLocal)}–${time(s.endsLocal)}`);
    try {
      await deps.mailer.send(shiftsMail({ to, personName: person.name, rosterName: roster.name, workspaceName: workspace?.name ?? 'Your workspace', timeZone: roster.timeZone, lines, url: `${deps.publicUrl}/rosters/${roster.id}` }));
      sent.push({ personId: person.id, name: person.name, to });
    } catch (err) {
      failed.push({ personId: person.id, name: person.name, reason: err instanceof Error ? err.message : String(err) });
    }
  }
  return { roster: toRosterDto(await findRoster(workspaceId, rosterId)), mail: { sent, noAddress, failed } };
}

/** Back to "solved": the published run stays recorded, changes and runs are allowed again. */
export async function reopenRoster(workspaceId: number, rosterId: number, version: number) {
  const roster = await findRoster(workspaceId, rosterId);
  if (roster.status !== 'published') throw new HttpError(409, 'conflict', 'This roster is not published.');
  const [count] = await Roster.update({ status: 'solved', version: version + 1 }, { where: { id: rosterId, workspaceId, version } });
  if (count === 0) throw new HttpError(409, 'conflict', 'Someone changed this roster after you last loaded it. Reload and try again.', [{ path: 'body.version', message: `the current version is ${roster.version}` }]);
  return toRosterDto(await findRoster(workspaceId, rosterId));
}

/** Mutating a published roster's content is refused until it is reopened. */
export async function assertNotPublished(workspaceId: number, rosterId: number): Promise<void> {
  const roster = await findRoster(workspaceId, rosterId);
  if (roster.status === 'published') throw new HttpError(409, 'conflict', 'This roster is published and frozen. Reopen it for changes first.', [{ path: 'params.rosterId', message: 'roster is published' }]);
}

/** Route guard for content changes: a published roster is frozen (409 in words) until reopened. */
export const refuseWhenPublished = async (req: { auth?: { workspaceId: number }; params: Record<string, unknown> }, _res: unknown, next: (err?: unknown) => void) => {
  try {
    await assertNotPublished(req.auth!.workspaceId, Number(req.params.rosterId));
    next();
  } catch (err) {
    next(err);
  }
};

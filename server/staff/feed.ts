import { createHash, randomBytes } from 'node:crypto';
import { Person, Workspace } from '../db/models';
import { transactionWithRetry } from '../db/sequelize';
import { ShiftRow } from '../rosters/models';
import type { MyFeedAnswer } from '../../shared/api/staff';
import { buildCalendar, type CalendarEvent } from '../exports/ical';
import { CalendarFeedRow } from './models';
import { publishedShiftsOf } from './shifts';

/** 32 random bytes, base64url: 256 bits nobody guesses. */
const TOKEN = /^[A-Za-z0-9_-]{43}$/;

export const hashToken = (token: string) => createHash('sha256').update(token, 'utf8').digest('hex');

export const feedUrl = (publicUrl: string, token: string) => `${publicUrl.replace(/\/$/, '')}/api/feeds/${token}.ics`;

export async function feedStatus(workspaceId: number, personId: number): Promise<MyFeedAnswer> {
  const row = await CalendarFeedRow.findOne({ where: { workspaceId, personId } });
  return { active: Boolean(row), createdAt: row ? new Date(row.updatedAt).toISOString() : null };
}

/** Makes the person's feed address, or a new one in place of the old, which stops working at once. */
export async function resetFeed(workspaceId: number, personId: number, publicUrl: string): Promise<MyFeedAnswer> {
  const token = randomBytes(32).toString('base64url');
  const tokenHash = hashToken(token);
  // The person's row is locked first, so simultaneous resets run one after the other (each
  // replacing the last) instead of two creates meeting on the unique (workspace, person) index.
  const row = await transactionWithRetry(CalendarFeedRow.sequelize!, async (transaction) => {
    await Person.findOne({ where: { id: personId, workspaceId }, transaction, lock: transaction.LOCK.UPDATE });
    const existing = await CalendarFeedRow.findOne({ where: { workspaceId, personId }, transaction });
    return existing ? existing.update({ tokenHash, updatedAt: new Date() }, { transaction }) : CalendarFeedRow.create({ workspaceId, personId, tokenHash }, { transaction });
  });
  return { active: true, createdAt: new Date(row.updatedAt).toISOString(), url: feedUrl(publicUrl, token) };
}

export async function stopFeed(workspaceId: number, personId: number): Promise<void> {
  await CalendarFeedRow.destroy({ where: { workspaceId, personId } });
}

/** The calendar for a token, or null for anything unknown (the route answers an empty 404). */
export async function calendarForToken(token: string): Promise<string | null> {
  if (!TOKEN.test(token)) return null;
  const feed = await CalendarFeedRow.findOne({ where: { tokenHash: hashToken(token) } });
  if (!feed) return null;
  const person = await Person.findOne({ where: { id: feed.personId, workspaceId: feed.workspaceId } });
  // Feeds are made by the member linked to the person; once nobody is, the address stops working.
  if (!person || person.userId === null) return null;
  const workspace = await Workspace.findByPk(feed.workspaceId);
  const { shifts, rosters } = await publishedShiftsOf(feed.workspaceId, person.id);
  const rosterById = new Map(rosters.map((r) => [r.id, r]));
  const shiftRows = shifts.length ? await ShiftRow.findAll({ where: { workspaceId: feed.workspaceId, id: shifts.map((s) => s.shiftId) }, attributes: ['id', 'version', 'updatedAt'] }) : [];
  const shiftById = new Map(shiftRows.map((s) => [s.id, s]));
  const events: CalendarEvent[] = shifts.map((s) => {
    const roster = rosterById.get(s.rosterId)!;
    const row = shiftById.get(s.shiftId);
    const published = new Date(roster.publishedAt ?? roster.updatedAt);
    const changed = row && new Date(row.updatedAt) > published ? new Date(row.updatedAt) : published;
    const others = s.coworkers.length ? `With ${s.coworkers.join(', ')}.` : 'No one else on this shift.';
    return {
      uid: `seat-${s.seatId}@rotaloom`,
      // Run ids and shift versions only ever grow, so their sum does too.
      sequence: roster.publishedRunId! + (row?.version ?? 1),
      start: new Date(s.startsAt),
      end: new Date(s.endsAt),
      stamp: changed,
      lastModified: changed,
      summary: `${s.label} shift · ${workspace?.name ?? 'Rotaloom'}`,
      description: `${s.rosterName}, ${s.startsLocal.slice(11, 16)}–${s.endsLocal.slice(11, 16)} (${s.timeZone}). ${others}`,
      confirmed: true,
    };
  });
  return buildCalendar({
    name: `${person.name} · ${workspace?.name ?? 'Rotaloom'} shifts`,
    product: 'Published shifts',
    events,
    // Shown in the workspace's zone, so a calendar app displays the shift at the wall-clock time
    // people were told, and edits to it stay in that zone.
    timeZone: workspace?.timeZone ?? 'UTC',
    // Calendar apps that honour it look again every hour, so a re-publish shows up the same day.
    refreshSeconds: 3600,
  });
}

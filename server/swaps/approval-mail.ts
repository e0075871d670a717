/**
 * The mail after a coordinator approves a swap, a giveaway or an open shift: to each person whose
 * shifts it moved, in words of that change (what they gave, what they took, from or to whom),
 * then their shifts on the roster now. Dates and times are told in the workspace's time zone,
 * named in the mail, since that is the zone the team reads its rosters in.
 *
 * Only the people of the change are told: nobody else's shifts moved. The generic re-publish
 * notice (staff/notices.ts) is for re-solves, where anyone's shifts may have changed.
 */
import { format } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import { Person, User, Workspace } from '../db/models';
import type { Mailer, OutgoingMail } from '../mail/mailer';
import { Roster, SeatRow, ShiftRow } from '../rosters/models';
import { registeredNoticeMailer, type NoticeReport } from '../staff/notices';
import { shiftsOfRun } from '../staff/shifts';
import { localDateTimeToInstant } from '../../shared/roster/time';

export type ApprovedChange =
  | { kind: 'swap'; proposerId: number; colleagueId: number; proposerSeatId: number; colleagueSeatId: number }
  | { kind: 'giveaway'; proposerId: number; colleagueId: number; proposerSeatId: number }
  | { kind: 'offer'; takerId: number; seatId: number };

type ShiftWords = { label: string; startsLocal: string; endsLocal: string };

/** "Mon 1 Mar 2027, early 07:00–15:00", the times those instants show in `zone` (a shift past midnight says the day it ends). */
export function shiftWords(s: ShiftWords, rosterZone: string, zone: string): string {
  const start = new TZDate(localDateTimeToInstant(s.startsLocal, rosterZone), zone);
  const end = new TZDate(localDateTimeToInstant(s.endsLocal, rosterZone), zone);
  const sameDay = format(start, 'yyyy-MM-dd') === format(end, 'yyyy-MM-dd');
  return `${format(start, 'EEE d MMM yyyy')}, ${s.label} ${format(start, 'HH:mm')}–${format(end, 'HH:mm')}${sameDay ? '' : ` (ends ${format(end, 'EEE d MMM')})`}`;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

function render(to: string, subject: string, greeting: string, lead: string, changes: string[], now: { lead: string; lines: string[] }, url: string): OutgoingMail {
  const text = [greeting, '', lead, '', ...changes.flatMap((c) => [c, '']), now.lead, ...now.lines.map((l) => `- ${l}`), '', `Your shifts and calendar feed in Rotaloom: ${url}`, '', '— Rotaloom'].join('\n');
  const html = `<!doctype html><html><body style="font-family:system-ui,-apple-system,sans-serif;color:#1d2a33;line-height:1.5;max-width:560px;margin:0 auto;padding:24px">
<p>${esc(greeting)}</p><p>${esc(lead)}</p>
${changes.map((c) => `<p style="margin:0 0 12px"><strong>${esc(c)}</strong></p>`).join('\n')}
<p style="margin:16px 0 4px">${esc(now.lead)}</p>${now.lines.length ? `<ul>${now.lines.map((l) => `<li>${esc(l)}</li>`).join('')}</ul>` : ''}
<p><a href="${esc(url)}">Your shifts and calendar feed in Rotaloom</a></p><p style="color:#51606b">— Rotaloom</p></body></html>`;
  return { to, subject, text, html };
}

type Mail = { personId: number; subject: string; lead: string; changes: string[] };

/** What each person of the change is told (before their shifts now), in words. */
function wordsOf(change: ApprovedChange, name: (id: number) => string, shift: (seatId: number) => string, short: (seatId: number) => string, rosterName: string, by: string): Mail[] {
  if (change.kind === 'swap') {
    const { proposerId: a, colleagueId: b, proposerSeatId: x, colleagueSeatId: y } = change;
    return [
      { personId: a, subject: `Swap approved: ${short(y)} instead of ${short(x)}`, lead: `Your swap with ${name(b)} on ${rosterName} was approved${by}, and the published roster now says so.`, changes: [`You no longer work ${shift(x)}: ${name(b)} works it now.`, `You work ${shift(y)} instead, which was ${name(b)}'s.`] },
      { personId: b, subject: `Swap approved: ${short(x)} instead of ${short(y)}`, lead: `The swap ${name(a)} asked of you on ${rosterName}, and you accepted, was approved${by}; the published roster now says so.`, changes: [`You no longer work ${shift(y)}: ${name(a)} works it now.`, `You work ${shift(x)} instead, which was ${name(a)}'s.`] },
    ];
  }
  if (change.kind === 'giveaway') {
    const { proposerId: a, colleagueId: b, proposerSeatId: x } = change;
    return [
      { personId: a, subject: `Shift handed over: ${name(b)} works your ${short(x)}`, lead: `Handing your shift to ${name(b)} on ${rosterName} was approved${by}, and the published roster now says so.`, changes: [`You no longer work ${shift(x)}: ${name(b)} works it now. You took no shift back.`] },
      { personId: b, subject: `You now work ${name(a)}'s ${short(x)}`, lead: `You accepted a shift from ${name(a)} on ${rosterName}, and it was approved${by}; the published roster now says so.`, changes: [`You now work ${shift(x)}, which was ${name(a)}'s. Nothing was taken off your shifts.`] },
    ];
  }
  return [{ personId: change.takerId, subject: `Open shift approved: ${short(change.seatId)} is yours`, lead: `You took an open shift on ${rosterName}, and it was approved${by}; the published roster now says so.`, changes: [`You now work ${shift(change.seatId)}, which nobody was on before.`] }];
}

/**
 * Mails the people of an approved change (after it is on the published roster). Returns who was
 * mailed, who has no address and what failed, as the publish notices do; a failed mail never
 * undoes the change.
 */
export async function notifyApprovedChange(workspaceId: number, rosterId: number, change: ApprovedChange, approvedByUserId: number | null, deps: { mailer?: Mailer; publicUrl?: string } = {}): Promise<NoticeReport> {
  const registered = registeredNoticeMailer();
  const mailer = deps.mailer ?? registered?.mailer;
  const publicUrl = deps.publicUrl ?? registered?.publicUrl ?? '';
  if (!mailer) throw new Error('notifyApprovedChange: no mailer (build the app first or pass one)');
  const report: NoticeReport = { sent: [], noAddress: [], failed: [], unchanged: 0 };
  const roster = await Roster.findOne({ where: { id: rosterId, workspaceId } });
  if (!roster?.publishedRunId) return report;
  const workspace = await Workspace.findByPk(workspaceId);
  const zone = workspace?.timeZone || roster.timeZone;
  const seatIds = change.kind === 'swap' ? [change.proposerSeatId, change.colleagueSeatId] : change.kind === 'giveaway' ? [change.proposerSeatId] : [change.seatId];
  const seats = await SeatRow.findAll({ where: { workspaceId, id: seatIds } });
  const shifts = await ShiftRow.findAll({ where: { workspaceId, id: seats.map((s) => s.shiftId) } });
  const shiftOfSeat = new Map(seats.map((s) => [s.id, shifts.find((sh) => sh.id === s.shiftId)!]));
  const shift = (seatId: number) => shiftWords(shiftOfSeat.get(seatId)!, roster.timeZone, zone);
  const short = (seatId: number) => shift(seatId).replace(/ \d{4},/, ',').replace(/ \d\d:\d\d–.*$/, '');
  const personIds = change.kind === 'offer' ? [change.takerId] : [change.proposerId, change.colleagueId];
  const people = await Person.findAll({ where: { workspaceId, id: personIds } });
  const users = await User.findAll({ where: { id: people.map((p) => p.userId).filter((id): id is number => typeof id === 'number') } });
  const approver = approvedByUserId ? await User.findByPk(approvedByUserId, { attributes: ['displayName'] }) : null;
  const by = approver?.displayName ? ` by ${approver.displayName}` : '';
  const name = (id: number) => people.find((p) => p.id === id)?.name ?? 'a colleague';
  const now = await shiftsOfRun(workspaceId, roster, roster.publishedRunId, personIds);
  for (const m of wordsOf(change, name, shift, short, roster.name, by)) {
    const person = people.find((p) => p.id === m.personId);
    if (!person) continue;
    const to = person.email ?? users.find((u) => u.id === person.userId)?.email;
    if (!to) {
      report.noAddress.push({ personId: person.id, name: person.name });
      continue;
    }
    const mine = [...(now.get(person.id) ?? [])].sort((x, y) => x.startsAt.localeCompare(y.startsAt));
    const list = { lead: mine.length ? `Your shifts on ${roster.name} now (${mine.length}, times in ${zone}):` : `You have no shifts on ${roster.name} now.`, lines: mine.map((s) => shiftWords(s, roster.timeZone, zone)) };
    const lead = `${m.lead} Times are in ${zone}.`;
    try {
      await mailer.send(render(to, m.subject, `Hello ${person.name},`, lead, m.changes, list, `${publicUrl}/my-shifts`));
      report.sent.push({ personId: person.id, to });
    } catch (err) {
      report.failed.push({ personId: person.id, reason: err instanceof Error ? err.message : String(err) });
    }
  }
  return report;
}

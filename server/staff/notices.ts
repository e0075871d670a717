import { format, parseISO } from 'date-fns';
import { Person, User, Workspace } from '../db/models';
import type { Env } from '../env';
import type { Mailer, OutgoingMail } from '../mail/mailer';
import { Roster, RunRow, ShiftRow } from '../rosters/models';
import type { MyShift } from '../../shared/api/staff';
import { shiftsOfRun } from './shifts';

/**
 * Mail to staff about a published roster, each person only ever told about their own shifts.
 *
 * - First publish (no previous run): everyone on the roster gets their shifts.
 * - Re-publish (`previousRunId`, the run that was published before): only people whose shifts
 *   differ get a mail, saying what was added and what was taken off, then their shifts now.
 *
 * The mailer comes from the app (registered by staffRouter) unless the caller passes one.
 */
let registered: { mailer: Mailer; publicUrl: string } | null = null;
export function registerNoticeMailer(mailer: Mailer, env: Pick<Env, 'publicUrl'>): void {
  registered = { mailer, publicUrl: env.publicUrl };
}

/** The mailer and public address registered by the app (swap and offer approvals mail through it too). */
export function registeredNoticeMailer(): { mailer: Mailer; publicUrl: string } | null {
  return registered;
}

export interface NoticeReport {
  sent: Array<{ personId: number; to: string }>;
  noAddress: Array<{ personId: number; name: string }>;
  failed: Array<{ personId: number; reason: string }>;
  unchanged: number;
}

const day = (local: string) => format(parseISO(local.slice(0, 10)), 'EEE d MMM');
const line = (s: MyShift) => `${day(s.startsLocal)}: ${s.label}, ${s.startsLocal.slice(11, 16)}–${s.endsLocal.slice(11, 16)}`;

export async function notifyPublished(
  workspaceId: number,
  rosterId: number,
  previousRunId?: number | null,
  deps: { mailer?: Mailer; publicUrl?: string } = {},
): Promise<NoticeReport> {
  const mailer = deps.mailer ?? registered?.mailer;
  const publicUrl = deps.publicUrl ?? registered?.publicUrl ?? '';
  if (!mailer) throw new Error('notifyPublished: no mailer (build the app first or pass one)');
  const report: NoticeReport = { sent: [], noAddress: [], failed: [], unchanged: 0 };
  const roster = await Roster.findOne({ where: { id: rosterId, workspaceId } });
  if (!roster?.publishedRunId) return report;
  const now = await shiftsOfRun(workspaceId, roster, roster.publishedRunId, 'all');
  const before = previousRunId ? await shiftsOfRun(workspaceId, roster, previousRunId, 'all') : null;
  // A shift kept from the earlier run but edited after it was made (times, seats) counts as changed.
  const previousRun = previousRunId ? await RunRow.findOne({ where: { id: previousRunId, workspaceId }, attributes: ['id', 'createdAt'] }) : null;
  const editedSince = new Set<number>();
  if (previousRun) {
    const rows = await ShiftRow.findAll({ where: { workspaceId, rosterId }, attributes: ['id', 'updatedAt'] });
    for (const r of rows) if (new Date(r.updatedAt) > new Date(previousRun.createdAt)) editedSince.add(r.id);
  }
  const personIds = [...new Set([...now.keys(), ...(before?.keys() ?? [])])];
  const people = await Person.findAll({ where: { workspaceId, id: personIds } });
  const users = await User.findAll({ where: { id: people.map((p) => p.userId).filter((id): id is number => typeof id === 'number') } });
  const userEmail = new Map(users.map((u) => [u.id, u.email]));
  const workspace = await Workspace.findByPk(workspaceId);
  const workspaceName = workspace?.name ?? 'Your workspace';

  for (const person of people) {
    const mine = now.get(person.id) ?? [];
    let mail: OutgoingMail | null;
    const to = person.email ?? (person.userId ? userEmail.get(person.userId) : undefined);
    if (before) {
      const old = before.get(person.id) ?? [];
      const key = (s: MyShift) => `${s.shiftId}`;
      const oldKeys = new Set(old.map(key));
      const newKeys = new Set(mine.map(key));
      const added = mine.filter((s) => !oldKeys.has(key(s)));
      const removed = old.filter((s) => !newKeys.has(key(s)));
      const edited = mine.filter((s) => oldKeys.has(key(s)) && editedSince.has(s.shiftId));
      if (added.length === 0 && removed.length === 0 && edited.length === 0) {
        report.unchanged += 1;
        continue;
      }
      mail = to ? changeMail({ to, name: person.name, rosterName: roster.name, workspaceName, timeZone: roster.timeZone, added, removed, edited, mine, url: `${publicUrl}/my-shifts` }) : null;
    } else {
      if (mine.length === 0) continue;
      mail = to ? publishedMail({ to, name: person.name, rosterName: roster.name, workspaceName, timeZone: roster.timeZone, mine, url: `${publicUrl}/my-shifts` }) : null;
    }
    if (!mail || !to) {
      report.noAddress.push({ personId: person.id, name: person.name });
      continue;
    }
    try {
      await mailer.send(mail);
      report.sent.push({ personId: person.id, to });
    } catch (err) {
      report.failed.push({ personId: person.id, reason: err instanceof Error ? err.message : String(err) });
    }
  }
  return report;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

function render(to: string, subject: string, greeting: string, sections: Array<{ lead: string; lines: string[] }>, url: string): OutgoingMail {
  const text = [greeting, '', ...sections.flatMap((s) => [s.lead, ...s.lines.map((l) => `- ${l}`), '']), `Your shifts in Rotaloom: ${url}`, '', '— Rotaloom'].join('\n');
  const html = `<!doctype html><html><body style="font-family:system-ui,-apple-system,sans-serif;color:#1d2a33;line-height:1.5;max-width:560px;margin:0 auto;padding:24px">
<p>${esc(greeting)}</p>
${sections.map((s) => `<p style="margin:16px 0 4px">${esc(s.lead)}</p>${s.lines.length ? `<ul>${s.lines.map((l) => `<li>${esc(l)}</li>`).join('')}</ul>` : ''}`).join('\n')}
<p><a href="${esc(url)}">Your shifts in Rotaloom</a></p><p style="color:#51606b">— Rotaloom</p></body></html>`;
  return { to, subject, text, html };
}

function publishedMail(i: { to: string; name: string; rosterName: string; workspaceName: string; timeZone: string; mine: MyShift[]; url: string }): OutgoingMail {
  return render(
    i.to,
    `Your shifts: ${i.rosterName}`,
    `Hello ${i.name},`,
    [{ lead: `${i.workspaceName} has published ${i.rosterName}. Your ${i.mine.length} shift${i.mine.length === 1 ? '' : 's'} (times in ${i.timeZone}):`, lines: i.mine.map(line) }],
    i.url,
  );
}

function changeMail(i: { to: string; name: string; rosterName: string; workspaceName: string; timeZone: string; added: MyShift[]; removed: MyShift[]; edited: MyShift[]; mine: MyShift[]; url: string }): OutgoingMail {
  const sections = [
    { lead: `${i.workspaceName} has published a new version of ${i.rosterName}, and your shifts changed (times in ${i.timeZone}).`, lines: [] },
    ...(i.added.length ? [{ lead: 'Now on:', lines: i.added.map(line) }] : []),
    ...(i.removed.length ? [{ lead: 'No longer on:', lines: i.removed.map(line) }] : []),
    ...(i.edited.length ? [{ lead: 'Changed since the last version (as it is now):', lines: i.edited.map(line) }] : []),
    { lead: i.mine.length ? `All your shifts now (${i.mine.length}):` : 'You have no shifts on this roster now.', lines: i.mine.map(line) },
  ];
  return render(i.to, `Your shifts changed: ${i.rosterName}`, `Hello ${i.name},`, sections, i.url);
}

/**
 * The roster grid as a PDF (pdf-lib): A4 landscape, a page per week or fortnight, the same marks,
 * totals, seats filled and legend as the screen's print sheet, and the working-time caution.
 */
import { z } from 'zod';
import { PDFDict, PDFDocument, PDFName, PDFNumber, StandardFonts, rgb, type PDFFont, type PDFPage, type RGB } from 'pdf-lib';
import { runNumber as numberOfRun } from '../runs/numbering';
import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { HttpError } from '../http/errors';
import { rosterIdParams } from '../../shared/api/rosters';
import { WORKING_TIME_CAUTION } from '../../shared/caution';
import { ABSENCE_KIND_WORDS } from '../../shared/api/absences';
import { addLocalDays } from '../../shared/roster/time';
import { ABSENCE_MARKS, WISH_MARKS, buildGrid, isWeekend, shiftBand, shiftMark, type GridModel, type GridRow } from '../../shared/roster/grid-model';
import { gridColors } from '../../constants/grid-colors';
import { runAssignment } from '../runs/run-view';
import { findRoster } from './repository';
import { RunRow } from './models';
import { answerExport } from '../exports/jobs';

export const rosterPdfQuery = z.object({
  runId: z.coerce.number().int().min(1, 'must be a positive id').optional(),
  days: z.coerce.number().refine((d) => d === 7 || d === 14, 'days per page is 7 or 14').default(7),
});

const dbId = (prefixed: string) => Number(prefixed.replace(/^[a-z]+/, ''));
const hex = (h: string): RGB => rgb(parseInt(h.slice(1, 3), 16) / 255, parseInt(h.slice(3, 5), 16) / 255, parseInt(h.slice(5, 7), 16) / 255);
const INK = hex('#1D2B2A');
const SOFT = hex('#4A5857');
const LINE = hex('#D8D0C0');

/**
 * The standard PDF fonts only encode WinAnsi; other characters become close ASCII, their letter
 * without its accent ("ř" → "r"), or "?" instead of failing the file.
 */
export function winAnsi(s: string): string {
  const map: Record<string, string> = { '−': '-', '–': '-', '—': '-', '×': 'x', '’': "'", '‘': "'", '“': '"', '”': '"', '…': '...', '\u00a0': ' ' };
  const fits = (c: string) => c.charCodeAt(0) < 256 && !(c.charCodeAt(0) >= 0x80 && c.charCodeAt(0) < 0xa0);
  return [...s]
    .map((c) => {
      if (map[c]) return map[c];
      if (fits(c)) return c;
      const base = c.normalize('NFD')[0];
      return base && fits(base) ? base : '?';
    })
    .join('');
}

/** Windows-1252 (WinAnsiEncoding) codes 128–159; 32–127 and 160–255 are Latin-1's own. */
const CP1252_HIGH = '€\u0081‚ƒ„…†‡ˆ‰Š‹Œ\u008DŽ\u008F\u0090‘’“”•–—˜™š›œ\u009DžŸ';

/**
 * Writes each glyph's advance (Adobe's Helvetica metrics, as pdf-lib measured the lines with)
 * into the font dictionaries. Without /Widths a viewer or printer lacking Helvetica lays the text
 * out with its stand-in font's own, often wider, advances: lines that fitted ran off the page
 * (seen in Chromium's viewer on a machine with only DejaVu Sans). Called after the last text is
 * drawn: embedding then is final (pdf-lib re-embeds a font only after new text).
 */
export async function fixStandardFontWidths(doc: PDFDocument, fonts: PDFFont[]): Promise<void> {
  for (const font of fonts) {
    await font.embed();
    const widths: number[] = [];
    for (let code = 32; code <= 255; code++) {
      const c = code >= 128 && code < 160 ? CP1252_HIGH[code - 128] : String.fromCharCode(code);
      let w = 0;
      try {
        w = font.widthOfTextAtSize(c, 1000);
      } catch {
        w = 0; // a code WinAnsi leaves undefined
      }
      widths.push(Math.round(w));
    }
    const dict = doc.context.lookup(font.ref, PDFDict);
    dict.set(PDFName.of('FirstChar'), PDFNumber.of(32));
    dict.set(PDFName.of('LastChar'), PDFNumber.of(255));
    dict.set(PDFName.of('Widths'), doc.context.obj(widths));
  }
}

/** "Mon 6 Dec – Sun 12 Dec 2027", as the print sheet says it. */
function spanWords(from: string, to: string): string {
  const day = (d: string, year: boolean) => new Date(`${d}T12:00:00Z`).toLocaleDateString('en-GB', { weekday: 'short', day: 'numeric', month: 'short', ...(year ? { year: 'numeric' } : {}), timeZone: 'UTC' }).replace(',', '');
  return `${day(from, from.slice(0, 4) !== to.slice(0, 4))} – ${day(to, true)}`;
}

/** Which run to print: the one named, else the published one, else the newest finished. */
export async function pickRun(workspaceId: number, rosterId: number, runId?: number): Promise<number> {
  if (runId) {
    const run = await RunRow.findOne({ where: { id: runId, workspaceId, rosterId }, attributes: ['id'] });
    if (!run) throw new HttpError(404, 'not_found', 'Run not found for this roster', [{ path: 'query.runId', message: 'not a run of this roster' }]);
    return run.id;
  }
  const roster = await findRoster(workspaceId, rosterId);
  if (roster.publishedRunId) return roster.publishedRunId;
  const latest = await RunRow.findOne({ where: { workspaceId, rosterId, status: ['done', 'cancelled'] }, order: [['id', 'DESC']], attributes: ['id'] });
  if (!latest) throw new HttpError(409, 'conflict', 'This roster has no finished run to print yet: solve it first.', [{ path: 'query.runId', message: 'no finished run' }]);
  return latest.id;
}

/** The grid model of a run, built from the roster as it stands (the same builder the screen uses). */
export async function runGrid(workspaceId: number, rosterId: number, runId: number): Promise<{ model: GridModel; rosterName: string; runNumber: number | null; published: boolean; skillName: (id: number | null) => string; stamp: Date }> {
  const roster = await findRoster(workspaceId, rosterId);
  const { run, roster: json, assignment } = await runAssignment(workspaceId, runId);
  const skills = new Map(json.skills.map((s) => [dbId(s.id), s.name]));
  const skillName = (id: number | null) => (id === null ? 'anyone' : (skills.get(id) ?? 'a skill'));
  const seatsByShift = new Map<string, Array<{ id: number; skillId: number | null }>>();
  for (const seat of json.seats) seatsByShift.set(seat.shift, [...(seatsByShift.get(seat.shift) ?? []), { id: dbId(seat.id), skillId: seat.skill === null ? null : dbId(seat.skill) }]);
  const result = (run.result ?? null) as { violations?: GridModel['rows'][number]['rowBreaches']; people?: Array<{ personId: string; hours: number; nights: number; weekendShifts: number; contractedHours?: number }> } | null;
  const model = buildGrid({
    periodStart: json.period.start,
    periodEnd: json.period.end,
    shifts: json.shifts.map((s) => ({ id: dbId(s.id), label: s.patternLabel, startsLocal: s.start, endsLocal: s.end, night: s.night ?? null, seats: seatsByShift.get(s.id) ?? [] })),
    people: json.people.map((p) => ({ id: dbId(p.id), name: p.name, skillIds: p.skills.map(dbId), contractedHours: null })),
    assignment: new Map(Object.entries(assignment).map(([seat, person]) => [dbId(seat), person === null ? null : dbId(person)])),
    wishes: json.wishes.map((w) => ({ personId: dbId(w.person), date: w.date ?? null, shiftId: w.shift ? dbId(w.shift) : null, kind: w.kind })),
    // The roster format's absences end exclusively (00:00 of the next day for a whole day).
    absences: json.absences.map((a) => ({ personId: dbId(a.person), kind: a.kind, startDate: a.start.slice(0, 10), endDate: a.end.slice(11, 16) === '00:00' ? addLocalDays(a.end.slice(0, 10), -1) : a.end.slice(0, 10), startTime: null, endTime: null })),
    violations: result?.violations ?? [],
    totals: result?.people ?? [],
    skillName,
  });
  // The run row's last write (its finish) dates the file, so two downloads of one run give the same bytes.
  return { model, rosterName: roster.name, runNumber: (run as RunRow & { number?: number | null }).number ?? null, published: roster.publishedRunId === run.id, skillName, stamp: new Date(run.updatedAt) };
}

const PAGE = { w: 841.89, h: 595.28, margin: 24 };

function text(page: PDFPage, font: PDFFont, s: string, x: number, y: number, size: number, color: RGB = INK, maxWidth?: number) {
  let t = winAnsi(s);
  // Too long for its column: cut and end with a full stop.
  if (maxWidth && font.widthOfTextAtSize(t, size) > maxWidth) {
    while (t.length > 1 && font.widthOfTextAtSize(`${t}.`, size) > maxWidth) t = t.slice(0, -1);
    t = `${t}.`;
  }
  page.drawText(t, { x, y, size, font, color });
}

/** Wraps words to lines of at most `width` points. */
function wrap(font: PDFFont, s: string, size: number, width: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of winAnsi(s).split(' ')) {
    const next = line ? `${line} ${word}` : word;
    if (font.widthOfTextAtSize(next, size) > width && line) {
      lines.push(line);
      line = word;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

export async function rosterPdf(workspaceId: number, rosterId: number, q: { runId?: number; days: number }): Promise<{ filename: string; body: Buffer }> {
  const runId = await pickRun(workspaceId, rosterId, q.runId);
  const { model, rosterName, runNumber, published, skillName, stamp } = await runGrid(workspaceId, rosterId, runId);
  // pdf-lib would stamp the file with the clock (CreationDate, ModDate); the run's own time keeps
  // the bytes the same whether the API process or a worker makes them, and between downloads.
  const doc = await PDFDocument.create({ updateMetadata: false });
  doc.setTitle(winAnsi(`${rosterName} - roster`));
  doc.setCreator('Rotaloom');
  doc.setProducer('pdf-lib (https://github.com/Hopding/pdf-lib)');
  doc.setCreationDate(stamp);
  doc.setModificationDate(stamp);
  const font = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  const rows = model.rows.filter((r) => [...r.cells.values()].some((c) => c.seats.length || c.absence)).sort((a, b) => a.person.name.localeCompare(b.person.name));
  const pages: string[][] = [];
  for (let i = 0; i < model.days.length; i += q.days) pages.push(model.days.slice(i, i + q.days));
  const nameW = 110;
  const totalW = 40;
  const caution = wrap(font, WORKING_TIME_CAUTION, 7, PAGE.w - 2 * PAGE.margin);
  const shownNumber = runNumber ?? (await numberOfRun({ id: runId, workspaceId, rosterId }));
  // "sheet k of n" is written once every sheet exists.
  const subLines: Array<{ page: PDFPage; words: string }> = [];
  const footerH = 16 + 14 + caution.length * 9;
  for (const days of pages) {
    // A year for 200 people is seconds of drawing: letting other work in between sheets keeps a
    // worker's job locks renewed (a blocked process would look dead to the queue).
    await new Promise((r) => setImmediate(r));
    const dayW = (PAGE.w - 2 * PAGE.margin - nameW - 4 * totalW) / days.length;
    // A long staff list continues on further sheets for the same days.
    const top = PAGE.h - PAGE.margin - 34;
    const headH = 20;
    const skillsPerDay = Math.max(1, ...days.map((d) => model.foot.get(d)?.length ?? 0));
    const footH = skillsPerDay * 8 + 4;
    const rowH = Math.max(11, Math.min(22, (top - headH - footH - PAGE.margin - footerH) / Math.max(1, rows.length)));
    const perSheet = Math.max(1, Math.floor((top - headH - footH - PAGE.margin - footerH) / rowH));
    for (let start = 0; start < Math.max(1, rows.length); start += perSheet) {
      const slice = rows.slice(start, start + perSheet);
      const page = doc.addPage([PAGE.w, PAGE.h]);
      text(page, bold, `${rosterName} · ${spanWords(days[0], days[days.length - 1])}`, PAGE.margin, PAGE.h - PAGE.margin - 12, 13, INK, PAGE.w - 2 * PAGE.margin);
      subLines.push({ page, words: `Run ${shownNumber}${published ? ' · published' : ' · draft, not yet published'}` });
      let y = top;
      // Header row.
      text(page, bold, 'Person', PAGE.margin + 2, y - 13, 8);
      days.forEach((d, i) => {
        const x = PAGE.margin + nameW + i * dayW;
        if (isWeekend(d)) page.drawRectangle({ x, y: y - headH, width: dayW, height: headH, color: hex(gridColors.weekend) });
        const wd = new Date(`${d}T12:00:00Z`).toLocaleDateString('en-GB', { weekday: 'short', timeZone: 'UTC' });
        text(page, bold, `${wd} ${Number(d.slice(8, 10))}`, x + 2, y - 13, 7.5);
      });
      ['Hours', 'Nights', 'Wkend', 'Wishes'].forEach((h, i) => text(page, bold, h, PAGE.margin + nameW + days.length * dayW + i * totalW + 2, y - 13, 7.5));
      y -= headH;
      for (const row of slice) {
        drawRow(page, font, bold, row, days, y, rowH, nameW, dayW, totalW);
        y -= rowH;
      }
      // Foot: seats filled against needed, per skill.
      text(page, bold, 'Filled / needed', PAGE.margin + 2, y - 9, 7);
      days.forEach((d, i) => {
        // "Any" for seats any skill may fill, as on screen; a gap before the next day's column.
        (model.foot.get(d) ?? []).forEach((f, j) => text(page, f.filled < f.needed ? bold : font, `${f.skillId === null ? 'Any' : skillName(f.skillId).slice(0, 8)} ${f.filled}/${f.needed}`, PAGE.margin + nameW + i * dayW + 2, y - 9 - j * 8, 6.5, f.filled < f.needed ? hex(gridColors.breach) : INK, dayW - 6));
      });
      page.drawLine({ start: { x: PAGE.margin, y }, end: { x: PAGE.w - PAGE.margin, y }, thickness: 0.5, color: LINE });
      // Legend and caution.
      let ly = PAGE.margin + caution.length * 9 + 18;
      let lx = PAGE.margin;
      // The screen legend's words: the colour tells when the shift starts, the letters its name.
      const bandWords = { morning: 'starts 04:00-10:59', afternoon: 'starts 11:00-15:59', evening: 'starts 16:00-19:59', night: 'night shift' } as const;
      for (const band of ['morning', 'afternoon', 'evening', 'night'] as const) {
        page.drawRectangle({ x: lx, y: ly - 2, width: 16, height: 9, color: hex(gridColors[band].fill) });
        text(page, bold, 'Ab', lx + 3, ly, 6.5, hex(gridColors[band].ink));
        text(page, font, bandWords[band], lx + 19, ly, 7, SOFT);
        lx += 95;
      }
      text(page, font, "Ab: first letters of the shift's name", lx, ly, 7, SOFT);
      text(page, font, `Away: ${Object.entries(ABSENCE_MARKS).map(([k, m]) => `${m} ${ABSENCE_KIND_WORDS[k as keyof typeof ABSENCE_KIND_WORDS].toLowerCase()}`).join(', ')}. Wishes ${WISH_MARKS.prefer} prefer ${WISH_MARKS.avoid} avoid ${WISH_MARKS.cannot} cannot (* = not honoured). ! = a rule broken or given up.`, PAGE.margin, ly - 12, 7, SOFT);
      caution.forEach((line, i) => text(page, font, line, PAGE.margin, PAGE.margin + (caution.length - 1 - i) * 9, 7));
      if (rows.length === 0) break;
    }
  }
  subLines.forEach(({ page, words }, i) => text(page, font, `${words} · sheet ${i + 1} of ${subLines.length}`, PAGE.margin, PAGE.h - PAGE.margin - 26, 8, SOFT));
  await fixStandardFontWidths(doc, [font, bold]);
  const bytes = await doc.save();
  const slug = rosterName.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'roster';
  return { filename: `${slug}.pdf`, body: Buffer.from(bytes) };
}

function drawRow(page: PDFPage, font: PDFFont, bold: PDFFont, row: GridRow, days: string[], y: number, h: number, nameW: number, dayW: number, totalW: number) {
  const x0 = PAGE.margin;
  page.drawLine({ start: { x: x0, y }, end: { x: PAGE.w - PAGE.margin, y }, thickness: 0.5, color: LINE });
  // Rules broken over the whole period (rest, hours) mark the name, as the print sheet's "!n".
  const note = row.rowBreaches.length ? `!${row.rowBreaches.length}` : '';
  const noteW = note ? bold.widthOfTextAtSize(note, 7) + 3 : 0;
  text(page, bold, row.person.name, x0 + 2, y - h / 2 - 3, 7.5, INK, nameW - 4 - noteW);
  if (note) text(page, bold, note, x0 + nameW - 2 - noteW + 3, y - h / 2 - 3, 7, hex(gridColors.breach));
  days.forEach((d, i) => {
    const cell = row.cells.get(d)!;
    const x = x0 + nameW + i * dayW;
    if (isWeekend(d)) page.drawRectangle({ x, y: y - h, width: dayW, height: h, color: hex(gridColors.weekend) });
    let bx = x + 2;
    for (const s of cell.seats.slice(0, 2)) {
      const band = gridColors[shiftBand(s.shift)];
      page.drawRectangle({ x: bx, y: y - h + 2, width: 15, height: h - 4, color: hex(band.fill) });
      text(page, bold, shiftMark(s.shift.label), bx + 1.5, y - h / 2 - 2.5, 7, hex(band.ink));
      bx += 17;
    }
    if (cell.absence && cell.seats.length === 0) {
      page.drawRectangle({ x: bx, y: y - h + 2, width: 15, height: h - 4, color: hex(gridColors.away.fill) });
      text(page, bold, ABSENCE_MARKS[cell.absence.kind] ?? 'Aw', bx + 1.5, y - h / 2 - 2.5, 7, hex(gridColors.away.ink));
    }
    const wishes = cell.wishes.map((w) => `${WISH_MARKS[w.kind]}${w.honoured ? '' : '*'}`).join('');
    if (wishes) text(page, bold, wishes, x + dayW - 4 - font.widthOfTextAtSize(winAnsi(wishes), 7), y - 8, 7, cell.wishes.every((w) => w.honoured) ? hex(gridColors.honoured) : hex(gridColors.missed));
    if (cell.breaches.length) {
      page.drawRectangle({ x: x + 0.5, y: y - h + 0.5, width: dayW - 1, height: h - 1, borderColor: hex(gridColors.breach), borderWidth: 1 });
      text(page, bold, '!', x + dayW - 6, y - h + 2, 7, hex(gridColors.breach));
    }
  });
  const tx = x0 + nameW + days.length * dayW;
  const r1 = (n: number) => String(Math.round(n * 10) / 10);
  const totals = [`${r1(row.hours)}${row.contractedHours !== null ? `/${r1(row.contractedHours)}` : ''}`, String(row.nights), String(row.weekendShifts), row.wishesTotal ? `${row.wishesHonoured}/${row.wishesTotal}` : '-'];
  totals.forEach((t, i) => text(page, font, t, tx + i * totalW + 2, y - h / 2 - 3, 7, INK, totalW - 3));
}

/** GET /api/rosters/:rosterId/roster.pdf?runId=&days=7|14 */
export function rosterPdfRouter() {
  const r = new ApiRoutes('/rosters');
  r.get('/:rosterId/roster.pdf', COORDINATOR_UP, validate({ params: rosterIdParams, query: rosterPdfQuery }), async (req, res) => {
    const q = req.query as unknown as { runId?: number; days: number };
    // Small grids are drawn at once; large ones by a worker (202, server/exports/jobs.ts).
    await answerExport(req, res, { kind: 'roster-pdf', rosterId: Number(req.params.rosterId), ...(q.runId ? { runId: q.runId } : {}), days: q.days });
  });
  return r.router;
}

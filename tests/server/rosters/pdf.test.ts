import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { inflateSync } from 'node:zlib';
import { PDFArray, PDFDict, PDFDocument, PDFName, PDFNumber, PDFRawStream, type PDFPage } from 'pdf-lib';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { makeApiRoster } from './fixtures';
import { seatsOf } from '../staff/publish-helper';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

// Glyph advances from Adobe's Core 14 AFM files (Helvetica.afm, Helvetica-Bold.afm), in 1/1000 em.
const AFM = {
  Helvetica: { ' ': 278, A: 667, W: 944, i: 222, m: 833, '0': 556 },
  'Helvetica-Bold': { ' ': 278, A: 722, W: 944, i: 278, m: 889, '0': 556 },
} as const;

/** Every text run on a page: its font, size, start x and the WinAnsi string (pdf-lib writes `<hex> Tj`). */
function textRuns(doc: PDFDocument, page: PDFPage): Array<{ font: string; size: number; x: number; text: string }> {
  const contents = page.node.Contents();
  const streams = contents instanceof PDFArray ? contents.asArray().map((r) => doc.context.lookup(r)) : [contents];
  const source = streams
    .map((st) => {
      const raw = st as PDFRawStream;
      const bytes = raw.getContents();
      return Buffer.from(raw.dict.get(PDFName.of('Filter')) ? inflateSync(bytes) : bytes).toString('latin1');
    })
    .join('\n');
  const fonts = page.node.Resources()!.lookup(PDFName.of('Font'), PDFDict);
  const baseFont = (key: string) => (doc.context.lookup(fonts.get(PDFName.of(key))) as PDFDict).get(PDFName.of('BaseFont'))!.toString().slice(1);
  const runs: Array<{ font: string; size: number; x: number; text: string }> = [];
  let font = '';
  let size = 0;
  let x = 0;
  for (const m of source.matchAll(/\/(\S+) ([\d.]+) Tf|([-\d.]+) ([-\d.]+) ([-\d.]+) ([-\d.]+) ([-\d.]+) ([-\d.]+) Tm|<([0-9A-Fa-f]*)> Tj/g)) {
    if (m[1]) (font = baseFont(m[1])), (size = Number(m[2]));
    else if (m[3]) x = Number(m[7]);
    else runs.push({ font, size, x, text: Buffer.from(m[9], 'hex').toString('latin1') });
  }
  return runs;
}

// ISO 216 A4 is 210 × 297 mm; at 72 points to the inch that is 595.28 × 841.89 pt.
const A4_LONG = (297 / 25.4) * 72;
const A4_SHORT = (210 / 25.4) * 72;

const binary = (res: NodeJS.ReadableStream & { setEncoding(e: string): void; on(e: string, f: (c?: string) => void): void }, done: (err: Error | null, body: Buffer) => void) => {
  res.setEncoding('binary');
  let data = '';
  res.on('data', (c) => (data += c));
  res.on('end', () => done(null, Buffer.from(data, 'binary')));
};

/**
 * The roster grid as a PDF (issue 20): A4 landscape, a page per week or per fortnight. The file
 * is read back with pdf-lib's parser and its page sizes checked against ISO 216.
 */
describe('roster PDF', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let coordinator: Agent;
  let rosterId: number;
  let runId: number;

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Thornwick Court');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    // Three weeks (1–21 March 2027), a day shift on weekdays.
    const { roster, people } = await makeApiRoster(coordinator, workspace, {
      periodStart: '2027-03-01',
      periodEnd: '2027-03-21',
      patterns: [{ label: 'day', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '08:00', endTime: '16:00', seats: [{ skillId: null, count: 1 }] }],
    });
    rosterId = roster.id;
    const seats = await seatsOf(workspace.id, rosterId);
    const current = (await coordinator.get(`/api/rosters/${rosterId}`)).body;
    // Six people take the weekdays in turn, so nobody breaks a rest rule.
    const assignment = Object.fromEntries(seats.map((s, i) => [String(s.seatId), people[i % people.length].id]));
    const saved = await coordinator.post(`/api/rosters/${rosterId}/manual-runs`).send({ assignment, version: current.version });
    expect(saved.status, JSON.stringify(saved.body)).toBe(201);
    runId = saved.body.runId;
  });
  afterAll(async () => {
    await db.drop();
  });

  const fetchPdf = (query: string) => coordinator.get(`/api/rosters/${rosterId}/roster.pdf?${query}`).buffer(true).parse(binary as never);

  it.each([
    [7, 3],
    [14, 2],
  ])('a page per %i days: %i A4 landscape pages for three weeks', async (days, pages) => {
    const res = await fetchPdf(`runId=${runId}&days=${days}`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/pdf/);
    const body = res.body as Buffer;
    expect(body.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const doc = await PDFDocument.load(body);
    // 21 days in pages of `days` (the roster has 6 people: one sheet per page span).
    expect(Math.ceil(21 / days)).toBe(pages);
    expect(doc.getPageCount()).toBe(pages);
    for (const page of doc.getPages()) {
      const { width, height } = page.getSize();
      expect(width).toBeCloseTo(A4_LONG, 0);
      expect(height).toBeCloseTo(A4_SHORT, 0);
    }
    expect(doc.getTitle()).toMatch(/Test roster/);
  });

  it('carries Helvetica\'s own glyph widths, keeps every line inside the margins and says the period and sheet in words', async () => {
    const res = await fetchPdf(`runId=${runId}&days=7`);
    const doc = await PDFDocument.load(res.body as Buffer);
    const page = doc.getPage(0);
    const fonts = page.node.Resources()!.lookup(PDFName.of('Font'), PDFDict);
    const widthTables = new Map<string, number[]>();
    for (const key of fonts.keys()) {
      const dict = doc.context.lookup(fonts.get(key)) as PDFDict;
      const name = dict.get(PDFName.of('BaseFont'))!.toString().slice(1) as keyof typeof AFM;
      // Without /Widths a viewer lacking Helvetica spaces the text with its stand-in font's advances.
      expect((dict.get(PDFName.of('FirstChar')) as PDFNumber).asNumber()).toBe(32);
      const widths = (dict.lookup(PDFName.of('Widths'), PDFArray)).asArray().map((n) => (n as PDFNumber).asNumber());
      expect(widths).toHaveLength(255 - 32 + 1);
      for (const [ch, w] of Object.entries(AFM[name])) expect(widths[ch.charCodeAt(0) - 32], `${name} ${ch}`).toBe(w);
      widthTables.set(name, widths);
    }
    expect([...widthTables.keys()].sort()).toEqual(['Helvetica', 'Helvetica-Bold']);

    const runs = textRuns(doc, page);
    const right = page.getWidth() - 24;
    for (const r of runs) {
      const widths = widthTables.get(r.font)!;
      const w = [...r.text].reduce((sum, c) => sum + widths[c.charCodeAt(0) - 32], 0) * (r.size / 1000);
      expect(r.x + w, r.text).toBeLessThanOrEqual(right + 0.01);
    }
    const all = runs.map((r) => r.text);
    // 1 March 2027 is a Monday (ISO 8601 week 2027-W09).
    expect(all.some((t) => / · Mon 1 Mar - Sun 7 Mar 2027$/.test(t))).toBe(true);
    expect(all.some((t) => /^Run 1 · draft, not yet published · sheet 1 of 3$/.test(t))).toBe(true);
    expect(all.some((t) => t.startsWith('Rosters affect rest and fatigue.'))).toBe(true);
  });

  it('names the field for a bad page span or run, and 404s another workspace’s roster', async () => {
    const span = await coordinator.get(`/api/rosters/${rosterId}/roster.pdf?runId=${runId}&days=10`);
    expect(span.status).toBe(400);
    expect(span.body.error.fields[0].path).toBe('query.days');
    const run = await coordinator.get(`/api/rosters/${rosterId}/roster.pdf?runId=999999`);
    expect(run.status).toBe(404);
    expect(run.body.error.fields[0].path).toBe('query.runId');
    const stranger = (await signedIn(app, await makeWorkspace('Far Fold'), 'coordinator')).agent;
    expect((await stranger.get(`/api/rosters/${rosterId}/roster.pdf?runId=${runId}`)).status).toBe(404);
  });
});

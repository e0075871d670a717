import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { PDFDocument } from 'pdf-lib';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import type { Workspace } from '../../../server/db/models';
import { makeApiRoster } from './fixtures';
import { seatsOf } from '../staff/publish-helper';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

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

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { Worker } from 'bullmq';
import { PDFDocument } from 'pdf-lib';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { makeApiRoster } from '../rosters/fixtures';
import { publishDirectly, seatsOf } from '../staff/publish-helper';
import { waitFor } from '../queue/helpers';
import { Person, type Workspace } from '../../../server/db/models';
import { AssignmentRow, Roster, RunRow, SeatRow, ShiftRow } from '../../../server/rosters/models';
import { ExportFile } from '../../../server/exports/models';
import { EXPORT_JOB_FROM } from '../../../server/exports/files';
import { reconcileExports } from '../../../server/exports/jobs';
import { EXPORTS_QUEUE, NO_WORKER_RETRY_AFTER_S, exportJobId, queueSettings, queues } from '../../../server/queue/queues';
import { workerOptions } from '../../../server/queue/connection';
import { RunWorker } from '../../../server/runs/worker';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];
type Res = { status: number; headers: Record<string, string>; body: any };

const binary = (res: NodeJS.ReadableStream & { setEncoding(e: string): void; on(e: string, f: (c?: string) => void): void }, done: (err: Error | null, body: Buffer) => void) => {
  res.setEncoding('binary');
  let data = '';
  res.on('data', (c) => (data += c));
  res.on('end', () => done(null, Buffer.from(data, 'binary')));
};

const addDays = (iso: string, n: number) => new Date(Date.parse(`${iso}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

/** A finished, published roster of `people` × `days` written straight to the tables (the API would take minutes); one day shift of `seats` seats a day. */
async function bigRoster(workspace: Workspace, people: number, days: number, seats: number) {
  const persons = await Person.bulkCreate(Array.from({ length: people }, (_, i) => ({ workspaceId: workspace.id, name: `Wren ${String(i).padStart(3, '0')} Ashdown`, contractedHours: 30, skills: [] })) as never[]);
  const roster = await Roster.create({ workspaceId: workspace.id, name: 'Long roster', periodStart: '2027-03-01', periodEnd: addDays('2027-03-01', days - 1), timeZone: 'Europe/London', rules: { rules: [] } as never });
  const shifts = await ShiftRow.bulkCreate(Array.from({ length: days }, (_, d) => ({ workspaceId: workspace.id, rosterId: roster.id, label: 'day', startsLocal: `${addDays('2027-03-01', d)}T08:00:00`, endsLocal: `${addDays('2027-03-01', d)}T16:00:00` })));
  const seatRows = await SeatRow.bulkCreate(shifts.flatMap((s) => Array.from({ length: seats }, (_, position) => ({ workspaceId: workspace.id, shiftId: s.id, skillId: null, position }))));
  const { runId } = await publishDirectly(workspace.id, roster.id, seatRows.map((s, i) => ({ seatId: s.id, personId: persons[i % persons.length].id })));
  return { rosterId: roster.id, runId, people: persons };
}

/**
 * Large exports as worker jobs (issue 15). What the job path hands over is compared byte for byte
 * with what the API process itself writes for the same request (the sync path, unchanged since
 * before the jobs): the worker must not make a different file. The PDF is also read back with
 * pdf-lib's parser, and the 202 / Location / Preference-Applied answers are those of RFC 9110
 * §15.3.3 and RFC 7240 §4.1.
 */
describe('exports as jobs', () => {
  let db: TestDb;
  let app: Express;
  let workspace: Workspace;
  let other: Workspace;
  let coordinator: Agent;
  let otherCoordinator: Agent;
  let rosterId: number;
  let runId: number;
  let people: Array<{ id: number; name: string }>;
  let worker: RunWorker | null = null;

  const get = (a: Agent, url: string, prefer = false) => {
    const req = a.get(url).buffer(true).parse(binary as never);
    return (prefer ? req.set('Prefer', 'respond-async') : req) as unknown as Promise<Res>;
  };
  const json = (res: Res) => JSON.parse((res.body as Buffer).toString('utf8'));

  /** Follows a 202 to the file, as the web client does: reads the status until done, then fetches the file. */
  const follow = async (a: Agent, accepted: Res) => {
    expect(accepted.status).toBe(202);
    const location = accepted.headers.location;
    expect(location).toMatch(/^\/api\/exports\/\d+$/);
    const done = await waitFor(`export ${location}`, async () => {
      const s = (await a.get(location)).body.export;
      return s.status === 'done' || s.status === 'failed' ? s : null;
    }, 60_000, 100);
    return { status: done, file: done.status === 'done' ? await get(a, done.fileUrl) : null };
  };

  const startWorker = async () => {
    worker = new RunWorker(db.sequelize, { name: 'export-worker', capDelayMs: 200 });
    worker.startCompute();
    await worker.ready();
  };
  const stopWorker = async () => {
    await worker?.stop();
    worker = null;
  };

  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
    workspace = await makeWorkspace('Fernhollow Lodge');
    other = await makeWorkspace('Saltmarsh Rise');
    coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
    otherCoordinator = (await signedIn(app, other, 'coordinator')).agent;
    const fixture = await makeApiRoster(coordinator, workspace, { people: 4, periodStart: '2027-03-01', periodEnd: '2027-03-14' });
    rosterId = fixture.roster.id;
    people = fixture.people;
    const seats = await seatsOf(workspace.id, rosterId);
    runId = (await publishDirectly(workspace.id, rosterId, seats.map((s, i) => ({ seatId: s.seatId, personId: people[i % people.length].id })))).runId;
  });
  afterAll(async () => {
    await stopWorker();
    await db.drop();
  });

  it('no worker: a job answers 503 with Retry-After and words, and writes nothing; a small file is still sent at once', { timeout: 60_000 }, async () => {
    const refused = await get(coordinator, `/api/rosters/${rosterId}/roster.pdf?runId=${runId}`, true);
    expect(refused.status).toBe(503);
    expect(refused.headers['retry-after']).toBe(String(NO_WORKER_RETRY_AFTER_S));
    expect(json(refused).error.code).toBe('unavailable');
    expect(json(refused).error.message).toMatch(/No worker is running just now to prepare a file this large/);
    expect(await ExportFile.count()).toBe(0);
    const small = await get(coordinator, `/api/rosters/${rosterId}/roster.pdf?runId=${runId}`);
    expect(small.status).toBe(200);
    expect(small.headers['content-type']).toMatch(/^application\/pdf/);
  });

  it('the worker writes the same bytes and headers the API process writes, for every kind of export', { timeout: 120_000 }, async () => {
    await startWorker();
    const urls = [
      `/api/rosters/${rosterId}/roster.pdf?runId=${runId}&days=7`,
      `/api/rosters/${rosterId}/roster.pdf?days=14`,
      `/api/rosters/${rosterId}/roster.csv`,
      `/api/rosters/${rosterId}/roster.ics`,
      `/api/rosters/${rosterId}/roster.csv?runId=${runId}&personId=${people[1].id}`,
      `/api/rosters/${rosterId}/roster.ics?personId=${people[2].id}`,
      '/api/people/export',
    ];
    for (const url of urls) {
      const sync = await get(coordinator, url);
      expect(sync.status, url).toBe(200);
      const accepted = await get(coordinator, url, true);
      expect(accepted.headers['preference-applied']).toBe('respond-async');
      const { status, file } = await follow(coordinator, accepted);
      expect(status.status, `${url}: ${status.error}`).toBe('done');
      expect(file!.status).toBe(200);
      expect(file!.headers['content-type'], url).toBe(sync.headers['content-type']);
      expect(file!.headers['content-disposition'], url).toBe(sync.headers['content-disposition']);
      expect((file!.body as Buffer).equals(sync.body as Buffer), `${url}: the job's file differs from the API's`).toBe(true);
      expect(status.bytes).toBe((sync.body as Buffer).length);
    }
    // The PDF is a real one: pdf-lib reads it back, dated by the run, not by the clock.
    const pdf = await PDFDocument.load((await get(coordinator, `/api/rosters/${rosterId}/roster.pdf?runId=${runId}`)).body as Buffer);
    expect(pdf.getCreationDate()?.getTime()).toBe(Math.floor(new Date((await RunRow.findByPk(runId))!.updatedAt).getTime() / 1000) * 1000);
  });

  it('a published roster’s CSV and iCalendar stay byte-identical through a job after a person is renamed (issue 13)', { timeout: 60_000 }, async () => {
    const before = [await get(coordinator, `/api/rosters/${rosterId}/roster.csv`), await get(coordinator, `/api/rosters/${rosterId}/roster.ics`)];
    await Person.update({ name: 'Renamed Afterwards' }, { where: { id: people[0].id } });
    for (const [i, url] of [`/api/rosters/${rosterId}/roster.csv`, `/api/rosters/${rosterId}/roster.ics`].entries()) {
      const { file } = await follow(coordinator, await get(coordinator, url, true));
      expect((file!.body as Buffer).equals(before[i].body as Buffer)).toBe(true);
      expect((file!.body as Buffer).toString('utf8')).not.toMatch(/Renamed Afterwards/);
    }
  });

  it('a large roster goes to the worker without being asked; a small one does not', { timeout: 180_000 }, async () => {
    // 30 people × 70 days: 2,100 person-days on the grid (threshold 2,000) and 72 seats a day: 5,040 lines (threshold 5,000).
    expect(30 * 70).toBeGreaterThanOrEqual(EXPORT_JOB_FROM['roster-pdf'].size);
    expect(72 * 70).toBeGreaterThanOrEqual(EXPORT_JOB_FROM['roster-csv'].size);
    const big = await bigRoster(workspace, 30, 70, 72);
    for (const url of [`/api/rosters/${big.rosterId}/roster.pdf?runId=${big.runId}`, `/api/rosters/${big.rosterId}/roster.csv`, `/api/rosters/${big.rosterId}/roster.ics?runId=${big.runId}`]) {
      const accepted = await get(coordinator, url);
      expect(accepted.status, url).toBe(202);
      expect(accepted.headers['preference-applied']).toBeUndefined();
      const body = json(accepted);
      expect(body.location).toBe(accepted.headers.location);
      expect(body.size.value).toBeGreaterThanOrEqual(2000);
      const { status, file } = await follow(coordinator, accepted);
      expect(status.status, status.error).toBe('done');
      if (url.includes('.pdf')) expect((await PDFDocument.load(file!.body as Buffer)).getPageCount()).toBeGreaterThanOrEqual(10);
      if (url.includes('.csv')) expect((file!.body as Buffer).toString('utf8').trimEnd().split('\r\n')).toHaveLength(72 * 70 + 1);
      if (url.includes('.ics')) expect((file!.body as Buffer).toString('utf8').match(/BEGIN:VEVENT/g)).toHaveLength(70);
    }
    // The small roster's files never went through a job.
    const jobs = await ExportFile.count();
    expect((await get(coordinator, `/api/rosters/${rosterId}/roster.csv`)).status).toBe(200);
    expect(await ExportFile.count()).toBe(jobs);
  });

  it('bad ids are 4xx naming the field on both paths, never a 5xx', { timeout: 60_000 }, async () => {
    for (const prefer of [false, true]) {
      const pdf = await get(coordinator, `/api/rosters/${rosterId}/roster.pdf?runId=999999`, prefer);
      expect(pdf.status).toBe(404);
      expect(json(pdf).error.fields[0].path).toBe('query.runId');
      const person = await get(coordinator, `/api/rosters/${rosterId}/roster.ics?personId=999999`, prefer);
      expect(person.status).toBe(404);
      expect(json(person).error.fields[0].path).toBe('query.personId');
      expect((await get(coordinator, `/api/rosters/999999/roster.csv`, prefer)).status).toBe(404);
      expect((await get(otherCoordinator, `/api/rosters/${rosterId}/roster.pdf`, prefer)).status).toBe(404);
      expect((await get(coordinator, `/api/rosters/${rosterId}/roster.csv?runId=x`, prefer)).status).toBe(400);
    }
    const mine = json(await get(coordinator, `/api/rosters/${rosterId}/roster.csv`, true)).export.id as number;
    expect((await coordinator.get('/api/exports/abc')).status).toBe(400);
    expect((await coordinator.get('/api/exports/0')).status).toBe(400);
    const unknown = await coordinator.get('/api/exports/999999');
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.fields[0].path).toBe('params.id');
    expect((await coordinator.get('/api/exports/999999/file')).status).toBe(404);
    // Another workspace's export is a 404, status and file.
    expect((await otherCoordinator.get(`/api/exports/${mine}`)).status).toBe(404);
    expect((await otherCoordinator.get(`/api/exports/${mine}/file`)).status).toBe(404);
  });

  it('a job that fails says why in words; its file is a 422 with those words; one still waiting is a 409', { timeout: 60_000 }, async () => {
    await stopWorker();
    // A worker that is counted but takes nothing, so the export is accepted and waits.
    const { url, prefix } = queueSettings(db.sequelize);
    const idle = new Worker(EXPORTS_QUEUE, undefined, { connection: workerOptions(url), prefix, autorun: false, name: 'idle' });
    await idle.waitUntilReady();
    const seats = await seatsOf(workspace.id, rosterId);
    const doomed = await publishDirectly(workspace.id, rosterId, seats.map((s, i) => ({ seatId: s.seatId, personId: people[(i + 1) % people.length].id })));
    const accepted = await get(coordinator, `/api/rosters/${rosterId}/roster.pdf?runId=${doomed.runId}`, true);
    expect(accepted.status).toBe(202);
    const id = json(accepted).export.id as number;
    const waiting = await coordinator.get(`/api/exports/${id}/file`);
    expect(waiting.status).toBe(409);
    expect(waiting.body.error.message).toMatch(/still being prepared/);
    // The run goes before a worker gets to it.
    await AssignmentRow.destroy({ where: { runId: doomed.runId } });
    await Roster.update({ publishedRunId: runId }, { where: { id: rosterId } });
    await RunRow.destroy({ where: { id: doomed.runId } });
    await idle.close();
    await startWorker();
    const failed = await waitFor('the export to fail', async () => {
      const s = (await coordinator.get(`/api/exports/${id}`)).body.export;
      return s.status === 'failed' ? s : null;
    });
    expect(failed.error).toBe('Run not found for this roster');
    const file = await coordinator.get(`/api/exports/${id}/file`);
    expect(file.status).toBe(422);
    expect(file.body.error.message).toBe('The file could not be prepared: Run not found for this roster');
  });

  it('a file still waiting when the last worker leaves is failed in words, not left waiting', { timeout: 60_000 }, async () => {
    await stopWorker();
    const { url, prefix } = queueSettings(db.sequelize);
    const idle = new Worker(EXPORTS_QUEUE, undefined, { connection: workerOptions(url), prefix, autorun: false, name: 'idle-2' });
    await idle.waitUntilReady();
    const accepted = await get(coordinator, `/api/rosters/${rosterId}/roster.ics?runId=${runId}&personId=${people[3].id}`, true);
    const id = json(accepted).export.id as number;
    await idle.close();
    const s = (await coordinator.get(`/api/exports/${id}`)).body.export;
    expect(s.status).toBe('failed');
    expect(s.error).toMatch(/No worker was left to prepare this file/);
    expect(await queues(db.sequelize).exports.getJob(exportJobId(id))).toBeUndefined();
  });

  it('the same file asked twice while waiting is one job; the reconciler adds a lost job and deletes expired files', { timeout: 60_000 }, async () => {
    const { url, prefix } = queueSettings(db.sequelize);
    const idle = new Worker(EXPORTS_QUEUE, undefined, { connection: workerOptions(url), prefix, autorun: false, name: 'idle-3' });
    await idle.waitUntilReady();
    const a = json(await get(coordinator, `/api/rosters/${rosterId}/roster.csv?runId=${runId}`, true)).export.id;
    const b = json(await get(coordinator, `/api/rosters/${rosterId}/roster.csv?runId=${runId}`, true)).export.id;
    expect(b).toBe(a);
    // Redis loses the job: the reconciler gives the row a new one, and a worker makes the file.
    await (await queues(db.sequelize).exports.getJob(exportJobId(a)))!.remove();
    const report = await reconcileExports(db.sequelize);
    expect(report.enqueued).toContain(a);
    await idle.close();
    await startWorker();
    await waitFor('the reconciled export', async () => (await ExportFile.findByPk(a))?.status === 'done');
    await ExportFile.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: a } });
    expect((await reconcileExports(db.sequelize)).expired).toBeGreaterThanOrEqual(1);
    expect((await coordinator.get(`/api/exports/${a}`)).status).toBe(404);
  });

  it('fairness as for runs: another workspace’s first file goes ahead of one workspace’s second, and a Starter workspace makes one at a time', { timeout: 120_000 }, async () => {
    await stopWorker();
    const { url, prefix } = queueSettings(db.sequelize);
    const idle = new Worker(EXPORTS_QUEUE, undefined, { connection: workerOptions(url), prefix, autorun: false, name: 'idle-4' });
    await idle.waitUntilReady();
    // The flood comes from a workspace on the Starter plan (one job at a time); the quiet one is the team-plan workspace.
    const starter = await makeWorkspace('Brackenfold Row', { plan: 'free' });
    const starterCoordinator = (await signedIn(app, starter, 'coordinator')).agent;
    const s = await makeApiRoster(starterCoordinator, starter, { people: 4 });
    const sSeats = await seatsOf(starter.id, s.roster.id);
    const sRun = await publishDirectly(starter.id, s.roster.id, sSeats.map((seat, i) => ({ seatId: seat.seatId, personId: s.people[i % 4].id })));
    // Three different files from one workspace first, then one from the other.
    const flood = [];
    for (const days of [7, 14]) flood.push(json(await get(starterCoordinator, `/api/rosters/${s.roster.id}/roster.pdf?runId=${sRun.runId}&days=${days}`, true)).export.id as number);
    flood.push(json(await get(starterCoordinator, `/api/rosters/${s.roster.id}/roster.ics?runId=${sRun.runId}`, true)).export.id as number);
    const quiet = json(await get(coordinator, `/api/rosters/${rosterId}/roster.pdf?runId=${runId}&days=14`, true)).export.id as number;
    // BullMQ takes the lowest priority first: 1 + the workspace's files already waiting (as runPriority for runs).
    const priorities = await Promise.all([...flood, quiet].map(async (id) => (await queues(db.sequelize).exports.getJob(exportJobId(id)))!.opts.priority));
    expect(priorities).toEqual([1, 2, 3, 1]);
    await idle.close();
    // Two workers: without the cap both would make two of the flood's files at once.
    const second = new RunWorker(db.sequelize, { name: 'export-worker-2', capDelayMs: 200 });
    await startWorker();
    second.startCompute();
    try {
      await second.ready();
      const ids = [...flood, quiet];
      await waitFor('all four files', async () => (await ExportFile.count({ where: { id: ids, status: 'done' } })) === 4, 60_000);
      const rows = new Map((await ExportFile.findAll({ where: { id: ids } })).map((r) => [r.id, r]));
      const at = (id: number, k: 'startedAt' | 'finishedAt') => new Date(rows.get(id)![k]!).getTime();
      // Priority: the quiet workspace's first file (priority 1) started before the flood's last (priority 3).
      expect(at(quiet, 'startedAt')).toBeLessThan(at(flood[2], 'startedAt'));
      // The Starter plan's cap of one at a time: each flood file started after the one before it had finished.
      const byStart = [...flood].sort((x, y) => at(x, 'startedAt') - at(y, 'startedAt'));
      for (let i = 1; i < byStart.length; i++) expect(at(byStart[i], 'startedAt')).toBeGreaterThanOrEqual(at(byStart[i - 1], 'finishedAt'));
    } finally {
      await second.stop();
    }
  });
});

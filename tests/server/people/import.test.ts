import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import type { Express } from 'express';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { Person, Skill, type Workspace } from '../../../server/db/models';

type Agent = Awaited<ReturnType<typeof signedIn>>['agent'];

const HEADER = 'name,email,contracted_hours,skills\n';
const upload = (a: Agent, step: 'preview' | 'commit', content: string | Buffer, fileName = 'people.csv') =>
  a.post(`/api/people/import/${step}`).attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), { filename: fileName, contentType: 'text/csv' });

/** A fresh workspace per test, so counts are exact. */
async function setup(app: Express) {
  const workspace = await makeWorkspace('Hazel Row Clinic');
  const { agent } = await signedIn(app, workspace, 'coordinator');
  for (const name of ['First aid', 'Medication round', 'Night lead']) await Skill.create({ workspaceId: workspace.id, name });
  return { workspace, agent };
}
const count = (w: Workspace) => Person.count({ where: { workspaceId: w.id } });

describe('people CSV import and export', () => {
  let db: TestDb;
  let app: Express;
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('previews what a file would do without writing anything, then commits it', async () => {
    const { workspace, agent } = await setup(app);
    const file = `${HEADER}Ada Quill,ada@example.test,37.5,First aid;medication round\nBrin Tallow,,20,\n"Corra Vane",corra@example.test,0,Night lead\n`;
    const preview = await upload(agent, 'preview', file);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ rows: 3, counts: { create: 3, update: 0, unchanged: 0, error: 0 }, canCommit: true, errors: [] });
    expect(preview.body.items[0]).toMatchObject({ row: 2, action: 'create', name: 'Ada Quill', email: 'ada@example.test', contractedHours: 37.5, skills: ['First aid', 'medication round'] });
    expect(await count(workspace)).toBe(0);

    const commit = await upload(agent, 'commit', file);
    expect(commit.status).toBe(201);
    expect(commit.body).toMatchObject({ committed: true, counts: { create: 3 } });
    const people = await agent.get('/api/people?sort=name');
    expect(people.body.items.map((p: { name: string }) => p.name)).toEqual(['Ada Quill', 'Brin Tallow', 'Corra Vane']);
    const skills = await Skill.findAll({ where: { workspaceId: workspace.id } });
    const id = (n: string) => skills.find((s) => s.name === n)!.id;
    expect(people.body.items[0]).toMatchObject({ contractedHours: 37.5, email: 'ada@example.test', skillIds: [id('First aid'), id('Medication round')] });
    expect(people.body.items[1]).toMatchObject({ email: null, skillIds: [] });
  });

  it('reports each bad row in words and, on commit, creates nobody (all or nothing)', async () => {
    const { workspace, agent } = await setup(app);
    const file = `${HEADER}Ada Quill,ada@example.test,37.5,First aid\nBrin Tallow,,20,fist aid\nCorra Vane,not-an-address,ten,\nDell Moss,,200,\n,,12,\nAda Quill,,30,\n`;
    const preview = await upload(agent, 'preview', file);
    expect(preview.status).toBe(200);
    expect(preview.body.canCommit).toBe(false);
    expect(preview.body.counts).toEqual({ create: 1, update: 0, unchanged: 0, error: 5 });
    const messages = preview.body.errors.map((e: { message: string }) => e.message);
    expect(messages).toEqual([
      "row 3: unknown skill 'fist aid' (did you mean 'First aid'?)",
      'row 4: contracted_hours "ten" is not a number of hours',
      'row 4: email: This is not an e-mail address',
      'row 5: contracted_hours: A week has 168 hours',
      'row 6: name: the name is empty',
      "row 7: 'Ada Quill' is also on row 2; each person may appear once per file",
    ]);
    const commit = await upload(agent, 'commit', file);
    expect(commit.status).toBe(422);
    expect(commit.body.error.message).toMatch(/5 rows have errors; nothing was imported/);
    expect(commit.body.error.fields[0]).toEqual({ path: 'file.row.3', message: "row 3: unknown skill 'fist aid' (did you mean 'First aid'?)" });
    expect(await count(workspace)).toBe(0);
  });

  it('updates people it already knows by name, leaves the same ones alone, and bumps their version', async () => {
    const { workspace, agent } = await setup(app);
    const first = await upload(agent, 'commit', `${HEADER}Ada Quill,ada@example.test,37.5,First aid\nBrin Tallow,,20,\n`);
    expect(first.status).toBe(201);
    const before = await Person.findOne({ where: { workspaceId: workspace.id, name: 'Ada Quill' } });
    const second = `${HEADER}ada quill,ada@example.test,30,First aid;Night lead\nBrin Tallow,,20,\nEvan Pell,,16,\n`;
    const preview = await upload(agent, 'preview', second);
    expect(preview.body.counts).toEqual({ create: 1, update: 1, unchanged: 1, error: 0 });
    expect(preview.body.items[0]).toMatchObject({ action: 'update', personId: before!.id, changes: ['name "Ada Quill" → "ada quill"', 'hours 37.5 → 30', 'skills First aid → First aid; Night lead'] });
    expect((await upload(agent, 'commit', second)).status).toBe(201);
    const after = await Person.findByPk(before!.id);
    expect(after).toMatchObject({ name: 'ada quill', contractedHours: 30, version: before!.version + 1 });
    expect(await count(workspace)).toBe(3);
    // A stale form save after the import is refused, not silently overwriting it.
    const stale = await agent.patch(`/api/people/${before!.id}`).send({ version: before!.version, contractedHours: 10 });
    expect(stale.status).toBe(409);
  });

  it('imports a good file of 500 rows in one go', async () => {
    const { workspace, agent } = await setup(app);
    let file = HEADER;
    for (let i = 1; i <= 500; i++) file += `Person ${String(i).padStart(3, '0')},p${i}@example.test,${(i % 40) + 0.5},${i % 3 === 0 ? 'First aid;Night lead' : ''}\n`;
    const started = Date.now();
    const res = await upload(agent, 'commit', file);
    const ms = Date.now() - started;
    expect(res.status).toBe(201);
    expect(res.body.counts.create).toBe(500);
    expect(await count(workspace)).toBe(500);
    expect((await agent.get('/api/people?pageSize=1')).body.total).toBe(500);
    console.log(`[import] 500 rows committed in ${ms} ms`);
    expect(ms).toBeLessThan(10_000);
  });

  it('refuses a file of 10,000 rows quickly with the limit in words, and imports nobody', async () => {
    const { workspace, agent } = await setup(app);
    let file = HEADER;
    for (let i = 1; i <= 10_000; i++) file += `Person ${i},,30,\n`;
    const started = Date.now();
    const res = await upload(agent, 'commit', file);
    const ms = Date.now() - started;
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe('The file has more than 5,000 people rows; nothing was imported. Split it into files of at most 5,000 rows.');
    expect(await count(workspace)).toBe(0);
    console.log(`[import] 10,000-row file refused in ${ms} ms`);
    expect(ms).toBeLessThan(5_000);
  });

  it('accepts exactly 5,000 rows, previews and imports them fast', async () => {
    const { agent } = await setup(app);
    let file = HEADER;
    for (let i = 1; i <= 5000; i++) file += `Person ${i},,30,First aid\n`;
    const started = Date.now();
    const res = await upload(agent, 'preview', file);
    const ms = Date.now() - started;
    expect(res.status).toBe(200);
    expect(res.body.counts.create).toBe(5000);
    console.log(`[import] 5,000-row preview in ${ms} ms`);
    expect(ms).toBeLessThan(5_000);
    const commitStarted = Date.now();
    const committed = await upload(agent, 'commit', file);
    const commitMs = Date.now() - commitStarted;
    expect(committed.status).toBe(201);
    expect((await agent.get('/api/people?pageSize=1')).body.total).toBe(5000);
    console.log(`[import] 5,000-row commit in ${commitMs} ms`);
    expect(commitMs).toBeLessThan(10_000);
  });

  it.each([
    ['an empty file', Buffer.alloc(0), 'people.csv', 422, /^The file is empty/],
    ['only blank lines', Buffer.from('\n\n  \n'), 'people.csv', 422, /^The file is empty/],
    ['a header with no people', Buffer.from(HEADER), 'people.csv', 422, /header row but no people/],
    // A real PNG signature (PNG spec, section 5.2) followed by binary chunk data.
    ['a PNG picture', Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52]), 'people.png', 422, /not a CSV file: it contains binary data/],
    // .xlsx files are ZIP archives: local file header signature PK\x03\x04 (APPNOTE.TXT 4.3.7).
    ['a spreadsheet (.xlsx)', Buffer.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0, 0x06, 0]), 'people.xlsx', 422, /spreadsheet or other zipped file, not CSV/],
    ['UTF-16 text', Buffer.from(`\uFEFF${HEADER}`, 'utf16le'), 'people.csv', 422, /saved as UTF-16/],
    // "Zoë" in Windows-1252: ë is the single byte 0xEB, never valid on its own in UTF-8 (RFC 3629, section 3).
    ['Windows-1252 text', Buffer.concat([Buffer.from(`${HEADER}Ada Quill,,30,\nZo`), Buffer.from([0xeb]), Buffer.from(' Hart,,20,\n')]), 'people.csv', 422, /not valid UTF-8 text \(first on line 3\)/],
    ['a missing required column', Buffer.from('name,email\nAda Quill,ada@example.test\n'), 'people.csv', 422, /Missing column "contracted_hours" in the header row/],
    ['an unknown column', Buffer.from('name,contracted_hours,phone\nAda Quill,30,0123\n'), 'people.csv', 422, /Unknown column "phone" in the header row/],
    ['a repeated column', Buffer.from('name,contracted_hours,name\nAda Quill,30,Ada\n'), 'people.csv', 422, /"name" appears twice/],
    ['a quote never closed', Buffer.from(`${HEADER}"Ada Quill,,30,\nBrin,,20,\n`), 'people.csv', 422, /not valid CSV near line \d+: a quoted cell is never closed/],
  ])('refuses %s with a clear message and imports nobody', async (_label, content, fileName, status, message) => {
    const { workspace, agent } = await setup(app);
    for (const step of ['preview', 'commit'] as const) {
      const res = await upload(agent, step, content, fileName);
      expect(res.status).toBe(status);
      expect(res.body.error.message).toMatch(message);
      expect(res.body.error.fields[0].path).toMatch(/^file/);
    }
    expect(await count(workspace)).toBe(0);
  });

  it('answers a file over 5 MB with 413 and the limit in words', async () => {
    const { workspace, agent } = await setup(app);
    const row = 'Person with a long name,,30,\n';
    const big = Buffer.from(HEADER + row.repeat(Math.ceil((5 * 1024 * 1024 + 10) / row.length)));
    const res = await upload(agent, 'commit', big);
    expect(res.status).toBe(413);
    expect(res.body.error).toMatchObject({ code: 'payload_too_large', message: expect.stringMatching(/larger than 5 MB/) });
    expect(await count(workspace)).toBe(0);
  });

  it('asks for a file when none is sent, or one is sent in another field', async () => {
    const { agent } = await setup(app);
    const none = await agent.post('/api/people/import/preview').send({});
    expect(none.status).toBe(400);
    expect(none.body.error.message).toMatch(/Choose a CSV file/);
    const wrongField = await agent.post('/api/people/import/preview').attach('upload', Buffer.from(HEADER), 'people.csv');
    expect(wrongField.status).toBe(400);
    expect(wrongField.body.error.fields[0].path).toBe('body.upload');
  });

  it('reads semicolon-separated files as some spreadsheet programs write them', async () => {
    const { agent } = await setup(app);
    const res = await upload(agent, 'preview', 'Name;Contracted hours;Skills\nAda Quill;37,5;"First aid;Night lead"\n');
    expect(res.status).toBe(200);
    expect(res.body.delimiter).toBe(';');
    expect(res.body.items[0]).toMatchObject({ name: 'Ada Quill', contractedHours: 37.5, skills: ['First aid', 'Night lead'], action: 'create' });
  });

  it('exports RFC 4180 CSV: commas and quotes quoted, quotes doubled, CRLF lines, UTF-8', async () => {
    const { workspace, agent } = await setup(app);
    const skills = await Skill.findAll({ where: { workspaceId: workspace.id }, order: [['name', 'ASC']] });
    await agent.post('/api/people').send({ name: 'Quill, "Ada" Jr', email: 'ada@example.test', contractedHours: 37.5, skillIds: [skills[0].id, skills[2].id] });
    await agent.post('/api/people').send({ name: 'Zoë Hart', contractedHours: 0, skillIds: [] });
    await agent.post('/api/people').send({ name: '=SUM(A1:A9)', contractedHours: 8, skillIds: [] });
    const res = await agent.get('/api/people/export').buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe('attachment; filename="people.csv"');
    const bytes = res.body as Buffer;
    // UTF-8 byte order mark, then UTF-8 text (ë is C3 AB).
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(3));
    // RFC 4180 section 2, rules 2, 6 and 7: CRLF line breaks; a field with a comma or quote is quoted and its quotes doubled.
    expect(text).toBe(
      'name,email,contracted_hours,skills\r\n' +
        "'=SUM(A1:A9),,8,\r\n" +
        '"Quill, ""Ada"" Jr",ada@example.test,37.5,"First aid;Night lead"\r\n' +
        'Zoë Hart,,0,\r\n',
    );
    // An independent parser (csv-parse, sync API) reads it back to the same values.
    const records = parse(text, { columns: true }) as Array<Record<string, string>>;
    expect(records[1]).toEqual({ name: 'Quill, "Ada" Jr', email: 'ada@example.test', contracted_hours: '37.5', skills: 'First aid;Night lead' });
    expect(records[2].name).toBe('Zoë Hart');
  });

  it('round-trips: export, parse with csv-parse and compare, then import the export unchanged', async () => {
    const { workspace, agent } = await setup(app);
    const file = `${HEADER}"Quill, ""Ada"" Jr",ada@example.test,37.5,First aid;Medication round\nBrin Tallow,,20,\nZoë Hart,zoe@example.test,12.25,Night lead\n"Line
Break",,4,\n`;
    expect((await upload(agent, 'commit', file)).status).toBe(201);
    const exported = (await agent.get('/api/people/export')).text;
    const records = parse(exported, { columns: true, bom: true }) as Array<Record<string, string>>;
    const people = await Person.findAll({ where: { workspaceId: workspace.id }, order: [['name', 'ASC']] });
    const skills = new Map((await Skill.findAll({ where: { workspaceId: workspace.id } })).map((s) => [s.id, s.name]));
    expect(records).toEqual(
      people.map((p) => ({ name: p.name, email: p.email ?? '', contracted_hours: String(p.contractedHours), skills: p.skills.map((id) => skills.get(id)).join(';') })),
    );
    // Names are stored with runs of white space (a line break in a quoted cell too) as one space.
    expect(records.map((r) => r.name)).toContain('Line Break');
    const again = await upload(agent, 'preview', exported);
    expect(again.status).toBe(200);
    expect(again.body.counts).toEqual({ create: 0, update: 0, unchanged: 4, error: 0 });
  });

  it('keeps every workspace to its own people', async () => {
    const a = await setup(app);
    const b = await setup(app);
    await upload(a.agent, 'commit', `${HEADER}Ada Quill,,30,\n`);
    const preview = await upload(b.agent, 'preview', `${HEADER}Ada Quill,,30,\n`);
    expect(preview.body.counts.create).toBe(1);
    expect((await b.agent.get('/api/people/export')).text).toBe('\uFEFFname,email,contracted_hours,skills\r\n');
  });

  it('lets only coordinators and admins import and export', async () => {
    const { workspace } = await setup(app);
    const staff = (await signedIn(app, workspace, 'staff')).agent;
    expect((await upload(staff, 'commit', `${HEADER}Ada Quill,,30,\n`)).status).toBe(403);
    expect((await staff.get('/api/people/export')).status).toBe(403);
    expect(await count(workspace)).toBe(0);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createApp } from '../../../server/app';
import { createSequelize } from '../../../server/db/sequelize';
import { createTestDb, type TestDb } from '../helpers/test-db';

describe('GET /api/health', () => {
  let db: TestDb;
  beforeAll(async () => {
    db = await createTestDb();
  });
  afterAll(async () => {
    await db.drop();
  });

  it('reports the version from package.json and a database that answers', async () => {
    const res = await request(createApp({ env: db.env, sequelize: db.sequelize })).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', version: db.env.version, database: 'up' });
    expect(db.env.version).toMatch(/^\d+\.\d+\.\d+/);
  });

  it('says the database is down, with 503, when it does not answer', async () => {
    const dead = createSequelize({ ...db.env.db, port: 1 });
    const res = await request(createApp({ env: db.env, sequelize: dead })).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body.database).toBe('down');
    await dead.close();
  });

  it('answers unknown API routes with a JSON 404, not the web page', async () => {
    const res = await request(createApp({ env: db.env, sequelize: db.sequelize })).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('rejects a malformed JSON body with a 400 naming the body', async () => {
    const res = await request(createApp({ env: db.env, sequelize: db.sequelize }))
      .post('/api/health')
      .set('content-type', 'application/json')
      .send('{"broken":');
    expect(res.status).toBe(400);
    expect(res.body.error.fields[0].path).toBe('body');
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { distance } from 'fastest-levenshtein';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { Skill } from '../../../server/db/models';
import { SUGGESTION_LIMITS, boundedDistance } from '../../../server/people/near-match';

/** Issue 13 item 4: the CSV preview's "did you mean" work is bounded, in suggestions and in name length. */
describe('CSV preview suggestions are bounded', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('banded edit distance agrees with fastest-levenshtein (npm) wherever it is within the band', () => {
    // a small deterministic generator (mulberry32), so the words are the same on every run
    let seed = 13;
    const rand = () => {
      seed = (seed + 0x6d2b79f5) | 0;
      let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
      t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
      return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
    };
    const word = () => Array.from({ length: 1 + Math.floor(rand() * 12) }, () => 'abcde'[Math.floor(rand() * 5)]).join('');
    for (let i = 0; i < 3000; i++) {
      const a = word();
      const b = word();
      const limit = Math.floor(rand() * 6);
      const exact = distance(a, b);
      expect(boundedDistance(a, b, limit), `${a} ${b} ${limit}`).toBe(exact <= limit ? exact : limit + 1);
    }
  });

  it('a 200 KB skills column of near misses gets at most the file\'s share of suggestions, and answers', async () => {
    const workspace = await makeWorkspace('Larkspur Rise');
    const { agent } = await signedIn(app, workspace, 'coordinator');
    const names = Array.from({ length: 150 }, (_, i) => `Wound care level ${i}`);
    await Skill.bulkCreate(names.map((name) => ({ workspaceId: workspace.id, name })));
    // each cell one letter off a real skill: every one of them would earn a suggestion
    const misses: string[] = [];
    for (let i = 0; misses.join(';').length < 200_000; i++) misses.push(`Wound kare level ${i % 150} ${'x'.repeat(i % 3)}`.trim());
    const csv = `name,email,contracted_hours,skills\nPip Harrowgate,,30,"${misses.join(';')}"\n`;
    expect(csv.length).toBeGreaterThan(200_000);
    const started = Date.now();
    const res = await agent.post('/api/people/import/preview').attach('file', Buffer.from(csv, 'utf8'), { filename: 'people.csv', contentType: 'text/csv' });
    const took = Date.now() - started;
    expect(res.status).toBe(200);
    const text = JSON.stringify(res.body);
    const hints = text.match(/did you mean/g)?.length ?? 0;
    expect(hints).toBeGreaterThan(0);
    expect(hints).toBeLessThanOrEqual(SUGGESTION_LIMITS.perFile);
    console.log(`csv preview: ${misses.length} unknown skills in ${csv.length} bytes, ${hints} suggestions, ${took} ms`);
  });
});

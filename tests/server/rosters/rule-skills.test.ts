import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { makeApp, makeWorkspace, signedIn } from '../auth/helpers';
import { Skill } from '../../../server/db/models';
import { makeApiRoster } from './fixtures';

/** Issue 13 item 9: rules naming a skill the workspace does not have are refused when saved, naming the field. */
describe('skill-mix rules name only this workspace\'s skills', () => {
  let db: TestDb;
  let app: ReturnType<typeof makeApp>['app'];
  beforeAll(async () => {
    db = await createTestDb();
    app = makeApp(db).app;
  });
  afterAll(async () => {
    await db.drop();
  });

  it('refuses unknown, foreign and malformed skill ids with 400 naming each requirement, and stores nothing', async () => {
    const workspace = await makeWorkspace('Heronsgate Ward');
    const { agent: coordinator } = await signedIn(app, workspace, 'coordinator');
    const { roster, firstAid } = await makeApiRoster(coordinator, workspace);
    const foreign = await Skill.create({ workspaceId: (await makeWorkspace('Elsewhere')).id, name: 'Theirs' });
    const before = await coordinator.get(`/api/rosters/${roster.id}/rules`);
    expect(before.status).toBe(200);
    const put = (skills: string[]) =>
      coordinator.put(`/api/rosters/${roster.id}/rules`).send({
        version: before.body.version,
        rules: { ...before.body.rules, skillMix: { enabled: true, hard: false, weight: 10, requirements: skills.map((skill) => ({ skill, min: 1 })) } },
      });
    const refused = await put([`s${firstAid.id}`, `s${foreign.id}`, 's4000000001', 'nurse']);
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields.map((f: { path: string }) => f.path)).toEqual([
      'body.rules.skillMix.requirements.1.skill',
      'body.rules.skillMix.requirements.2.skill',
      'body.rules.skillMix.requirements.3.skill',
    ]);
    const after = await coordinator.get(`/api/rosters/${roster.id}/rules`);
    expect(after.body).toEqual(before.body);
    // the workspace's own skill is taken, and the roster still assembles for a run
    const ok = await put([`s${firstAid.id}`]);
    expect(ok.status).toBe(200);
    expect(ok.body.rules.skillMix.requirements).toEqual([{ skill: `s${firstAid.id}`, min: 1 }]);
  });
});

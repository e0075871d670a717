import { ApiRoutes, COORDINATOR_UP } from '../http/routes';
import { validate } from '../http/validate';
import { idParams } from '../../shared/api/paging';
import { createPersonBody, deletePersonQuery, peopleListQuery, restorePersonBody, skillBody, updatePersonBody } from '../../shared/api/people';
import * as repo from './repository';
import { enforcePlanLimit } from '../billing/limits';
import { peopleChanged } from '../billing/seat-sync';
import { commitImport, csvUpload, previewImport } from './import';
import { answerExport } from '../exports/jobs';

const ws = (req: { auth?: { workspaceId: number } }) => req.auth!.workspaceId;

export function skillsRouter() {
  const routes = new ApiRoutes('/skills');
  routes.get('/', COORDINATOR_UP, async (req, res) => {
    res.json({ items: await repo.listSkills(ws(req)) });
  });
  routes.post('/', COORDINATOR_UP, validate({ body: skillBody }), async (req, res) => {
    res.status(201).json(await repo.createSkill(ws(req), req.body.name));
  });
  routes.patch('/:id', COORDINATOR_UP, validate({ params: idParams, body: skillBody }), async (req, res) => {
    res.json(await repo.renameSkill(ws(req), Number(req.params.id), req.body.name));
  });
  routes.delete('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    await repo.deleteSkill(ws(req), Number(req.params.id));
    res.status(204).end();
  });
  return routes.router;
}

export function peopleRouter() {
  const routes = new ApiRoutes('/people');
  routes.get('/', COORDINATOR_UP, validate({ query: peopleListQuery }), async (req, res) => {
    res.json(await repo.listPeople(ws(req), req.query as never));
  });
  routes.post('/', COORDINATOR_UP, validate({ body: createPersonBody }), enforcePlanLimit('people'), async (req, res) => {
    res.status(201).json(await repo.createPerson(ws(req), req.body));
    peopleChanged(ws(req));
  });
  // Declared before '/:id' so the words are not read as ids.
  routes.get('/export', COORDINATOR_UP, async (req, res) => {
    // A very long list is written by a worker (202, server/exports/jobs.ts).
    await answerExport(req, res, { kind: 'people-csv' });
  });
  routes.post('/import/preview', COORDINATOR_UP, csvUpload(), async (req, res) => {
    res.json(await previewImport(ws(req), req.file));
  });
  routes.post('/import/commit', COORDINATOR_UP, csvUpload(), enforcePlanLimit('people', async (req) => (await previewImport(ws(req), req.file)).counts.create), async (req, res) => {
    res.status(201).json(await commitImport(ws(req), req.file));
    peopleChanged(ws(req));
  });
  routes.get('/:id', COORDINATOR_UP, validate({ params: idParams }), async (req, res) => {
    res.json(await repo.getPerson(ws(req), Number(req.params.id)));
  });
  routes.patch('/:id', COORDINATOR_UP, validate({ params: idParams, body: updatePersonBody }), async (req, res) => {
    res.json(await repo.updatePerson(ws(req), Number(req.params.id), req.body));
  });
  // 204 when the person was removed; 200 with the person and the rosters that keep them when archived.
  routes.delete('/:id', COORDINATOR_UP, validate({ params: idParams, query: deletePersonQuery }), async (req, res) => {
    const answer = await repo.deletePerson(ws(req), Number(req.params.id), { archive: (req.query as unknown as { archive: boolean }).archive });
    if (answer.outcome === 'deleted') res.status(204).end();
    else res.json(answer);
    peopleChanged(ws(req));
  });
  // An archived person counts against the plan again once restored.
  routes.post('/:id/restore', COORDINATOR_UP, validate({ params: idParams, body: restorePersonBody }), enforcePlanLimit('people'), async (req, res) => {
    res.json(await repo.restorePerson(ws(req), Number(req.params.id), req.body.version));
    peopleChanged(ws(req));
  });
  return routes.router;
}

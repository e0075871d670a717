import { createTestDb } from '../helpers/test-db';
import { makeApp, signedIn } from '../auth/helpers';
import { Workspace } from '../../../server/db/models';
import { seedDemoIfEmpty } from '../../../server/db/seed';
import { RunWorker } from '../../../server/runs/worker';

/** A test database with the Willowmere demo seeded, its coordinator signed in, and a run worker to tick (its compute queue runs). */
export async function demoSetup(workerName: string) {
  const db = await createTestDb();
  const app = makeApp(db).app;
  await seedDemoIfEmpty(db.sequelize);
  const workspace = (await Workspace.findOne({ where: { name: 'Willowmere House' } }))!;
  const coordinator = (await signedIn(app, workspace, 'coordinator')).agent;
  const worker = new RunWorker(db.sequelize, { name: workerName });
  // Runs are solved one tick at a time; prices and alternatives are jobs an API request waits for.
  worker.startCompute();
  await worker.ready(); // counted as a worker before the first request asks for one
  return { db, app, workspace, coordinator, worker };
}

import type { Router } from 'express';
import { ApiRoutes } from '../http/routes';
import { DATABASE_RETRY_AFTER_S } from '../http/errors';
import { databaseAnswers } from './service';
import type { Sequelize } from 'sequelize';

/** `/api/health`: the app version and whether the database answers within a second. */
export function healthRouter(deps: { sequelize: Sequelize; version: string }): Router {
  const routes = new ApiRoutes('/health');
  routes.get('/', 'public', async (_req, res) => {
    const database = await databaseAnswers(deps.sequelize);
    if (!database) res.set('Retry-After', String(DATABASE_RETRY_AFTER_S));
    res.status(database ? 200 : 503).json({ status: database ? 'ok' : 'degraded', version: deps.version, database: database ? 'up' : 'down' });
  });
  return routes.router;
}

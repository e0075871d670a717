import express, { type Express } from 'express';
import helmet from 'helmet';
import type { Sequelize } from 'sequelize';
import type { Env } from './env';
import { apiNotFound, errorHandler } from './http/errors';
import { healthRouter } from './health/router';
import { webRouter } from './web/static';

export interface AppDeps {
  env: Env;
  sequelize: Sequelize;
}

/** Builds the Express app without listening, so tests drive it with supertest. */
export function createApp({ env, sequelize }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // The web export inlines a small boot script and React Native Web writes inline styles.
          'script-src': ["'self'", "'unsafe-inline'"],
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
        },
      },
    }),
  );

  const api = express.Router();
  api.use(express.json({ limit: '1mb' }));
  api.use('/health', healthRouter({ sequelize, version: env.version }));
  api.use(apiNotFound);
  app.use('/api', api);

  app.use(webRouter(env.webDir));
  app.use(errorHandler);
  return app;
}

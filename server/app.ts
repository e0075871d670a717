import compression from 'compression';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { Sequelize } from 'sequelize';
import type { Env } from './env';
import { apiNotFound, errorHandler } from './http/errors';
import { healthRouter } from './health/router';
import { webRouter } from './web/static';
import { createSessionMiddleware } from './auth/session';
import { createPassport } from './auth/passport';
import { loadAuthContext } from './auth/load-context';
import { requireCsrfHeader } from './auth/csrf';
import { authRouter } from './auth/router';
import { membersRouter, invitationsRouter } from './members/router';
import { workspacesRouter } from './workspaces/router';
import { createMailer, type Mailer } from './mail/mailer';
import { devMailRouter } from './dev/mail-page';
import { termsRouter } from './terms/router';
import { peopleRouter, skillsRouter } from './people/router';
import { rostersRouter } from './rosters/router';
import { pairingsRouter } from './pairings/router';
import { runsRouter } from './runs/router';
import { rosterRunsRouter } from './runs/roster-runs-router';
import { billingRouter } from './billing/router';
import { feedsRouter, staffRouter } from './staff/router';
import { runWorkflowRouter } from './runs/workflow-router';
import { publishRouter } from './rosters/publish-router';
import { rosterPdfRouter } from './rosters/pdf';
import { publishPreviewRouter } from './rosters/mail-preview';
import { copyForwardRouter } from './rosters/copy-forward';
import { absenceCoverRouter, absencesRouter } from './absences/router';
import { staffAbsencesRouter } from './absences/staff-router';
import { useRedis } from './queue/queues';
import { suggestionRouter } from './learning/router';
import { mySwapsRouter, swapsRouter } from './swaps/router';
import { offersRouter } from './offers/router';
import { rosterOffersRouter } from './offers/roster-router';
import { myOffersRouter } from './offers/staff-router';
import { ledgerRouter } from './ledger/router';
import { myLedgerRouter } from './ledger/staff-router';
import { compareRouter } from './runs/compare-router';
import { exportsRouter } from './exports/router';

export interface AppDeps {
  env: Env;
  sequelize: Sequelize;
  /** Defaults to SMTP from env (or an in-memory outbox outside production). */
  mailer?: Mailer;
}

/** Builds the Express app without listening, so tests drive it with supertest. */
export function createApp({ env, sequelize, mailer = createMailer(env) }: AppDeps): Express {
  const app = express();
  // Solve jobs go to this Redis (server/queue); the app itself keeps no queue state.
  useRedis(sequelize, env.redis.url);
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  // gzip/deflate for every text answer (JSON, HTML, JS, CSS, iCalendar, CSV): the 2.6 MB bundle goes out as ~0.6 MB
  app.use(compression());
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
  // The payment service signs the exact bytes it sends, so its webhook gets the raw body (before the JSON parser).
  api.use('/billing/webhook', express.raw({ type: () => true, limit: '1mb' }));
  api.use(express.json({ limit: '1mb' }));
  // API answers are about someone's workspace (or say who is signed in): no browser or proxy keeps them.
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  // Session, then the user (passport), then req.auth (workspace and role), then the CSRF header check.
  const passport = createPassport(env);
  api.use(createSessionMiddleware(env, sequelize).middleware);
  api.use(passport.initialize());
  api.use(passport.session());
  api.use(loadAuthContext);
  api.use(requireCsrfHeader);
  api.use('/auth', authRouter({ env, passport, mailer, sequelize }));
  api.use('/workspaces', workspacesRouter());
  api.use('/members', membersRouter());
  api.use('/invitations', invitationsRouter({ env, mailer }));
  api.use('/skills', skillsRouter());
  api.use('/people', peopleRouter(), termsRouter());
  // One router per file; each prefix is mounted once.
  api.use(
    '/rosters',
    rostersRouter(),
    rosterRunsRouter(),
    publishRouter({ env, mailer }),
    absenceCoverRouter(),
    rosterPdfRouter(),
    publishPreviewRouter(),
    copyForwardRouter(),
    suggestionRouter(),
    rosterOffersRouter(),
    compareRouter(),
  );
  api.use('/runs', runsRouter(), runWorkflowRouter());
  api.use('/pairings', pairingsRouter());
  api.use('/me', staffRouter({ env, mailer }), staffAbsencesRouter(), mySwapsRouter(), myOffersRouter(), myLedgerRouter());
  api.use('/swaps', swapsRouter());
  api.use('/offers', offersRouter());
  api.use('/ledger', ledgerRouter());
  api.use('/absences', absencesRouter({ env, mailer }));
  api.use('/feeds', feedsRouter());
  api.use('/exports', exportsRouter());
  api.use('/billing', billingRouter(env));
  api.use('/health', healthRouter({ sequelize, version: env.version }));
  api.use(apiNotFound);
  app.use('/api', api);
  if (env.nodeEnv !== 'production') app.use('/dev', devMailRouter(env, mailer));

  app.use(webRouter(env.webDir));
  app.use(errorHandler);
  return app;
}

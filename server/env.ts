import { z } from 'zod';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import path from 'node:path';

/** The repository root, found from this file so commands work from any folder. */
export const rootDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  ROTALOOM_HOST: z.string().default('127.0.0.1'),
  ROTALOOM_PORT: z.coerce.number().int().min(0).max(65535).default(8080),
  ROTALOOM_PUBLIC_URL: z.string().url().optional(),
  ROTALOOM_DB_HOST: z.string().default('127.0.0.1'),
  ROTALOOM_DB_PORT: z.coerce.number().int().min(1).max(65535).default(3407),
  ROTALOOM_DB_USER: z.string().default('root'),
  ROTALOOM_DB_PASSWORD: z.string().default(''),
  ROTALOOM_DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/, 'letters, digits and _ only').default('rotaloom'),
  // `npm start` uses a MariaDB already on ROTALOOM_DB_PORT only with 1 (never another checkout's).
  ROTALOOM_DB_USE_RUNNING: z.enum(['0', '1']).default('0'),
  // A query that hears nothing back from MariaDB for this long fails (503) instead of hanging the request.
  ROTALOOM_DB_TIMEOUT_MS: z.coerce.number().int().min(100).max(600_000).default(30_000),
  ROTALOOM_SESSION_SECRET: z.string().min(16).default('rotaloom-dev-secret-change-me'),
  ROTALOOM_WEB_DIR: z.string().default(path.join(rootDir, 'dist')),
  ROTALOOM_DATA_DIR: z.string().default(path.join(rootDir, '.data')),
  /** 0 leaves solving to separate `npm run worker` processes; 1 makes `npm start` start one worker process with the server. */
  ROTALOOM_IN_PROCESS_WORKER: z.enum(['0', '1']).default('1'),
  // The queue of solve jobs (BullMQ). Without a URL, `npm start` and `npm test` start Debian's
  // redis-server on loopback at ROTALOOM_REDIS_PORT; a URL points at a Redis run elsewhere.
  ROTALOOM_REDIS_URL: z.string().regex(/^rediss?:\/\//, 'a redis:// or rediss:// URL').optional(),
  ROTALOOM_REDIS_PORT: z.coerce.number().int().min(1).max(65535).default(6390),
  /** Jobs one worker process works at once (each solve takes a thread, about one core). */
  ROTALOOM_WORKER_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(1),
  // E-mail over SMTP (the local fake in development and tests); without a host, mail is kept in memory.
  ROTALOOM_SMTP_HOST: z.string().optional(),
  ROTALOOM_SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(587),
  ROTALOOM_SMTP_SECURE: z.enum(['true', 'false']).default('false'),
  ROTALOOM_SMTP_USER: z.string().optional(),
  ROTALOOM_SMTP_PASSWORD: z.string().optional(),
  ROTALOOM_MAIL_FROM: z.string().default('Rotaloom <no-reply@rotaloom.invalid>'),
  // Where the dev-only mail page reads the fake mailbox (never used in production).
  ROTALOOM_MAIL_FAKE_URL: z.string().url().optional(),
  // Google sign-in: both id and secret turn it on; the URLs point it at the local fake instead of Google.
  ROTALOOM_GOOGLE_CLIENT_ID: z.string().optional(),
  ROTALOOM_GOOGLE_CLIENT_SECRET: z.string().optional(),
  ROTALOOM_GOOGLE_AUTH_URL: z.string().url().optional(),
  ROTALOOM_GOOGLE_TOKEN_URL: z.string().url().optional(),
  ROTALOOM_GOOGLE_PROFILE_URL: z.string().url().optional(),
  // Failed sign-ins allowed per 15 minutes, per account and per client address.
  ROTALOOM_SIGNIN_MAX_PER_ACCOUNT: z.coerce.number().int().min(1).default(10),
  ROTALOOM_SIGNIN_MAX_PER_ADDRESS: z.coerce.number().int().min(1).default(50),
  /** Sign-ups and password-reset requests per 15 minutes per client address, shared by all API processes (default 30; 1000 in tests). */
  ROTALOOM_ACCOUNT_REQUESTS_PER_ADDRESS: z.coerce.number().int().min(1).optional(),
  // Payments through the stripe SDK: a secret key turns billing on; host/port/protocol point it at the
  // local fake (without them the SDK talks to the real service).
  ROTALOOM_STRIPE_SECRET_KEY: z.string().optional(),
  ROTALOOM_STRIPE_WEBHOOK_SECRET: z.string().optional(),
  ROTALOOM_STRIPE_HOST: z.string().optional(),
  ROTALOOM_STRIPE_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  ROTALOOM_STRIPE_PROTOCOL: z.enum(['http', 'https']).optional(),
  /** A price to use instead of finding or creating the team plan's price by its lookup key. */
  ROTALOOM_STRIPE_PRICE_ID: z.string().optional(),
  /** How long people changes must settle before the seat count is synced. */
  ROTALOOM_SEAT_SYNC_DELAY_MS: z.coerce.number().int().min(0).default(5000),
});

export interface Env {
  nodeEnv: 'development' | 'production' | 'test';
  host: string;
  port: number;
  publicUrl: string;
  db: { host: string; port: number; user: string; password: string; database: string; timeoutMs?: number };
  /** The user asked `npm start` to use a MariaDB that is already running and that no checkout made. */
  useRunningDb: boolean;
  sessionSecret: string;
  webDir: string;
  dataDir: string;
  inProcessWorker: boolean;
  /** url: where the queue lives; external: given by ROTALOOM_REDIS_URL, so nobody starts one. */
  redis: { url: string; external: boolean; port: number };
  workerConcurrency: number;
  version: string;
  mail: {
    smtp: { host: string; port: number; secure: boolean; user?: string; password?: string } | null;
    from: string;
    fakeUrl: string | null;
  };
  google: { clientId: string; clientSecret: string; authUrl?: string; tokenUrl?: string; profileUrl?: string } | null;
  signInLimits: { perAccount: number; perAddress: number };
  accountRequestsPerAddress: number;
  billing: {
    secretKey: string;
    webhookSecret: string;
    host?: string;
    port?: number;
    protocol?: 'http' | 'https';
    priceId?: string;
    seatSyncDelayMs: number;
  } | null;
}

/** Reads and checks the environment once; a bad value stops the process with the variable named. */
export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ');
    throw new Error(`Invalid environment: ${problems}`);
  }
  const e = parsed.data;
  if (e.NODE_ENV === 'production' && e.ROTALOOM_SESSION_SECRET === 'rotaloom-dev-secret-change-me') {
    throw new Error('Invalid environment: ROTALOOM_SESSION_SECRET must be set in production');
  }
  return {
    nodeEnv: e.NODE_ENV,
    host: e.ROTALOOM_HOST,
    port: e.ROTALOOM_PORT,
    publicUrl: e.ROTALOOM_PUBLIC_URL ?? `http://${e.ROTALOOM_HOST}:${e.ROTALOOM_PORT}`,
    db: {
      host: e.ROTALOOM_DB_HOST,
      port: e.ROTALOOM_DB_PORT,
      user: e.ROTALOOM_DB_USER,
      password: e.ROTALOOM_DB_PASSWORD,
      database: e.ROTALOOM_DB_NAME,
      timeoutMs: e.ROTALOOM_DB_TIMEOUT_MS,
    },
    useRunningDb: e.ROTALOOM_DB_USE_RUNNING === '1',
    sessionSecret: e.ROTALOOM_SESSION_SECRET,
    webDir: e.ROTALOOM_WEB_DIR,
    dataDir: e.ROTALOOM_DATA_DIR,
    inProcessWorker: e.ROTALOOM_IN_PROCESS_WORKER === '1',
    redis: { url: e.ROTALOOM_REDIS_URL ?? `redis://127.0.0.1:${e.ROTALOOM_REDIS_PORT}`, external: e.ROTALOOM_REDIS_URL !== undefined, port: e.ROTALOOM_REDIS_PORT },
    workerConcurrency: e.ROTALOOM_WORKER_CONCURRENCY,
    version: appVersion(),
    mail: {
      smtp: e.ROTALOOM_SMTP_HOST
        ? { host: e.ROTALOOM_SMTP_HOST, port: e.ROTALOOM_SMTP_PORT, secure: e.ROTALOOM_SMTP_SECURE === 'true', user: e.ROTALOOM_SMTP_USER, password: e.ROTALOOM_SMTP_PASSWORD }
        : null,
      from: e.ROTALOOM_MAIL_FROM,
      fakeUrl: e.ROTALOOM_MAIL_FAKE_URL ?? null,
    },
    google:
      e.ROTALOOM_GOOGLE_CLIENT_ID && e.ROTALOOM_GOOGLE_CLIENT_SECRET
        ? {
            clientId: e.ROTALOOM_GOOGLE_CLIENT_ID,
            clientSecret: e.ROTALOOM_GOOGLE_CLIENT_SECRET,
            authUrl: e.ROTALOOM_GOOGLE_AUTH_URL,
            tokenUrl: e.ROTALOOM_GOOGLE_TOKEN_URL,
            profileUrl: e.ROTALOOM_GOOGLE_PROFILE_URL,
          }
        : null,
    signInLimits: { perAccount: e.ROTALOOM_SIGNIN_MAX_PER_ACCOUNT, perAddress: e.ROTALOOM_SIGNIN_MAX_PER_ADDRESS },
    accountRequestsPerAddress: e.ROTALOOM_ACCOUNT_REQUESTS_PER_ADDRESS ?? (e.NODE_ENV === 'test' ? 1000 : 30),
    billing:
      e.ROTALOOM_STRIPE_SECRET_KEY && e.ROTALOOM_STRIPE_WEBHOOK_SECRET
        ? {
            secretKey: e.ROTALOOM_STRIPE_SECRET_KEY,
            webhookSecret: e.ROTALOOM_STRIPE_WEBHOOK_SECRET,
            host: e.ROTALOOM_STRIPE_HOST,
            port: e.ROTALOOM_STRIPE_PORT,
            protocol: e.ROTALOOM_STRIPE_PROTOCOL,
            priceId: e.ROTALOOM_STRIPE_PRICE_ID,
            seatSyncDelayMs: e.ROTALOOM_SEAT_SYNC_DELAY_MS,
          }
        : null,
  };
}

export function appVersion(): string {
  const pkg = JSON.parse(readFileSync(path.join(rootDir, 'package.json'), 'utf8')) as { version: string };
  return pkg.version;
}

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
  ROTALOOM_SESSION_SECRET: z.string().min(16).default('rotaloom-dev-secret-change-me'),
  ROTALOOM_WEB_DIR: z.string().default(path.join(rootDir, 'dist')),
  ROTALOOM_DATA_DIR: z.string().default(path.join(rootDir, '.data')),
});

export interface Env {
  nodeEnv: 'development' | 'production' | 'test';
  host: string;
  port: number;
  publicUrl: string;
  db: { host: string; port: number; user: string; password: string; database: string };
  sessionSecret: string;
  webDir: string;
  dataDir: string;
  version: string;
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
    },
    sessionSecret: e.ROTALOOM_SESSION_SECRET,
    webDir: e.ROTALOOM_WEB_DIR,
    dataDir: e.ROTALOOM_DATA_DIR,
    version: appVersion(),
  };
}

export function appVersion(): string {
  const pkg = JSON.parse(readFileSync(path.join(rootDir, 'package.json'), 'utf8')) as { version: string };
  return pkg.version;
}

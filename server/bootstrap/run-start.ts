import { readEnv } from '../env';
import { assertPortFree } from './listen';

/**
 * `npm start`. The port is checked before the rest of the stack is even loaded, so a second
 * checkout on a port another process owns stops at once instead of starting a database first.
 */
async function main(): Promise<void> {
  const env = readEnv({ ...process.env, NODE_ENV: process.env.NODE_ENV ?? 'development' });
  await assertPortFree(env.port, env.host);
  const { startStack } = await import('./start-stack');
  await startStack(env);
}

main().catch((err) => {
  console.error(`[rotaloom] could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});

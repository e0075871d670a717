import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { rootDir } from '../env';

export interface WorkerProcess {
  child: ChildProcess;
  stop(): Promise<void>;
}

/**
 * `npm run worker` as a child process: the solver runs in worker processes, never in the one
 * answering requests. One node process (tsx as a loader, not its wrapper CLI), so a signal sent
 * to it, a kill -9 included, reaches the worker itself.
 */
export function startWorkerProcess(env: NodeJS.ProcessEnv, options: { log?: (line: string) => void; name?: string } = {}): WorkerProcess {
  const log = options.log ?? ((line: string) => console.log(line));
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(rootDir, 'server', 'worker.ts')], {
    cwd: rootDir,
    env: { ...env, ...(options.name ? { ROTALOOM_WORKER_NAME: options.name } : {}) },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const relay = (chunk: Buffer) => {
    for (const line of chunk.toString('utf8').split('\n')) if (line.trim()) log(line);
  };
  child.stdout?.on('data', relay);
  child.stderr?.on('data', relay);
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  return {
    child,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill('SIGTERM');
      const timer = setTimeout(() => child.kill('SIGKILL'), 15_000);
      await exited;
      clearTimeout(timer);
    },
  };
}
